package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;
import static org.edgewise.driver.report.Html.fig;
import static org.edgewise.driver.report.Html.row;

import java.util.List;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.Fragility;

/**
 * The report's "Summary" table: method, variables, how the figures were obtained, log evidence,
 * order, DAG prior, the consensus graph's arrows and lines, the posteriors fragile under an ESS sweep
 * and, with a known network, the headline
 * recovery figures.
 */
final class SummarySection {
    private SummarySection() {
    }

    static void write(StringBuilder h, EdgeResult r, EdgeMatrix m, List<ConsensusEdges.Drawn> shown,
                                EdgeRecovery rec, double threshold) {
        int arrows = 0;
        for (ConsensusEdges.Drawn d : shown) {
            arrows += d.shape() == ConsensusEdges.Shape.ARROW ? 1 : 0;
        }
        h.append("<h2>Summary</h2>\n<table>\n");
        row(h, "method", esc(r.method()));
        row(h, "variables", String.valueOf(m.size()));
        row(h, "estimates", ConvergenceSection.estimates(r));
        if (r.logEvidence() != null) {
            row(h, "log evidence", f(r.logEvidence(), 3) + (r.evidenceConvention() != null ? " (" + esc(r.evidenceConvention()) + ")" : ""));
        }
        if (r.order() != null && !r.order().isEmpty()) {
            row(h, "order", esc(String.join(", ", r.order())));
        }
        row(h, "DAG prior", dagPriorLabel(r));
        row(h, "consensus graph (threshold " + f(threshold, 2) + ")", arrows + " arrow" + (arrows == 1 ? "" : "s") + ", "
                + (shown.size() - arrows) + " line" + (shown.size() - arrows == 1 ? "" : "s"));
        List<EdgeResult.Fragile> fragile = Cautions.fragileOf(r);
        if (fragile != null) {
            row(h, "fragile under the ESS sweep", fragileCell(r, fragile));
        }
        if (rec != null) {
            row(h, "recovery of the known network", "directed AUROC " + fig(rec.directed().auroc()) + ", skeleton AUROC "
                    + fig(rec.skeleton().auroc()) + ", SHD " + rec.consensus().shd());
        }
        h.append("</table>\n");
    }

    /** The fragility cell (HTML): each fragile headline posterior in words, or none across the ESS values tried. */
    static String fragileCell(EdgeResult r, List<EdgeResult.Fragile> fragile) {
        if (fragile.isEmpty()) {
            java.util.TreeSet<Double> ess = new java.util.TreeSet<>();
            ess.add(r.settings().ess());
            for (EdgeResult.Sensitivity s : r.sensitivity()) {
                ess.add(s.ess());
            }
            List<String> words = new java.util.ArrayList<>();
            for (double e : ess) {
                words.add(Fragility.num(e));
            }
            return "none: no headline edge" + (r.essentialGraph() != null ? " or compelled direction" : "")
                    + " crosses 0.5 across ESS " + esc(String.join(", ", words));
        }
        StringBuilder sb = new StringBuilder("<b>");
        for (int i = 0; i < fragile.size(); i++) {
            sb.append(i == 0 ? "" : "<br>").append(esc(Fragility.words(fragile.get(i), "\u2192")));
        }
        return sb.append("</b> (above 0.5 here, below 0.5 at another ESS)").toString();
    }

    /** The DAG prior as a table cell (HTML): the summary's and the provenance's. */
    static String dagPriorLabel(EdgeResult r) {
        return "order".equals(r.method()) ? "given order (both DAG priors coincide)"
                : r.dagPrior() == null ? "not recorded" : esc(r.dagPrior());
    }
}
