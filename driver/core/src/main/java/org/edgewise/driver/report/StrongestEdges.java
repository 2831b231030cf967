package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.edgewise.driver.result.EdgeResult;

/**
 * The report's "Strongest edges" table: every ordered pair with a posterior of at least 0.1 (the
 * first 60), both directions and the adjacency, MCSE and R̂ when sampled, and the known network.
 */
final class StrongestEdges {
    /** Edges listed at most (the rest are in the table's CSV). */
    static final int MAX_ROWS = 25;

    private StrongestEdges() {
    }

    static void write(StringBuilder h, EdgeMatrix m, boolean[][] t, EdgeResult r) {
        int n = m.size();
        Map<String, Double> mcse = new TreeMap<>();
        Map<String, Double> rhat = new TreeMap<>();
        for (EdgeResult.Edge e : r.edges()) {
            if (e.mcse() != null) {
                mcse.put(e.from() + "\u0000" + e.to(), e.mcse());
            }
            if (e.rhat() != null) {
                rhat.put(e.from() + "\u0000" + e.to(), e.rhat());
            }
        }
        List<int[]> pairs = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a != b && m.p()[a][b] >= 0.1) {
                    pairs.add(new int[] {a, b});
                }
            }
        }
        pairs.sort(Comparator.comparingDouble((int[] e) -> -m.p()[e[0]][e[1]]).thenComparingInt(e -> e[0]).thenComparingInt(e -> e[1]));
        h.append("<h2>Strongest edges</h2>\n");
        if (pairs.isEmpty()) {
            h.append("<p>No edge has a posterior of 0.1 or more.</p>\n");
            return;
        }
        boolean mc = !mcse.isEmpty();
        h.append("<table>\n<tr><th>from</th><th>to</th><th>P(from \u2192 to)</th><th>P(to \u2192 from)</th><th>P(adjacent)</th>")
                .append(mc ? "<th>MCSE</th><th>R\u0302</th>" : "").append(t != null ? "<th>known network</th>" : "").append("</tr>\n");
        int shown = 0;
        for (int[] e : pairs) {
            if (shown++ == MAX_ROWS) {
                break;
            }
            int a = e[0];
            int b = e[1];
            String key = m.variables().get(a) + "\u0000" + m.variables().get(b);
            h.append("<tr><td>").append(esc(m.variables().get(a))).append("</td><td>").append(esc(m.variables().get(b)))
                    .append("</td><td class=\"num\">").append(f(m.p()[a][b], 3)).append("</td><td class=\"num\">")
                    .append(f(m.p()[b][a], 3)).append("</td><td class=\"num\">").append(f(m.adjacency(a, b), 3)).append("</td>");
            if (mc) {
                h.append("<td class=\"num\">").append(mcse.containsKey(key) ? f(mcse.get(key), 4) : "").append("</td><td class=\"num\">")
                        .append(rhat.containsKey(key) ? f(rhat.get(key), 3) : "").append("</td>");
            }
            if (t != null) {
                h.append("<td>").append(t[a][b] ? "yes" : t[b][a] ? "reversed" : "no").append("</td>");
            }
            h.append("</tr>\n");
        }
        StringBuilder csv = new StringBuilder(CsvLink.record(List.of("from", "to", "posterior")));
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a != b && m.p()[a][b] >= 0.001) {
                    csv.append(CsvLink.record(List.of(m.variables().get(a), m.variables().get(b), f(m.p()[a][b], 4))));
                }
            }
        }
        h.append("</table>\n<p class=\"cap\">Edges with a posterior of at least 0.1")
                .append(pairs.size() > MAX_ROWS ? " (the strongest " + MAX_ROWS + " of " + pairs.size() + ")" : "").append("; ")
                .append(CsvLink.link("edges.csv", csv.toString(), "every edge with a posterior of 0.001 or more as CSV"))
                .append(". P(adjacent) = P(from \u2192 to) + P(to \u2192 from), the posterior that the two are directly dependent "
                        + "in either direction.")
                .append("order".equals(r.method()) ? "" : " Over unknown orders P(from \u2192 to) counts every network with that "
                        + "arrow, reversible ones included, so it depends on the DAG prior; read directions from the adjacency and "
                        + "direction table.")
                .append("</p>\n");
    }
}
