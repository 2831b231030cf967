package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;
import static org.edgewise.driver.report.Html.fig;
import static org.edgewise.driver.report.Html.row;

/**
 * The report's "Recovery of the known network" section: AUROC and average precision, directed and
 * for the skeleton, and the consensus graph against the known network.
 */
final class RecoverySection {
    private RecoverySection() {
    }

    static void write(StringBuilder h, EdgeRecovery rec, String truthName) {
        h.append("<h2>Recovery of the known network</h2>\n<p class=\"cap\">Compared with <code>").append(esc(truthName))
                .append("</code> (").append(rec.trueEdges()).append(" edges). This is only possible for data simulated from a known "
                        + "network; it measures the method, not the world.</p>\n");
        h.append("<table>\n<tr><th></th><th>AUROC</th><th>average precision</th><th>positives</th><th>negatives</th></tr>\n");
        rankRow(h, "directed edges (ordered pairs, scored by P(a \u2192 b))", rec.directed());
        rankRow(h, "skeleton (unordered pairs, scored by P(adjacent))", rec.skeleton());
        h.append("</table>\n");
        EdgeRecovery.Consensus c = rec.consensus();
        h.append("<table>\n");
        row(h, "consensus edges (posterior &gt; " + f(rec.threshold(), 2) + ")", String.valueOf(c.edges()));
        row(h, "correctly directed", String.valueOf(c.correct()));
        row(h, "precision / recall", fig(c.precision()) + " / " + fig(c.recall()));
        row(h, "skeleton precision / recall", fig(c.skeletonPrecision()) + " / " + fig(c.skeletonRecall()));
        row(h, "structural Hamming distance", c.shd() + " = " + c.missing().size() + " missing + " + c.extra().size()
                + " extra + " + c.reversed().size() + " reversed");
        if (!c.missing().isEmpty()) {
            row(h, "missing", esc(String.join(", ", c.missing())));
        }
        if (!c.extra().isEmpty()) {
            row(h, "extra", esc(String.join(", ", c.extra())));
        }
        if (!c.reversed().isEmpty()) {
            row(h, "reversed (true direction shown)", esc(String.join(", ", c.reversed())));
        }
        if (!rec.truthOnly().isEmpty()) {
            row(h, "known variables not in the result", esc(String.join(", ", rec.truthOnly())));
        }
        h.append("</table>\n<p class=\"cap\">AUROC: the probability that a randomly chosen true edge gets a higher posterior than a "
                + "randomly chosen non-edge (ties count half; 0.5 is chance, 1 is perfect). Average precision: the mean precision "
                + "over the ranks at which true edges are found. SHD counts each missing, extra or reversed edge of the consensus "
                + "graph once. Reversed edges are expected where the direction is not identifiable.</p>\n");
    }

    private static void rankRow(StringBuilder h, String name, EdgeRecovery.Ranking k) {
        h.append("<tr><td>").append(name).append("</td><td class=\"num\">").append(fig(k.auroc())).append("</td><td class=\"num\">")
                .append(fig(k.averagePrecision())).append("</td><td class=\"num\">").append(k.positives())
                .append("</td><td class=\"num\">").append(k.negatives()).append("</td></tr>\n");
    }
}
