package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;

import java.util.List;
import org.edgewise.driver.result.EdgeResult;

/**
 * The report's "Most probable parent sets" table: up to {@link HtmlReport#TOP_PARENT_SETS} per
 * variable, and which one the single best network uses.
 */
final class ParentSetSection {
    private ParentSetSection() {
    }

    static void write(StringBuilder h, EdgeResult r) {
        if (r.parentSets() == null || r.parentSets().isEmpty()) {
            return;
        }
        h.append("<h2>Most probable parent sets</h2>\n<table>\n<tr><th>variable</th><th>parent set</th><th>posterior</th>")
                .append(r.bestNetwork() != null ? "<th>in the best network</th>" : "").append("</tr>\n");
        for (EdgeResult.VariableParents vp : r.parentSets()) {
            List<EdgeResult.ParentSet> top = vp.top() == null ? List.of() : vp.top();
            int k = Math.min(top.size(), HtmlReport.TOP_PARENT_SETS);
            List<String> best = r.bestNetwork() != null && r.bestNetwork().parents() != null
                    ? r.bestNetwork().parents().get(vp.variable()) : null;
            for (int i = 0; i < k; i++) {
                EdgeResult.ParentSet ps = top.get(i);
                h.append("<tr>");
                if (i == 0) {
                    h.append("<td rowspan=\"").append(k).append("\">").append(esc(vp.variable())).append("</td>");
                }
                h.append("<td>").append(ps.parents().isEmpty() ? "<i>none</i>" : esc(String.join(", ", ps.parents())))
                        .append("</td><td class=\"num\">").append(f(ps.posterior(), 3)).append("</td>");
                if (r.bestNetwork() != null) {
                    h.append("<td>").append(best != null && sameSet(best, ps.parents()) ? "\u2713" : "").append("</td>");
                }
                h.append("</tr>\n");
            }
        }
        h.append("</table>\n<p class=\"cap\">Up to five parent sets per variable with their posterior probability of being "
                + "exactly the variable's parents.")
                .append(r.bestNetwork() != null ? " \u2713 marks the set in the single highest-scoring network (log score "
                        + f(r.bestNetwork().logScore(), 3) + ")." : "").append("</p>\n");
    }

    private static boolean sameSet(List<String> a, List<String> b) {
        return a.size() == b.size() && a.containsAll(b);
    }
}
