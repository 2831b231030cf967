package org.edgewise.driver.store;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.util.List;
import org.apache.parquet.schema.MessageType;
import org.apache.parquet.schema.MessageTypeParser;
import org.edgewise.driver.UserError;

/**
 * Names, schemas and the version of the score-store format, and the one place that stamps and
 * checks the format version and the data fingerprint: {@link StoreWriter} calls
 * {@link #stamp}, {@link StoreReader} calls {@link #checkVersion} and {@link #checkFingerprint}.
 *
 * <p><b>What the fingerprint check means.</b> The fingerprint of a tally is the triple
 * {rows, Σ h, ⊕ h} over a 64-bit mix h of every encoded row (order- and partition-independent;
 * {@code job/…/input/Block#fingerprint}); the manifest keeps the row count as
 * {@code input.rows} and the two hashes as {@code input.fingerprint} (hex). The hashes cannot be
 * recomputed from a store — it keeps counts, not rows — so the reader verifies what can be: the
 * hash part is present and hexadecimal, and the row part is recomputed from the stored counts
 * (every family counts every row once, so each family's N_ij summed over j must equal
 * {@code input.rows}). A store whose counts do not add up to the data it claims to describe is
 * refused. Results carry the fingerprint ({@code store.fingerprint} in the edges JSON), so two
 * results can be traced to the same data.
 */
public final class StoreFormat {
    /**
     * Bumped whenever a reader of the previous version could misread a store. Version 2 adds
     * {@code missingValues} (a table whose missing cells were averaged over, {@link MissingValues}): a
     * version-1 reader would take its one completed table for the data. A store without it is still
     * written as version 1, and both are read.
     */
    public static final int VERSION = 2;
    /** The version of a store that does not record {@code missingValues}. */
    public static final int VERSION_PLAIN = 1;
    public static final String MANIFEST = "manifest.json";
    public static final String SCORES = "scores.parquet";
    public static final String COUNTS = "counts.parquet";

    /** One row per family: its index, child and sorted parents (variable indices), log score. */
    public static final MessageType SCORES_SCHEMA = MessageTypeParser.parseMessageType(
            "message edgewise_family_score {\n"
            + "  required int32 family;\n"
            + "  required int32 child;\n"
            + "  repeated int32 parents;\n"
            + "  required double log_score;\n"
            + "}");

    /** One row per (family, observed parent configuration): N_ijk for every child state k. */
    public static final MessageType COUNTS_SCHEMA = MessageTypeParser.parseMessageType(
            "message edgewise_family_counts {\n"
            + "  required int32 family;\n"
            + "  required int64 config;\n"
            + "  repeated int64 counts;\n"
            + "}");

    private StoreFormat() {
    }

    /** The manifest as the writer stores it: this format's version and the parts just written. */
    static Manifest stamp(Manifest m, StoreParts parts) {
        return new Manifest(m.missingValues() == null ? VERSION_PLAIN : VERSION, m.program(), m.programVersion(),
                m.createdAt(), m.input(), m.variables(), m.maxParents(), m.candidates(), m.forbidden(), m.required(),
                m.tiers(), m.score(), m.ess(), parts, m.missingValues(),
                m.reserve());
    }

    /** Refuses a manifest (as parsed JSON) without a format version or of another one. */
    static void checkVersion(Path dir, JsonNode tree) {
        if (tree == null || !tree.isObject() || !tree.has("formatVersion")) {
            throw new UserError("store " + dir + ": " + MANIFEST + " has no formatVersion; it is not an Edgewise manifest");
        }
        int version = tree.get("formatVersion").asInt(-1);
        if (version != VERSION && version != VERSION_PLAIN) {
            throw new UserError("store " + dir + " has format version " + tree.get("formatVersion").asText()
                    + "; this Edgewise reads format versions " + VERSION_PLAIN + " and " + VERSION);
        }
        if (version == VERSION_PLAIN && tree.has("missingValues")) {
            throw new UserError("store " + dir + ": " + MANIFEST + " records missingValues but has format version "
                    + VERSION_PLAIN + "; it is damaged");
        }
    }

