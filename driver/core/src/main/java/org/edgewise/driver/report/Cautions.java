package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;

import java.util.List;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.Fragility;

/**
 * The report's "Read this first" box and the consensus graph's caption: what an edge posterior
 * means (evidence of statistical dependence under stated assumptions, not causation), which DAG
 * prior the result was computed under (DESIGN.md, "DAG priors over unknown orders"), and how
 * far its directions can be read (essential graph: Chickering 1995; Andersson, Madigan &amp;
 * Perlman 1997), and which headline posteriors are fragile under the ESS sweep.
 */
final class Cautions {
    private Cautions() {
    }

    static void write(StringBuilder h, EdgeResult r, ConsensusEdges ce, AssessHint hint) {
        EdgeResult.Settings s = r.settings();
        h.append("<details>\n<summary>Assumptions behind every figure, and what the technical terms mean</summary>\n<ul>\n")
                .append("<li><b>An edge posterior is evidence of statistical dependence, not proof of causation.</b> "
                        + "It holds only under the stated assumptions: the discretisation of the variables, the structure prior")
                .append(s != null ? " (" + esc(s.prior()) + ")" : "")
                .append(" and the DAG prior (below), the score and, for BDeu, its equivalent sample size")
                .append(s != null ? " (" + esc(s.score()) + (s.ess() != null ? ", ESS " + esc(Html.num(s.ess())) : ", which has no ESS") + ")" : "")
                .append(r.store() != null && r.store().missingValues() != null
                        ? ", missing values averaged over under the assumption that they are missing at random (whether a value is"
                        + " missing depends only on values that were observed, not on the missing value itself)"
                        : ", complete data with no missing values")
                .append(", no hidden confounders, and the bound on the number of parents")
                .append(s != null ? " (at most " + s.maxParents() + ")" : "").append(".</li>\n")
                .append("<li>").append(dagPrior(r)).append("</li>\n")
                .append("<li>").append(directions(ce, hint)).append("</li>\n")
                .append("<li>The posteriors can change with the ESS and the prior; see the sensitivity section when present.</li>\n")
                .append("<li><b>Results can inform decisions about health or safety only together with domain experts and "
                        + "local practice.</b> Do not act on them alone.</li>\n</ul>\n</details>\n");
    }

    /**
     * The fragility bullet (HTML) when a headline edge or compelled direction crosses 0.5 within the
     * ESS sweep ({@link Fragility}); empty otherwise.
     */
    static String fragile(EdgeResult r) {
        List<EdgeResult.Fragile> fr = fragileOf(r);
        if (fr == null || fr.isEmpty()) {
            return "";
        }
        StringBuilder sb = new StringBuilder("<li><b>Fragile under the ESS sweep:</b> ");
        for (int i = 0; i < fr.size(); i++) {
            sb.append(i == 0 ? "" : "; ").append(esc(Fragility.words(fr.get(i), "\u2192")));
        }
        return sb.append(". ").append(fr.size() == 1 ? "This posterior is" : "These posteriors are")
                .append(" above 0.5 in the result but below 0.5 at another equivalent sample size: the choice of ESS, not the data, "
                        + "decides whether ").append(fr.size() == 1 ? "it" : "they").append(" would be drawn. Treat ")
                .append(fr.size() == 1 ? "it" : "them").append(" as unsettled.</li>\n").toString();
    }

    /**
     * The bullet (HTML) when a headline edge or compelled direction crosses 0.5 between the two DAG
     * priors ({@link Fragility#acrossPriors}); empty when the other prior was not computed or none does.
     */
    static String priorFragile(EdgeResult r) {
        EdgeResult.PriorComparison c = r.priorComparison();
        if (c == null || c.fragile().isEmpty()) {
            return "";
        }
        List<EdgeResult.PriorFragile> fr = c.fragile();
        StringBuilder sb = new StringBuilder("<li><b>Fragile between the DAG priors:</b> ");
        for (int i = 0; i < fr.size(); i++) {
            sb.append(i == 0 ? "" : "; ").append(esc(Fragility.words(fr.get(i), "\u2192")));
        }
        return sb.append(". ").append(fr.size() == 1 ? "This posterior is" : "These posteriors are")
                .append(" above 0.5 under one prior over networks and below 0.5 under the other: the choice of prior, not the "
                        + "data, decides whether ").append(fr.size() == 1 ? "it" : "they").append(" would be drawn. Treat ")
                .append(fr.size() == 1 ? "it" : "them").append(" as unsettled.</li>\n").toString();
    }

