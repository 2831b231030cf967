package org.edgewise.driver.network;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.JsonToken;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.edgewise.driver.UserError;

/**
 * Reads and checks a network file (format in docs/report.md):
 * <pre>
 * {"edgewiseNetwork": 1, "name": "…", "description": "…",
 *  "variables": [{"name": "a", "states": ["lo","hi"], "parents": [], "cpt": [[0.3, 0.7]]}, …]}
 * </pre>
 * Checks, each a one-line {@link UserError} naming the file and variable (and row): unique
 * non-empty names, at least two distinct states, names and states that a table reads back as written
 * (neither empty nor with blank space at either end), parents known, not the variable itself, not
 * repeated; one row per parent configuration (Π r_parents), each of r entries in [0, 1] summing
 * to 1 within {@value #TOLERANCE}; the graph acyclic.
 */
public final class NetworkReader {
    /** Largest allowed |Σ_k p_k − 1| of a CPT row (common practice for hand-written tables). */
    public static final double TOLERANCE = 1e-9;
    /** The format version this reader understands. */
    public static final int VERSION = 1;

    private static final ObjectMapper MAPPER = org.edgewise.driver.JsonInput.mapper();
    /** Most entries of one variable's cpt (parent configurations × states). */
    public static final long MAX_CPT_ENTRIES = 10_000_000;

    private NetworkReader() {
    }

    public static Network read(Path file) {
        if (!Files.isRegularFile(file)) {
            throw new UserError("network file " + file + " does not exist");
        }
        org.edgewise.driver.JsonInput.checkSize(file, "network file " + file);
        JsonNode root;
        try {
            try (JsonParser p = MAPPER.createParser(file.toFile())) {
                root = whole(p, "network file " + file);
            }
        } catch (JsonProcessingException e) {
            throw new UserError("network file " + file + " " + org.edgewise.driver.JsonInput.problem(e));
        } catch (IOException e) {
            throw new UserError("cannot read network file " + file + ": " + e.getMessage());
        }
        return parse(file.toString(), root);
    }

    /** Parses a network from JSON text ({@code source} names it in messages). */
    public static Network parse(String source, String json) {
        try {
            try (JsonParser p = MAPPER.createParser(json)) {
                return parse(source, whole(p, "network " + source));
            }
        } catch (JsonProcessingException e) {
            throw new UserError("network " + source + " " + org.edgewise.driver.JsonInput.problem(e));
        } catch (IOException e) {
            throw new java.io.UncheckedIOException(e); // a String source has no I/O to fail
        }
    }

    /**
     * The one JSON value of {@code p}, refusing text after it ({@code {…} garbage}, a second object):
     * such a file was cut, pasted twice or edited by hand, and reading only its first value would
     * simulate from something other than what the user sees.
     */
    private static JsonNode whole(JsonParser p, String where) throws IOException {
        JsonNode root = MAPPER.readTree(p);
        if (root == null || !root.isObject()) {
            return root; // refused by parse: the top level must be an object
        }
        com.fasterxml.jackson.core.JsonLocation end = p.currentTokenLocation(); // the closing }
        JsonToken next;
        try {
            next = p.nextToken();
        } catch (JsonProcessingException e) {
            next = JsonToken.NOT_AVAILABLE; // unparseable text after the value: refused the same way
        }
        if (next != null) {
            throw new UserError(where + " has text after its JSON object, which ends" + org.edgewise.driver.JsonInput.at(end).replace(" (", " at ").replace(")", "")
                    + ": a network file holds one object and nothing else");
        }
        return root;
    }

