package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import org.edgewise.driver.result.EdgeResult;

/**
 * The report's "Other features" table: the strongest ancestor and Markov-blanket posteriors.
 */
final class FeatureSection {
    private FeatureSection() {
    }

    static void write(StringBuilder h, EdgeResult r) {
        if (r.features() == null || r.features().isEmpty()) {
            return;
        }
        List<EdgeResult.Feature> fs = new ArrayList<>(r.features());
        fs.sort(Comparator.comparingDouble((EdgeResult.Feature x) -> -x.posterior()));
        h.append("<h2>Other features</h2>\n<table>\n<tr><th>kind</th><th>from</th><th>to</th><th>posterior</th></tr>\n");
        for (EdgeResult.Feature x : fs.subList(0, Math.min(30, fs.size()))) {
            h.append("<tr><td>").append(esc(x.kind())).append("</td><td>").append(esc(x.from())).append("</td><td>")
                    .append(esc(x.to())).append("</td><td class=\"num\">").append(f(x.posterior(), 3)).append("</td></tr>\n");
        }
        h.append("</table>\n<p class=\"cap\">The strongest features beyond single edges (up to 30): <i>ancestor</i> is the posterior "
                + "that a directed path leads from one variable to the other; <i>markov-blanket</i> that one is in the other's "
                + "Markov blanket.</p>\n");
    }
}
