package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.c;
import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.result.EffectResult;

/**
 * The report's "Interventions" section from {@code effect} results: per question, the
 * interventional probability beside the observational conditional, the probability of no effect,
 * the credible interval, a histogram (SVG) of the effect's posterior draws, and the assumptions.
 * Added to an edges report before its closing tag ({@link #insertInto}), or as a page of its own
 * ({@link #page}). Every name from the data passes through {@link Html#esc}.
 */
public final class EffectSection {
    private EffectSection() {
    }

    /** The edges report {@code html} with the section added before {@code </body>}. */
    public static String insertInto(String html, List<EffectResult> results) {
        int at = html.lastIndexOf("</body>");
        return html.substring(0, at) + section(results) + html.substring(at);
    }

    /** A self-contained page holding the section alone. */
    public static String page(List<EffectResult> results, String name) {
        return "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n"
                + "<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'; img-src data:\">\n"
                + "<title>Edgewise interventions: " + esc(name) + "</title>\n<style>body{font-family:system-ui,sans-serif;"
                + "max-width:1000px;margin:24px auto;padding:0 16px;color:#1f2d3d}table{border-collapse:collapse}"
                + "td,th{border:1px solid #d5dce4;padding:4px 9px;text-align:left}.caution{border:3px solid #c77700;"
                + "background:#fff6e5;padding:12px 18px;border-radius:8px}.cap{color:#5a6b7d;font-size:14px}</style>\n</head>\n<body>\n"
                + "<h1>Interventions</h1>\n<p class=\"cap\">Edgewise report of <code>" + esc(name) + "</code></p>\n"
                + section(results) + "</body>\n</html>\n";
    }

    static String section(List<EffectResult> results) {
        StringBuilder h = new StringBuilder();
        h.append("<h2 id=\"interventions\">Interventions: what setting a variable would do</h2>\n");
        h.append("<div class=\"caution\"><b>Read this first.</b> An interventional probability from observational data holds only if ")
                .append("the variables include every common cause of the ones involved (no hidden confounders), the data were not selected ")
                .append("on an effect, and the network is read causally. It is a model-based estimate to weigh with domain experts and local ")
                .append("practice, never a substitute for an experiment where one is possible.</div>\n");
        for (EffectResult r : results) {
            one(h, r);
        }
        return h.toString();
    }