    static Network parse(String source, JsonNode root) {
        String where = "network " + source;
        if (root == null || !root.isObject()) {
            throw new UserError(where + ": top level must be a JSON object");
        }
        JsonNode version = root.get("edgewiseNetwork");
        if (version == null || !version.canConvertToInt()) {
            throw new UserError(where + ": not an Edgewise network (no \"edgewiseNetwork\": " + VERSION + ")");
        }
        if (version.asInt() != VERSION) {
            throw new UserError(where + ": format version " + version.asInt() + "; this Edgewise reads version " + VERSION);
        }
        JsonNode vars = root.get("variables");
        if (vars == null || !vars.isArray() || vars.isEmpty()) {
            throw new UserError(where + ": \"variables\" must be a non-empty array");
        }
        List<String> names = new ArrayList<>();
        List<List<String>> states = new ArrayList<>();
        List<List<String>> parentNames = new ArrayList<>();
        List<double[][]> rows = new ArrayList<>();
        int pos = 0;
        for (JsonNode v : vars) {
            pos++;
            JsonNode n = v.get("name");
            if (n == null || !n.isTextual() || n.asText().isEmpty()) {
                throw new UserError(where + ": variable #" + pos + " has no name");
            }
            String name = n.asText();
            String at = where + ": variable '" + name + "'";
            names.add(name);
            states.add(strings(v.get("states"), at + ": \"states\""));
            JsonNode ps = v.get("parents");
            parentNames.add(ps == null ? List.of() : strings(ps, at + ": \"parents\""));
            JsonNode cpt = v.get("cpt");
            if (cpt == null || !cpt.isArray()) {
                throw new UserError(at + ": \"cpt\" must be an array of probability rows");
            }
            double[][] r = new double[cpt.size()][];
            for (int j = 0; j < cpt.size(); j++) {
                JsonNode row = cpt.get(j);
                if (!row.isArray()) {
                    throw new UserError(at + ": cpt row " + (j + 1) + " is not an array of numbers");
                }
                r[j] = new double[row.size()];
                for (int k = 0; k < row.size(); k++) {
                    if (!row.get(k).isNumber()) {
                        throw new UserError(at + ": cpt row " + (j + 1) + " entry " + (k + 1) + " is not a number");
                    }
                    r[j][k] = row.get(k).asDouble();
                }
            }
            rows.add(r);
        }
        String name = root.path("name").asText("");
        String description = root.path("description").asText("");
        return build(source, name, description, names, states, parentNames, rows);
    }

    private static List<String> strings(JsonNode node, String what) {
        if (node == null || !node.isArray()) {
            throw new UserError(what + " must be an array of strings");
        }
        List<String> out = new ArrayList<>();
        for (JsonNode s : node) {
            if (!s.isTextual()) {
                throw new UserError(what + " must be an array of strings");
            }
            out.add(s.asText());
        }
        return out;
    }

    /**
     * A name or state that a table could not give back as written is refused: a table's reader (the
     * tally's, the cases' reader) trims blank space (characters up to U+0020, {@link String#trim}) off
     * every field and takes an empty field for a missing value, so data simulated from such a network
     * would not read back as the network's states.
     */
    private static void readsBack(String where, String v, int i, List<String> states) {
        if (!v.equals(v.trim())) {
            throw new UserError(where + ": variable #" + (i + 1) + " '" + v + "' begins or ends with blank space, which a "
                    + "table's reader trims off a column name (it would read back as '" + v.trim() + "'); write it without");
        }
        for (int k = 0; k < states.size(); k++) {
            String s = states.get(k);
            if (s.trim().isEmpty()) {
                throw new UserError(where + ": variable '" + v + "' state #" + (k + 1) + " is " + (s.isEmpty() ? "empty" : "blank")
                        + ", which a table's reader takes for a missing value, not a state; give it a name");
            }
            if (!s.equals(s.trim())) {
                throw new UserError(where + ": variable '" + v + "' state '" + s + "' begins or ends with blank space, which a "
                        + "table's reader trims off every field (it would read back as '" + s.trim() + "'); write it without");
            }
        }
    }

