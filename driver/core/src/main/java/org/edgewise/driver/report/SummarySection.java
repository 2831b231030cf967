package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;
import static org.edgewise.driver.report.Html.fig;
import static org.edgewise.driver.report.Html.row;

import java.util.List;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.result.Fragility;

/**
 * The report's "Summary", which leads with the answer: the strongest dependencies, the directions
 * the data (or the tiers, or the given order) fix, the effects asked, and the cautions that apply
 * to this result (directions left open, posteriors fragile under the ESS sweep, candidates pruned
 * at tally time that bound the posterior, chains that did not converge). The technical table
 * (method, how the figures were obtained, log evidence, order, tiers, DAG prior, the consensus
 * graph's arrows and lines, recovery of a known network) follows, folded.
 */
final class SummarySection {
    /** Dependencies named in the summary at most. */
    static final int TOP = 8;

    private SummarySection() {
    }

    static void write(StringBuilder h, EdgeResult r, EdgeMatrix m, ConsensusEdges ce, List<ConsensusEdges.Drawn> shown,
                      EdgeRecovery rec, double threshold, List<EffectResult> effects) {
        int arrows = 0;
        int byTiers = 0;
        for (ConsensusEdges.Drawn d : shown) {
            arrows += d.shape() == ConsensusEdges.Shape.ARROW ? 1 : 0;
            byTiers += d.byTiers() ? 1 : 0;
        }
        List<ConsensusEdges.Drawn> strongest = new java.util.ArrayList<>(shown);
        strongest.sort(java.util.Comparator.comparingDouble((ConsensusEdges.Drawn d) -> -d.p()));
        h.append("<h2 id=\"summary\">Summary</h2>\n<div class=\"answer\">\n");
        h.append("<p><b>Strongest dependencies</b> (posterior that the two are directly joined")
                .append(ce.givenOrder() ? ", given the order" : "").append("):</p>\n<ul class=\"cols\">\n");
        if (strongest.isEmpty()) {
            h.append("<li>none above ").append(f(threshold, 2)).append("</li>\n");
        }
        for (int i = 0; i < Math.min(TOP, strongest.size()); i++) {
            ConsensusEdges.Drawn d = strongest.get(i);
            double adj = ce.givenOrder() ? d.p() : d.pair().adjacent();
            h.append("<li>").append(esc(m.variables().get(d.from()))).append(d.shape() == ConsensusEdges.Shape.ARROW ? " \u2192 " : " \u2014 ")
                    .append(esc(m.variables().get(d.to()))).append(" <b>").append(Html.prob(adj)).append("</b></li>\n");
        }
        h.append("</ul>\n");
        if (strongest.size() > TOP) {
            h.append("<p class=\"cap\">and ").append(strongest.size() - TOP).append(" more in the graph below.</p>\n");
        }
        h.append("<p><b>Directions:</b></p>\n").append(directions(m, ce, shown, arrows, byTiers)).append('\n');
        List<List<String>> tiers = r.settings() == null ? null : r.settings().tiers();
        if (tiers != null && !tiers.isEmpty()) {
            h.append("<p><b>Tiers you gave</b> (no arrow may point to an earlier tier): ").append(esc(tierText(tiers))).append("</p>\n");
        }
        if (effects != null) {
            for (EffectResult e : effects) {
                h.append("<p><b>Effect asked:</b> ").append(EffectSection.headline(e)).append(" <a href=\"#interventions\">Details</a>.</p>\n");
            }
        }
        h.append("</div>\n");
        h.append("<div class=\"caution\">\n<h3>Cautions for this result</h3>\n<ul>\n");
        int open = shown.size() - arrows;
        if (!ce.givenOrder() && !ce.assessed()) {
            h.append("<li><b>Directions unknown.</b> Which way each dependency runs was not worked out for this result, so the "
                    + "graph draws lines only; see the assumptions below for how to ask for it.</li>\n");
        } else if (open > 0) {
            h.append("<li><b>").append(open).append(" of ").append(shown.size()).append(" dependencies have no direction the data fix</b> "
                    + "(drawn as lines): networks pointing them either way fit the data equally well.</li>\n");
        }
        if (ce.givenOrder()) {
            h.append("<li><b>Every arrow follows the order you gave</b>: an assumption, not something learned from the data.</li>\n");
        }
        h.append(Cautions.fragile(r));
        h.append(Cautions.priorFragile(r));
        h.append(Cautions.candidates(r));
        if (r.diagnostics() != null && !r.diagnostics().converged()) {
            h.append("<li><b>The sampler did not converge:</b> do not use these posteriors yet (see Convergence).</li>\n");
        }
        if (effects != null) {
            for (EffectResult e : effects) {
                if (Boolean.FALSE.equals(e.converged())) {
                    h.append("<li><b>The effect's sampler did not converge</b>: treat its figures as unsettled.</li>\n");
                }
            }
        }
        h.append("<li><b>A dependency is evidence of association under stated assumptions, not proof of causation.</b> "
                + "Results can inform decisions about health or safety only together with domain experts and local practice.</li>\n");
        h.append("</ul>\n</div>\n");

        h.append("<details><summary>How these figures were computed</summary>\n<table>\n");
        row(h, "method", esc(r.method()));
        row(h, "variables", String.valueOf(m.size()));
        row(h, "estimates", ConvergenceSection.estimates(r));
        if (r.logEvidence() != null) {
            row(h, "log evidence", f(r.logEvidence(), 3) + (r.evidenceConvention() != null ? " (" + esc(r.evidenceConvention()) + ")" : ""));
        }
        if (r.order() != null && !r.order().isEmpty()) {
            row(h, "order", esc(String.join(", ", r.order())));
        }
        if (tiers != null && !tiers.isEmpty()) {
            row(h, "tiers", esc(tierText(tiers)));
        }
        row(h, "DAG prior", dagPriorLabel(r));
        row(h, "consensus graph (threshold " + f(threshold, 2) + ")", arrows + " arrow" + (arrows == 1 ? "" : "s")
                + (byTiers > 0 ? " (" + byTiers + " fixed by the tiers)" : "") + ", "
                + (shown.size() - arrows) + " line" + (shown.size() - arrows == 1 ? "" : "s"));
        List<EdgeResult.Fragile> fragile = Cautions.fragileOf(r);
        if (fragile != null) {
            row(h, "fragile under the ESS sweep", fragileCell(r, fragile));
        }
        if (r.priorComparison() != null) {
            row(h, "fragile between the DAG priors", priorFragileCell(r));
        }
        if (rec != null) {
            row(h, "recovery of the known network", "directed AUROC " + fig(rec.directed().auroc()) + ", skeleton AUROC "
                    + fig(rec.skeleton().auroc()) + ", SHD " + rec.consensus().shd());
        }
        h.append("</table>\n</details>\n");
    }