    private static void one(StringBuilder h, EffectResult r) {
        String y = text(r.target()) + (r.given() == null ? "" : ", given " + text(r.given()));
        EffectResult.Observed o = r.observed();
        boolean raw = o != null && o.probability() != null;
        h.append("<h3>").append(esc(text(r.intervention()))).append(" \u2192 ").append(esc(y)).append("</h3>\n");
        if (r.design() != null) {
            h.append("<p class=\"caution\">").append(esc(r.design().note())).append(".</p>\n");
        }
        h.append("<table>\n<tr><th></th><th>setting (do), the model's</th><th>conditioning, the model's</th>")
                .append(raw ? "<th>raw frequency in the data</th>" : "").append("</tr>\n");
        h.append("<tr><td>").append(esc(text(r.intervention()))).append("</td><td class=\"num\">").append(num(r.probability()))
                .append(r.probability() == null ? "" : mcse(r.estimate(), r.mcse())).append("</td><td class=\"num\">")
                .append(num(r.observational().probability())).append("</td>")
                .append(raw ? "<td class=\"num\">" + o.events() + "/" + o.rows() + " = " + f(o.probability(), 4) + "</td>" : "")
                .append("</tr>\n");
        if (r.versus() != null) {
            h.append("<tr><td>").append(esc(text(r.versus().intervention()))).append("</td><td class=\"num\">")
                    .append(num(r.versus().probability())).append("</td><td class=\"num\">")
                    .append(num(r.observational().versusProbability())).append("</td>")
                    .append(raw && o.versusRows() != null ? "<td class=\"num\">" + o.versusEvents() + "/" + o.versusRows() + " = "
                            + num(o.versusProbability()) + "</td>" : raw ? "<td></td>" : "").append("</tr>\n");
            h.append("<tr><th>difference</th><td class=\"num\">").append(num(r.difference())).append("</td><td class=\"num\">")
                    .append(num(r.observational().difference())).append("</td>").append(raw ? "<td></td>" : "").append("</tr>\n");
            if (r.oddsRatio() != null) {
                h.append("<tr><th>odds ratio</th><td class=\"num\">").append(num(modelOddsRatio(r))).append("</td><td class=\"num\">")
                        .append(num(r.observational().oddsRatio())).append("</td>")
                        .append(raw ? "<td class=\"num\">" + (o.oddsRatio() == null ? "" : "crude " + f(o.oddsRatio(), 4)) + "</td>" : "")
                        .append("</tr>\n");
            }
        }
        h.append("</table>\n");
        if (o != null) {
            String label = o.label().startsWith("raw frequencies") ? "R" + o.label().substring(1) : "Raw frequencies: " + o.label();
            h.append("<p class=\"cap\">").append(esc(label))
                    .append(o.oddsRatio() == null ? "" : "; crude odds ratio " + f(o.oddsRatio(), 4)).append(".</p>\n");
        }
        if (r.oddsRatio() != null) {
            h.append("<table>\n<tr><th>measure</th><th>estimate</th><th>").append(Math.round(100 * r.interval().level()))
                    .append("% credible interval</th><th>over</th></tr>\n");
            measureRow(h, "risk difference", r.riskDifference());
            measureRow(h, "risk ratio", r.riskRatio());
            measureRow(h, "odds ratio", r.oddsRatio());
            h.append("</table>\n<p class=\"cap\">").append(esc(r.measures())).append(".</p>\n");
        }
        h.append("<p>Probability of no effect (no directed path from the set variables to the outcome): <b>")
                .append(f(r.noPathProbability(), 4)).append("</b>").append(mcse(r.noPathEstimate(), r.noPathMcse()))
                .append(". ").append(Math.round(100 * r.interval().level())).append("% credible interval ")
                .append(r.interval().of().equals("all draws") ? "over " : r.interval().of().endsWith("effect") ? "over the " : "of the ")
                .append(esc(r.interval().of())).append(": [").append(f(r.interval().lower(), 4)).append(", ")
                .append(f(r.interval().upper(), 4)).append("].</p>\n");
        if (r.split() != null) {
            split(h, r.split());
        }
        if (r.posterior() != null) {
            h.append("<div class=\"fig\">").append(histogram(r.posterior())).append("</div>\n");
            h.append("<p class=\"cap\">Posterior distribution of the ").append(esc(r.posterior().of())).append(" over ")
                    .append(r.posterior().draws()).append(" draws of a network and its parameters. The conditioning column "
                            + "conditions on the variable instead of setting it (the model's, not the raw frequency)")
                    .append(r.split() == null ? "." : "; why the two differ is said above.").append("</p>\n");
        }
        h.append("<details><summary>How this was computed</summary><p class=\"cap\">Averaged over: ").append(esc(r.averagedOver()))
                .append(r.dagPrior() == null ? "" : "; DAG prior " + esc(r.dagPrior())).append(". ")
                .append("exact".equals(r.estimate()) ? "The probabilities are exact averages."
                        : "The probabilities are estimated from sampled networks; the \u00b1 figure is the Monte Carlo standard error.")
                .append("</p></details>\n");
    }

    /** The cause of the gap between conditioning and setting, in a few words (HTML-free). */
    static String cause(EffectResult.Split s) {
        String through = s.backDoor().isEmpty() ? "" : " through " + String.join(", ", s.backDoor());
        return switch (s.cause()) {
            case "none" -> "none: setting and conditioning agree";
            case "unknown direction" -> "mostly an unknown direction";
            case "confounding" -> "mostly confounding" + through;
            default -> "both an unknown direction and confounding" + through;
        };
    }

    /** The split of the posterior over "no path" and "a path", and what each explains of the association (HTML). */
    private static void split(StringBuilder h, EffectResult.Split s) {
        boolean odds = "log odds ratio".equals(s.scale());
        String unit = odds ? " (log odds ratio)" : "";
        h.append("<p><b>Why conditioning and setting differ: ").append(esc(cause(s))).append(".</b></p>\n")
                .append("<table>\n<tr><th>networks in which the set variable</th><th>posterior</th><th>part of the association "
                        + "they explain").append(unit).append("</th></tr>\n")
                .append("<tr><td>cannot affect the outcome (no directed path)</td><td class=\"num\">").append(f(s.noEffect(), 4))
                .append("</td><td class=\"num\">").append(signed4(s.directionPart())).append(" (not an effect)</td></tr>\n")
                .append("<tr><td>can affect it</td><td class=\"num\">").append(f(s.effect(), 4)).append("</td><td class=\"num\">")
                .append(signed4(s.setting())).append(" effect, ").append(signed4(s.confoundingPart()))
                .append(" confounding</td></tr>\n<tr><th>together</th><td class=\"num\">1</td><td class=\"num\">")
                .append(signed4(s.association())).append(odds ? " (the model's conditioning log odds ratio)"
                        : " (the model's conditioning difference)").append("</td></tr>\n</table>\n")
                .append("<p class=\"cap\">").append(esc(s.words())).append(". The split reads the association as alike in both "
                        + "groups of networks (a first-order split)").append(odds ? "; it is taken on the log odds ratio because "
                        + "risks are not estimable from this sample" : "").append(".</p>\n");
    }

