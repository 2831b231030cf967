package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;
import static org.edgewise.driver.report.Html.num;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.TreeMap;
import org.edgewise.driver.result.EdgeResult;

/**
 * The report's "Sensitivity to the equivalent sample size" section: log evidence per ESS of a sweep
 * and the edges whose posterior moves by more than {@link HtmlReport#SENSITIVITY_CHANGE} across it.
 */
final class SensitivitySection {
    private SensitivitySection() {
    }

    static void write(StringBuilder h, EdgeResult r, EdgeMatrix main) {
        if (r.sensitivity() == null || r.sensitivity().isEmpty()) {
            return;
        }
        TreeMap<Double, EdgeMatrix> byEss = new TreeMap<>();
        TreeMap<Double, Double> evidence = new TreeMap<>();
        for (EdgeResult.Sensitivity s : r.sensitivity()) {
            byEss.put(s.ess(), EdgeMatrix.of(r.variables(), s.edges(), "sensitivity entry ESS " + num(s.ess())));
            evidence.put(s.ess(), s.logEvidence());
        }
        if (r.settings() != null && r.settings().ess() != null && !byEss.containsKey(r.settings().ess())) {
            byEss.put(r.settings().ess(), main);
            evidence.put(r.settings().ess(), r.logEvidence());
        }
        int n = main.size();
        List<int[]> changed = new ArrayList<>();
        List<Double> spread = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a == b) {
                    continue;
                }
                double lo = 1;
                double hi = 0;
                for (EdgeMatrix em : byEss.values()) {
                    lo = Math.min(lo, em.p()[a][b]);
                    hi = Math.max(hi, em.p()[a][b]);
                }
                if (hi - lo > HtmlReport.SENSITIVITY_CHANGE) {
                    changed.add(new int[] {a, b});
                    spread.add(hi - lo);
                }
            }
        }
        h.append("<h2>Sensitivity to the equivalent sample size</h2>\n");
        h.append("<p class=\"cap\">The same store rescored with BDeu at each ESS. BDeu edge posteriors are known to depend on "
                + "the ESS (Silander, Kontkanen &amp; Myllym\u00e4ki 2007); edges listed here change by more than "
                + f(HtmlReport.SENSITIVITY_CHANGE, 1) + " across the values tried and deserve caution.</p>\n");
        h.append("<table>\n<tr><th>edge</th>");
        for (double e : byEss.keySet()) {
            h.append("<th>ESS ").append(esc(num(e))).append("</th>");
        }
        h.append("<th>change</th></tr>\n<tr><td><i>log evidence</i></td>");
        for (double e : byEss.keySet()) {
            Double v = evidence.get(e);
            h.append("<td class=\"num\">").append(v == null ? "" : f(v, 2)).append("</td>");
        }
        h.append("<td></td></tr>\n");
        Integer[] idx = new Integer[changed.size()];
        for (int i = 0; i < idx.length; i++) {
            idx[i] = i;
        }
        java.util.Arrays.sort(idx, Comparator.comparingDouble(i -> -spread.get(i)));
        int shown = 0;
        for (int i : idx) {
            if (shown++ == HtmlReport.MAX_SENSITIVE_ROWS) {
                break;
            }
            int a = changed.get(i)[0];
            int b = changed.get(i)[1];
            h.append("<tr><td>").append(esc(main.variables().get(a) + " \u2192 " + main.variables().get(b))).append("</td>");
            for (EdgeMatrix em : byEss.values()) {
                h.append("<td class=\"num\" style=\"background:").append(Charts.colour(em.p()[a][b])).append(";color:")
                        .append(em.p()[a][b] > 0.55 ? "#fff" : "#1f2d3d").append("\">").append(f(em.p()[a][b], 3)).append("</td>");
            }
            h.append("<td class=\"num\">").append(f(spread.get(i), 3)).append("</td></tr>\n");
        }
        h.append("</table>\n");
        if (changed.size() > HtmlReport.MAX_SENSITIVE_ROWS) {
            h.append("<p class=\"cap\">").append(changed.size()).append(" edges change; the ").append(HtmlReport.MAX_SENSITIVE_ROWS)
                    .append(" that change most are shown.</p>\n");
        }
        if (changed.isEmpty()) {
            h.append("<p>No edge posterior changes by more than ").append(f(HtmlReport.SENSITIVITY_CHANGE, 1))
                    .append(" across these ESS values.</p>\n");
        }
    }
}