    /** Pairs named per list of the directions paragraph at most. */
    static final int NAMED = 8;

    /**
     * The directions paragraph (HTML): by name, the directions the data fix (compelled), those the tiers
     * fix, and the dependencies left open (either way as far as the data tell), so that the summary alone
     * says which is which.
     */
    static String directions(EdgeMatrix m, ConsensusEdges ce, List<ConsensusEdges.Drawn> shown, int arrows, int byTiers) {
        if (ce.givenOrder()) {
            return "<ul class=\"dirs\">\n<li>every arrow is directed by the order you gave</li>\n</ul>";
        }
        List<String> data = new java.util.ArrayList<>();
        List<String> tiers = new java.util.ArrayList<>();
        List<String> open = new java.util.ArrayList<>();
        List<ConsensusEdges.Drawn> sorted = new java.util.ArrayList<>(shown);
        sorted.sort(java.util.Comparator.comparingDouble((ConsensusEdges.Drawn d) -> -d.p()));
        for (ConsensusEdges.Drawn d : sorted) {
            String a = m.variables().get(d.from());
            String b = m.variables().get(d.to());
            if (d.shape() == ConsensusEdges.Shape.LINE) {
                open.add(esc(a + " \u2014 " + b));
            } else if (d.byTiers()) {
                tiers.add(esc(a + " \u2192 " + b));
            } else {
                data.add(esc(a + " \u2192 " + b) + " " + Html.prob(d.p()));
            }
        }
        StringBuilder sb = new StringBuilder("<ul class=\"dirs\">\n<li><b>fixed by the data</b>");
        if (!ce.assessed()) {
            sb.append(": not assessed for this result (the dependencies are drawn as lines)");
        } else {
            sb.append(" (compelled: the same in every network that fits the data equally well): ")
                    .append(data.isEmpty() ? "none" : "<b>" + named(data) + "</b>");
        }
        sb.append("</li>\n");
        if (byTiers > 0 || ce.tier() != null) {
            sb.append("<li><b>fixed by the tiers you gave</b>: ").append(tiers.isEmpty() ? "none" : named(tiers)).append("</li>\n");
        }
        sb.append("<li><b>open</b> (").append(ce.assessed() ? "either way as far as these data tell" : "directions not assessed")
                .append("): ").append(open.isEmpty() ? "none" : named(open)).append("</li>\n</ul>");
        return sb.toString();
    }

    /** Up to {@value #NAMED} items joined by semicolons, then how many more. */
    private static String named(List<String> items) {
        return items.size() <= NAMED ? String.join("; ", items)
                : String.join("; ", items.subList(0, NAMED)) + "; and " + (items.size() - NAMED) + " more";
    }

    static String tierText(List<List<String>> tiers) {
        List<String> parts = new java.util.ArrayList<>();
        for (List<String> t : tiers) {
            parts.add(String.join(", ", t));
        }
        return String.join(" \u2192 ", parts);
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

    /** The cell (HTML) of the posteriors that cross 0.5 between the DAG priors, or none. */
    static String priorFragileCell(EdgeResult r) {
        EdgeResult.PriorComparison c = r.priorComparison();
        if (c.fragile().isEmpty()) {
            return "none: no headline edge" + (r.essentialGraph() != null ? " or compelled direction" : "")
                    + " crosses 0.5 between the " + esc(String.valueOf(r.dagPrior())) + " and " + esc(c.dagPrior()) + " DAG priors";
        }
        StringBuilder sb = new StringBuilder("<b>");
        for (int i = 0; i < c.fragile().size(); i++) {
            sb.append(i == 0 ? "" : "<br>").append(esc(Fragility.words(c.fragile().get(i), "\u2192")));
        }
        return sb.append("</b>").toString();
    }

    /** The DAG prior as a table cell (HTML): the summary's and the provenance's. */
    static String dagPriorLabel(EdgeResult r) {
        return "order".equals(r.method()) ? "given order (both DAG priors coincide)"
                : r.dagPrior() == null ? "not recorded" : esc(r.dagPrior()) + (r.priorComparison() == null ? ""
                : "; the " + esc(r.priorComparison().dagPrior()) + " posteriors computed beside it for comparison");
    }
}