    private static String signed4(double v) {
        double x = Math.abs(v) < 5e-5 ? 0 : v;
        return (x > 0 ? "+" : "") + f(x, 4);
    }

    private static void measureRow(StringBuilder h, String name, EffectResult.Measure m) {
        if (m == null) {
            h.append("<tr><td>").append(name).append("</td><td colspan=\"3\">not estimable from this design</td></tr>\n");
            return;
        }
        h.append("<tr><td>").append(name).append("</td><td class=\"num\">").append(f(m.estimate(), 4))
                .append(m.estimateOf().equals("model") ? "" : " (" + esc(m.estimateOf()) + ")").append("</td><td class=\"num\">[")
                .append(f(m.interval().lower(), 4)).append(", ").append(f(m.interval().upper(), 4)).append("]</td><td>")
                .append(esc(m.interval().of()))
                .append(m.noEffectProbability() == null ? "" : "; probability of no effect " + f(m.noEffectProbability(), 4))
                .append("</td></tr>\n");
    }

    /**
     * One sentence (HTML) for the report's summary: what setting the variable does to the outcome, in
     * the measure the result leads with, its interval, and the probability of no effect.
     */
    static String headline(EffectResult r) {
        String x = esc(text(r.intervention()));
        String y = "P(" + esc(text(r.target())) + (r.given() == null ? "" : " | " + esc(text(r.given()))) + ")";
        int level = (int) Math.round(100 * r.interval().level());
        StringBuilder sb = new StringBuilder();
        if (r.versus() == null) {
            sb.append("setting ").append(x).append(" makes ").append(y).append(' ').append(num(r.probability()));
            return sb.append(" (").append(level).append("% credible interval [").append(f(r.interval().lower(), 3)).append(", ")
                    .append(f(r.interval().upper(), 3)).append("]); probability that it has no effect at all ")
                    .append(f(r.noPathProbability(), 2)).append('.').toString();
        }
        String lead = r.leadingMeasure() == null ? "riskDifference" : r.leadingMeasure();
        EffectResult.Measure m = switch (lead) {
            case "riskRatio" -> r.riskRatio();
            case "oddsRatio" -> r.oddsRatio();
            default -> r.riskDifference();
        };
        if (m == null) {
            m = r.oddsRatio();
            lead = "oddsRatio";
        }
        sb.append("setting ").append(x).append(" rather than ").append(esc(text(r.versus().intervention()))).append(' ');
        if (m == null) {
            sb.append("changes ").append(y).append(" by ").append(num(r.difference()));
        } else {
            String word = switch (lead) {
                case "riskRatio" -> "multiplies " + y + " by ";
                case "oddsRatio" -> "multiplies the odds of " + y.substring(2, y.length() - 1) + " by ";
                default -> "changes " + y + " by ";
            };
            sb.append(word).append("<b>").append(lead.equals("riskDifference") ? signed(m.estimate()) : f(m.estimate(), 3)).append("</b> (")
                    .append(level).append("% credible interval [").append(f(m.interval().lower(), 3)).append(", ")
                    .append(f(m.interval().upper(), 3)).append("]").append(m.interval().of().contains("with an effect") ? " over the " + esc(m.interval().of()) : "")
                    .append(')');
        }
        sb.append("; probability that it has no effect at all ").append(f(r.noPathProbability(), 2)).append('.');
        EffectResult.Observational c = r.observational();
        if (c.difference() != null) {
            sb.append(" Conditioning instead (the model's): ").append(signed(c.difference())).append('.');
        } else if (c.oddsRatio() != null) {
            sb.append(" Conditioning instead (the model's odds ratio): ").append(f(c.oddsRatio(), 3)).append('.');
        }
        EffectResult.Observed o = r.observed();
        if (o != null && o.probability() != null && o.versusProbability() != null) {
            boolean sample = r.design() != null && r.design().state() != null;
            sb.append(" Raw frequencies in the data").append(sample ? " (shares in the case-control sample, not risks)" : "")
                    .append(": ").append(o.events()).append('/').append(o.rows()).append(" = ").append(f(o.probability(), 3))
                    .append(" vs ").append(o.versusEvents()).append('/').append(o.versusRows()).append(" = ")
                    .append(f(o.versusProbability(), 3))
                    .append(o.oddsRatio() == null ? "" : ", crude odds ratio " + f(o.oddsRatio(), 3)).append('.');
        } else if (o != null) {
            sb.append(" Raw frequencies: ").append(esc(o.label())).append('.');
        }
        if (r.split() != null) {
            sb.append(" Why setting and conditioning differ: <b>").append(esc(cause(r.split()))).append("</b>")
                    .append("unknown direction".equals(r.split().cause()) || "both".equals(r.split().cause())
                            ? " (no directed path from " + esc(String.join(", ", r.intervention().keySet())) + " to "
                            + esc(String.join(", ", r.target().keySet())) + " with probability " + f(r.split().noEffect(), 2) + ")"
                            : "").append('.');
        }
        return sb.toString();
    }