    static Network build(String source, String name, String description, List<String> names,
                         List<List<String>> states, List<List<String>> parentNames, List<double[][]> rows) {
        String where = "network " + source;
        int n = names.size();
        Map<String, Integer> index = new HashMap<>();
        for (int i = 0; i < n; i++) {
            String v = names.get(i);
            if (v == null || v.isEmpty()) {
                throw new UserError(where + ": variable #" + (i + 1) + " has no name");
            }
            if (index.put(v, i) != null) {
                throw new UserError(where + ": variable '" + v + "' is defined twice");
            }
            List<String> st = states.get(i);
            if (st.size() < 2) {
                throw new UserError(where + ": variable '" + v + "' needs at least two states, has " + st.size());
            }
            if (new HashSet<>(st).size() != st.size()) {
                throw new UserError(where + ": variable '" + v + "' lists a state twice");
            }
            readsBack(where, v, i, st);
        }
        int[][] parents = new int[n][];
        double[][] cpt = new double[n][];
        for (int i = 0; i < n; i++) {
            String v = names.get(i);
            String at = where + ": variable '" + v + "'";
            List<String> ps = parentNames.get(i);
            parents[i] = new int[ps.size()];
            Set<String> seen = new HashSet<>();
            java.math.BigInteger entries = java.math.BigInteger.valueOf(states.get(i).size());
            for (String pn : ps) {
                Integer idx = index.get(pn);
                entries = entries.multiply(java.math.BigInteger.valueOf(idx == null ? 1 : states.get(idx).size()));
            }
            if (entries.compareTo(java.math.BigInteger.valueOf(MAX_CPT_ENTRIES)) > 0) {
                throw new UserError(String.format(java.util.Locale.ROOT, "%s has %d parents and a cpt of %,d entries;"
                        + " a variable's cpt may hold at most %,d", at, ps.size(), entries, MAX_CPT_ENTRIES));
            }
            int q = 1;
            for (int p = 0; p < ps.size(); p++) {
                String pn = ps.get(p);
                Integer idx = index.get(pn);
                if (idx == null) {
                    throw new UserError(at + " has unknown parent '" + pn + "'");
                }
                if (idx == i) {
                    throw new UserError(at + " lists itself as a parent");
                }
                if (!seen.add(pn)) {
                    throw new UserError(at + " lists parent '" + pn + "' twice");
                }
                parents[i][p] = idx;
                q = Math.multiplyExact(q, states.get(idx).size());
            }
            int r = states.get(i).size();
            double[][] table = rows.get(i);
            if (table.length != q) {
                throw new UserError(at + ": cpt has " + table.length + " rows; " + q
                        + " parent configurations need one row each");
            }
            cpt[i] = new double[q * r];
            for (int j = 0; j < q; j++) {
                double[] row = table[j];
                String rowName = "cpt row " + (j + 1) + describe(j, parents[i], names, states);
                if (row.length != r) {
                    throw new UserError(at + ": " + rowName + " has " + row.length + " entries; the variable has " + r + " states");
                }
                double sum = 0;
                for (int k = 0; k < r; k++) {
                    double p = row[k];
                    if (!(p >= 0 && p <= 1)) {
                        throw new UserError(at + ": " + rowName + " entry " + (k + 1) + " is " + p + ", not a probability");
                    }
                    sum += p;
                    cpt[i][j * r + k] = p;
                }
                if (Math.abs(sum - 1) > TOLERANCE) {
                    throw new UserError(at + ": " + rowName + " sums to " + sum + ", not 1");
                }
            }
        }
        int[] topo = topologicalOrder(where, names, parents);
        return new Network(name, description, List.copyOf(names), states.stream().map(List::copyOf).toList(),
                parents, cpt, topo);
    }

    /** " (a=x, b=y)" for configuration j of the given parents, or "" without parents. */
    private static String describe(int j, int[] parents, List<String> names, List<List<String>> states) {
        if (parents.length == 0) {
            return "";
        }
        String[] parts = new String[parents.length];
        for (int p = parents.length - 1; p >= 0; p--) {
            int r = states.get(parents[p]).size();
            parts[p] = names.get(parents[p]) + "=" + states.get(parents[p]).get(j % r);
            j /= r;
        }
        return " (" + String.join(", ", parts) + ")";
    }

    /** Kahn's algorithm, smallest file index first among ready variables; a cycle is named. */
    private static int[] topologicalOrder(String where, List<String> names, int[][] parents) {
        int n = names.size();
        int[] indeg = new int[n];
        List<List<Integer>> children = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            children.add(new ArrayList<>());
        }
        for (int c = 0; c < n; c++) {
            indeg[c] = parents[c].length;
            for (int p : parents[c]) {
                children.get(p).add(c);
            }
        }
        java.util.PriorityQueue<Integer> ready = new java.util.PriorityQueue<>();
        for (int i = 0; i < n; i++) {
            if (indeg[i] == 0) {
                ready.add(i);
            }
        }
        int[] order = new int[n];
        int m = 0;
        while (!ready.isEmpty()) {
            int v = ready.poll();
            order[m++] = v;
            for (int c : children.get(v)) {
                if (--indeg[c] == 0) {
                    ready.add(c);
                }
            }
        }
        if (m < n) {
            throw new UserError(where + ": the graph has a cycle: " + cycle(names, parents, indeg));
        }
        return order;
    }

    /** Follows parents among the unplaced variables until one repeats: "a -> b -> c -> a". */
    private static String cycle(List<String> names, int[][] parents, int[] indeg) {
        int v = 0;
        while (indeg[v] == 0) {
            v++;
        }
        Deque<Integer> path = new ArrayDeque<>();
        Map<Integer, Integer> at = new HashMap<>();
        while (!at.containsKey(v)) {
            at.put(v, path.size());
            path.addLast(v);
            int next = -1;
            for (int p : parents[v]) {
                if (indeg[p] > 0) {
                    next = p;
                    break;
                }
            }
            v = next;
        }
        List<Integer> walked = new ArrayList<>(path).subList(at.get(v), path.size());
        // we walked child -> parent; reverse to edge direction and start at the first-listed variable
        List<Integer> cyc = new ArrayList<>(walked);
        java.util.Collections.reverse(cyc);
        int start = cyc.indexOf(java.util.Collections.min(cyc));
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i <= cyc.size(); i++) {
            sb.append(i == 0 ? "" : " -> ").append(names.get(cyc.get((start + i) % cyc.size())));
        }
        return sb.toString();
    }
}