    /**
     * Checks the data fingerprint against the stored counts (see the class comment):
     * {@code counts.get(f)} are the N_ijk of family f of {@code families} (children per family).
     */
    static void checkFingerprint(Path dir, Manifest m, int[] childOf, List<long[]> counts) {
        InputInfo in = m.input();
        if (in == null || in.fingerprint() == null || !in.fingerprint().matches("[0-9a-f]+")) {
            throw new UserError("store " + dir + ": " + MANIFEST + " has no data fingerprint (input.fingerprint, hex)");
        }
        for (int f = 0; f < counts.size(); f++) {
            long total = 0;
            for (long c : counts.get(f)) {
                total += c;
            }
            if (total != in.rows()) {
                throw new UserError("store " + dir + " is damaged: family " + f + " (child "
                        + m.variables().get(childOf[f]).name() + ") counts " + total + " rows; the data fingerprint says "
                        + in.rows());
            }
        }
    }

    /**
     * What the manifest says that can be checked before the parts are read: every part is a plain
     * file name inside the store (never a path that leads out of it), maxParents is not negative,
     * variable names are unique, and every variable's state labels are unique (a query names
     * variables and states by label).
     */
    static void checkManifest(Path dir, Manifest m) {
        checkPartName(dir, "parts.scoresFile", m.parts().scoresFile());
        checkPartName(dir, "parts.countsFile", m.parts().countsFile());
        if (m.maxParents() < 0) {
            throw new UserError("store " + dir + ": " + MANIFEST + " has maxParents " + m.maxParents()
                    + "; it must be 0 or more");
        }
        java.util.Set<String> names = new java.util.HashSet<>();
        for (Variable v : m.variables()) {
            if (v == null || v.name() == null || v.states() == null) {
                throw new UserError("store " + dir + ": " + MANIFEST + " lists a variable without a name or states");
            }
            if (!names.add(v.name())) {
                throw new UserError("store " + dir + ": " + MANIFEST + " lists the variable '" + v.name() + "' twice");
            }
        }
        for (Variable v : m.variables()) {
            java.util.Set<String> seen = new java.util.HashSet<>();
            for (String state : v.states()) {
                if (!seen.add(state)) {
                    throw new UserError("store " + dir + ": " + MANIFEST + " lists the state '" + state + "' of variable '"
                            + v.name() + "' twice");
                }
            }
        }
    }

    /**
     * Refuses a part name that is not a plain file name of the store directory: empty, {@code .} or
     * {@code ..}, or holding a path separator or NUL (so {@code ../other/scores.parquet} and
     * {@code /etc/passwd} are never opened).
     */
    static void checkPartName(Path dir, String field, String name) {
        boolean plain = name != null && !name.isEmpty() && !name.equals(".") && !name.equals("..")
                && name.indexOf('/') < 0 && name.indexOf('\\') < 0 && name.indexOf('\0') < 0;
        if (!plain) {
            throw new UserError("store " + dir + ": " + MANIFEST + " field " + field + " is "
                    + (name == null ? "missing" : "'" + name + "'") + "; it must be the name of a file inside the store");
        }
    }

    /**
     * The families against the manifest's maxParents d: no parent set larger than d, and at most
     * n · Σ_{k≤d} C(n−1, k) families (every child with every parent set of at most d others).
     */
    static void checkParentSets(Path dir, Manifest m, int[][] parentsOf) {
        int n = m.variables().size();
        int d = m.maxParents();
        for (int f = 0; f < parentsOf.length; f++) {
            if (parentsOf[f].length > d) {
                throw new UserError("store " + dir + " contradicts its " + MANIFEST + ": family " + f + " has "
                        + parentsOf[f].length + (parentsOf[f].length == 1 ? " parent" : " parents") + ", but maxParents is " + d);
            }
        }
        double most = 0;
        double binom = 1;
        for (int k = 0; k <= Math.min(d, n - 1); k++) {
            most += binom;
            binom = binom * (n - 1 - k) / (k + 1);
        }
        most *= n;
        if (parentsOf.length > most) {
            throw new UserError("store " + dir + " contradicts its " + MANIFEST + ": " + parentsOf.length + " families,"
                    + " but " + n + " variables with maxParents " + d + " have at most " + (long) most);
        }
    }
}