    /** The model's odds ratio over every structure (the measure's estimate, or its overall figure when the estimate is of the draws with an effect). */
    private static Double modelOddsRatio(EffectResult r) {
        EffectResult.Measure m = r.oddsRatio();
        return m.overallEstimate() != null ? m.overallEstimate() : m.estimate();
    }

    private static String signed(double v) {
        return (v > 0 ? "+" : "") + f(v, 3);
    }

    private static String num(Double x) {
        return x == null ? "not estimable" : f(x, 4);
    }

    private static String mcse(String estimate, double mcse) {
        return "exact".equals(estimate) ? " (exact)" : mcse < 1e-4 ? " (sampled; Monte Carlo error below 0.0001)"
                : " (\u00b1 " + String.format(java.util.Locale.ROOT, "%.2g", mcse) + " from sampling)";
    }

    /** Bars of equal-width bins from binLow to binHigh, a zero line when zero is inside, and the axis ends. */
    static String histogram(EffectResult.Posterior p) {
        int[] counts = p.counts();
        int max = 1;
        for (int k : counts) {
            max = Math.max(max, k);
        }
        double w = 520;
        double hgt = 160;
        double left = 40;
        double top = 10;
        double bw = w / counts.length;
        StringBuilder s = new StringBuilder();
        s.append("<svg xmlns=\"http://www.w3.org/2000/svg\" role=\"img\" width=\"").append(c(w + 2 * left)).append("\" height=\"")
                .append(c(hgt + 50)).append("\" font-family=\"sans-serif\" font-size=\"12\">\n<title>Posterior draws of the ")
                .append(esc(p.of())).append("</title>\n");
        for (int i = 0; i < counts.length; i++) {
            double bh = hgt * counts[i] / max;
            s.append("<rect x=\"").append(c(left + i * bw + 1)).append("\" y=\"").append(c(top + hgt - bh)).append("\" width=\"")
                    .append(c(bw - 2)).append("\" height=\"").append(c(bh)).append("\" fill=\"#4292c6\"/>\n");
        }
        double lo = p.binLow();
        double hi = p.binHigh();
        if (lo < 0 && hi > 0) {
            double x0 = left + (0 - lo) / (hi - lo) * w;
            s.append("<line x1=\"").append(c(x0)).append("\" x2=\"").append(c(x0)).append("\" y1=\"").append(c(top))
                    .append("\" y2=\"").append(c(top + hgt)).append("\" stroke=\"#c0254a\" stroke-dasharray=\"4 3\"/>\n");
        }
        s.append("<line x1=\"").append(c(left)).append("\" x2=\"").append(c(left + w)).append("\" y1=\"").append(c(top + hgt))
                .append("\" y2=\"").append(c(top + hgt)).append("\" stroke=\"#34495e\"/>\n");
        s.append("<text x=\"").append(c(left)).append("\" y=\"").append(c(top + hgt + 16)).append("\">").append(f(lo, 4)).append("</text>\n");
        s.append("<text x=\"").append(c(left + w)).append("\" y=\"").append(c(top + hgt + 16)).append("\" text-anchor=\"end\">")
                .append(f(hi, 4)).append("</text>\n");
        s.append("<text x=\"").append(c(left + w / 2)).append("\" y=\"").append(c(top + hgt + 34)).append("\" text-anchor=\"middle\">")
                .append(esc(p.of())).append(" (mean ").append(f(p.mean(), 4)).append(")</text>\n</svg>");
        return s.toString();
    }

    private static String text(Map<String, String> m) {
        List<String> parts = new ArrayList<>();
        m.forEach((k, v) -> parts.add(k + "=" + v));
        return String.join(", ", parts);
    }
}