    /**
     * The pruned-candidates bullet (HTML): the children whose candidate sets still bound the posterior,
     * and those no rule could check; the widenings made; empty for a store tallied without pruning.
     */
    static String candidates(EdgeResult r) {
        EdgeResult.CandidateSearch c = r.candidateSearch();
        List<String> bound = r.candidateBoundary();
        boolean any = bound != null && !bound.isEmpty() || c != null && (!c.unchecked().isEmpty() || !c.widened().isEmpty());
        if (!any) {
            return "";
        }
        StringBuilder sb = new StringBuilder("<li><b>Candidate parents were pruned at tally time.</b> ");
        if (c != null && !c.widened().isEmpty()) {
            List<String> names = c.widened().stream().map(EdgeResult.Widening::child).distinct().toList();
            sb.append("The candidate sets of ").append(esc(String.join(", ", names)))
                    .append(" were widened into the store's reserve where the posterior reached them, and the result was "
                            + "averaged again. ");
        }
        if (bound != null && !bound.isEmpty()) {
            sb.append("The candidate sets still bound the posterior of ").append(esc(String.join(", ", bound)))
                    .append(": their parent sets may lack a true parent, whose edge a proxy then takes. ");
        }
        if (c != null && !c.unchecked().isEmpty()) {
            sb.append("Whether the candidates bound the posterior could not be checked for ").append(c.unchecked().size())
                    .append(c.unchecked().size() == 1 ? " child" : " children")
                    .append(" (nothing beyond their candidates is stored): ").append(esc(String.join(", ", c.unchecked())))
                    .append(". ");
        }
        if (bound != null && !bound.isEmpty() || c != null && !c.unchecked().isEmpty()) {
            sb.append("A tally with more candidates, or with a reserve of further ones, settles it.");
        }
        return sb.append("</li>\n").toString();
    }

    /** The result's fragility list, computed from its sweep for a result written without one. */
    static List<EdgeResult.Fragile> fragileOf(EdgeResult r) {
        return r.fragile() != null ? r.fragile() : Fragility.of(r);
    }

    /** The DAG-prior sentence (HTML). */
    static String dagPrior(EdgeResult r) {
        if ("order".equals(r.method())) {
            return "<b>DAG prior:</b> given an order, the structure-modular and order-modular DAG priors coincide "
                    + "(every network consistent with the order weighted by its parent-set prior alone).";
        }
        String p = r.dagPrior();
        if (p == null) {
            return "<b>DAG prior: not recorded</b> in this result. Results written before the DAG prior was recorded used the "
                    + "order-modular prior, which tilts edge directions (see the documentation).";
        }
        return switch (p) {
            case "structure-modular" -> "<b>DAG prior: structure-modular.</b> Every network (DAG) is weighted by its "
                    + "parent-set prior alone; with the uniform structure prior, every DAG with at most d parents per variable "
                    + "counts alike.";
            case "order-modular" -> "<b>DAG prior: order-modular.</b> Every network is weighted also by the number of "
                    + "variable orders it is consistent with (Koivisto &amp; Sood 2004). This favours some networks over "
                    + "others that fit the data equally well, so P(a \u2192 b) can lean towards a direction the data cannot "
                    + "tell apart from its reverse.";
            default -> "<b>DAG prior:</b> " + esc(p) + ".";
        };
    }

    /** How far the result's directions can be read (HTML). */
    static String directions(ConsensusEdges ce, AssessHint hint) {
        String base = "<b>Direction is often not identifiable</b> from observational data: networks that differ only in "
                + "reversible arrow directions (one Markov equivalence class: the same skeleton and v-structures) fit the data "
                + "equally well. ";
        if (ce.givenOrder()) {
            return base + "Here every arrow follows the order you gave \u2014 an assumption, not something learned from the data.";
        }
        if (ce.assessed()) {
            return base + "The consensus graph draws an <b>arrow only for a compelled direction</b> (the same in every network "
                    + "of the class) and a <b>line</b> for a dependence whose direction is reversible. Even a compelled direction "
                    + "is causal only under further assumptions (no hidden common causes, no selection on the outcome).";
        }
        return base + "Directions were <b>not assessed</b> for this result: the consensus graph draws lines for adjacency "
                + "P(a \u2192 b) + P(b \u2192 a) only. To see which directions are identifiable, run " + hint.html() + ".";
    }

    /** The consensus graph's caption (HTML), before the layout sentence. */
    static String graphCaption(ConsensusEdges ce, double threshold, AssessHint hint) {
        String t = f(threshold, 2);
        if (ce.givenOrder()) {
            return "Arrows: edges with posterior above " + t + " given the order, directed as the order says; line width and "
                    + "label give the posterior.";
        }
        if (ce.assessed()) {
            return "Arrows: pairs whose direction the data fix (compelled) with posterior above " + t + " (label: that posterior), "
                    + "and pairs joined across two tiers (labelled as fixed by the tiers). Lines: pairs joined with posterior above "
                    + t + " whose direction could go either way (label: P(joined)). Line width grows with the label.";
        }
        return "Lines: pairs joined with posterior P(a \u2192 b) + P(b \u2192 a) above " + t + " (label; line width grows with "
                + "it); arrows only where the tiers fix the direction. Directions <b>not assessed</b>: run " + hint.html()
                + " to see which are identifiable.";
    }
}
