package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.result.EdgeResult;

/**
 * The report's table of unordered pairs: P(adjacent), P(a → b compelled), P(b → a compelled),
 * P(adjacent and reversible) and the Monte Carlo standard error, from the result's essential
 * graph ({@link ConsensusEdges}). Without one, the direction columns read "not assessed" and the
 * MCSE of P(adjacent) = P(a → b) + P(b → a) is bounded by the sum of the two edges' MCSEs
 * (the standard deviation of a sum is at most the sum of the standard deviations, by the
 * Cauchy–Schwarz inequality).
 */
final class PairTable {
    /** Pairs listed at most (the rest are in the table's CSV). */
    static final int MAX_ROWS = 25;
    /** Pairs with P(adjacent) below this are left out. */
    static final double MIN_ADJACENT = 0.1;

    private PairTable() {
    }

    static void write(StringBuilder h, EdgeMatrix m, ConsensusEdges ce, boolean[][] truth, EdgeResult r, AssessHint hint) {
        if (ce.givenOrder()) {
            return; // given an order the strongest-edges table already holds P(a → b | order), the adjacency itself
        }
        Map<String, Double> edgeMcse = new HashMap<>();
        for (EdgeResult.Edge e : r.edges()) {
            if (e.mcse() != null) {
                edgeMcse.put(e.from() + "\u0000" + e.to(), e.mcse());
            }
        }
        List<ConsensusEdges.Pair> rows = new ArrayList<>();
        for (ConsensusEdges.Pair p : ce.pairs()) {
            if (p.adjacent() >= MIN_ADJACENT) {
                rows.add(p);
            }
        }
        rows.sort(Comparator.comparingDouble((ConsensusEdges.Pair p) -> -p.adjacent()).thenComparingInt(ConsensusEdges.Pair::a)
                .thenComparingInt(ConsensusEdges.Pair::b));
        h.append("<h2>Adjacency and direction</h2>\n");
        if (rows.isEmpty()) {
            h.append("<p>No pair has P(adjacent) of ").append(f(MIN_ADJACENT, 1)).append(" or more.</p>\n");
            return;
        }
        boolean anyMcse = !edgeMcse.isEmpty() || rows.stream().anyMatch(p -> p.mcse() != null);
        h.append("<table class=\"pairs\">\n<tr><th>a</th><th>b</th><th>P(adjacent)</th><th>P(a \u2192 b compelled)</th>")
                .append("<th>P(b \u2192 a compelled)</th><th>P(reversible)</th>").append(anyMcse ? "<th>MCSE</th>" : "")
                .append(truth != null ? "<th>known network</th>" : "").append("</tr>\n");
        int shown = 0;
        for (ConsensusEdges.Pair p : rows) {
            if (shown++ == MAX_ROWS) {
                break;
            }
            String a = m.variables().get(p.a());
            String b = m.variables().get(p.b());
            h.append("<tr><td>").append(esc(a)).append("</td><td>").append(esc(b)).append("</td><td class=\"num\">")
                    .append(f(p.adjacent(), 3)).append("</td>");
            if (p.assessed()) {
                h.append("<td class=\"num\">").append(f(p.aToB(), 3)).append("</td><td class=\"num\">").append(f(p.bToA(), 3))
                        .append("</td><td class=\"num\">").append(f(p.undirected(), 3)).append("</td>");
            } else {
                h.append("<td colspan=\"3\" class=\"na\">not assessed</td>");
            }
            if (anyMcse) {
                Double x = p.assessed() ? p.mcse() : sumOrNull(edgeMcse.get(a + "\u0000" + b), edgeMcse.get(b + "\u0000" + a));
                h.append("<td class=\"num\">").append(x == null ? "" : (p.assessed() ? "" : "\u2264 ") + f(x, 4)).append("</td>");
            }
            if (truth != null) {
                h.append("<td>").append(truth[p.a()][p.b()] ? esc(a + " \u2192 " + b) : truth[p.b()][p.a()] ? esc(b + " \u2192 " + a)
                        : "not joined").append("</td>");
            }
            h.append("</tr>\n");
        }
        h.append("</table>\n<p class=\"cap\">Pairs with P(adjacent) of at least ").append(f(MIN_ADJACENT, 1))
                .append(rows.size() > MAX_ROWS ? " (the strongest " + MAX_ROWS + " of " + rows.size() + ")" : "").append("; ")
                .append(CsvLink.link("pairs.csv", csv(m, ce, truth), "every pair as CSV")).append(". ");
        if (ce.assessed()) {
            h.append("P(adjacent) = P(a \u2192 b compelled) + P(b \u2192 a compelled) + P(reversible), from the essential graph "
                    + "(completed partially directed DAG) of every sampled network: a direction is <i>compelled</i> when every "
                    + "network of the Markov equivalence class orients the edge alike, <i>reversible</i> when some orient it the "
                    + "other way \u2014 then the data cannot tell the direction. MCSE: the largest Monte Carlo standard error of "
                    + "the four.</p>\n");
        } else {
            h.append("P(adjacent) = P(a \u2192 b) + P(b \u2192 a), the posterior that the two are directly dependent. Directions "
                    + "were not assessed: run ").append(hint.html()).append(" for the compelled and reversible "
                    + "posteriors.").append(anyMcse ? " MCSE: at most the sum of the two edges' Monte Carlo standard errors." : "")
                    .append("</p>\n");
        }
    }

    /** Every pair with P(adjacent) above 0 as CSV: a, b, adjacent, the three direction posteriors (empty: not assessed), known. */
    static String csv(EdgeMatrix m, ConsensusEdges ce, boolean[][] truth) {
        StringBuilder sb = new StringBuilder(CsvLink.record(List.of("a", "b", "adjacent", "aToBCompelled", "bToACompelled",
                "reversible", "knownNetwork")));
        for (ConsensusEdges.Pair p : ce.pairs()) {
            if (p.adjacent() <= 0) {
                continue;
            }
            String a = m.variables().get(p.a());
            String b = m.variables().get(p.b());
            sb.append(CsvLink.record(List.of(a, b, f(p.adjacent(), 4), p.assessed() ? f(p.aToB(), 4) : "",
                    p.assessed() ? f(p.bToA(), 4) : "", p.assessed() ? f(p.undirected(), 4) : "",
                    truth == null ? "" : truth[p.a()][p.b()] ? a + " -> " + b : truth[p.b()][p.a()] ? b + " -> " + a : "no")));
        }
        return sb.toString();
    }

    private static Double sumOrNull(Double x, Double y) {
        return x == null && y == null ? null : (x == null ? 0 : x) + (y == null ? 0 : y);
    }
}
