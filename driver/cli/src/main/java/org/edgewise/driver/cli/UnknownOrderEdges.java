package org.edgewise.driver.cli;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.edgewise.driver.ErrorReport;
import org.edgewise.driver.report.ConvergenceAdvice;
import org.edgewise.driver.result.EdgeResult;

/**
 * The terminal lines of a result over unknown orders: the not-converged warning every averaging
 * command prints, the convergence block, the essential graph and the features.
 */
final class UnknownOrderEdges {
    private UnknownOrderEdges() {
    }

    /** The option that accepts a run that ends unconverged (exit status 0 instead of 3). */
    static final String ALLOW_UNCONVERGED = "--allow-unconverged";

    /**
     * Why a run is not converged, in one line: the stop reason, the targets, the worst quantities,
     * what to do and, last, the exit status ({@link #exitSentence}).
     */
    static String notConverged(String command, EdgeResult.Diagnostics d, boolean allowUnconverged) {
        return command + ": " + ConvergenceAdvice.warning(d, CliNames.RUN) + " " + exitSentence(allowUnconverged);
    }

    /** The last sentence of every not-converged warning: the exit status and how to change it. */
    static String exitSentence(boolean allowUnconverged) {
        return allowUnconverged
                ? "Exit status " + ErrorReport.OK + ": " + ALLOW_UNCONVERGED + " accepts an unconverged run."
                : "Exit status " + ErrorReport.NOT_CONVERGED + " (not converged; the result is written): give "
                + ALLOW_UNCONVERGED + " to accept an unconverged run with exit status " + ErrorReport.OK + ".";
    }

    /** {@code x} without trailing zeros: 1.01, 0.01, 400. */
    static String trim(double x) {
        return java.math.BigDecimal.valueOf(x).stripTrailingZeros().toPlainString();
    }

    /**
     * The adjacency (skeleton) posteriors P(a -- b) = P(a -> b) + P(b -> a) of every unordered pair,
     * most probable first: what the data fix best, whatever the directions.
     */
    static String adjacencies(EdgeResult r, int width) {
        Map<String, Double> p = new HashMap<>();
        for (EdgeResult.Edge e : r.edges()) {
            p.put(e.from() + "\u0000" + e.to(), e.posterior());
        }
        List<String[]> pairs = new ArrayList<>();
        List<Double> adj = new ArrayList<>();
        List<String> v = r.variables();
        for (int a = 0; a < v.size(); a++) {
            for (int b = a + 1; b < v.size(); b++) {
                double x = p.getOrDefault(v.get(a) + "\u0000" + v.get(b), 0.0) + p.getOrDefault(v.get(b) + "\u0000" + v.get(a), 0.0);
                pairs.add(new String[] {v.get(a), v.get(b)});
                adj.add(Math.min(1.0, x));
            }
        }
        StringBuilder sb = new StringBuilder();
        sb.append(String.format(Locale.ROOT, "%nAdjacencies P(a -- b) = P(a -> b) + P(b -> a), most probable first "
                + "(the skeleton: the same whichever way the edges point)%n"));
        int shown = pairTable(sb, pairs, adj, width, "a", "b", "adjacent", "--", 0.001);
        sb.append(String.format(Locale.ROOT, "  (%d of %d unordered pairs shown: adjacent >= 0.001, at most %d)%n", shown, pairs.size(), TABLE_PAIRS));
        return sb.toString();
    }

    /**
     * The compelled directions P(a -> b compelled), most probable first, when the essential graph
     * was computed; else one line naming how to compute it.
     */
    static String compelled(EdgeResult r, int width) {
        if (r.essentialGraph() == null) {
            return String.format(Locale.ROOT, "%nCompelled directions: not computed (add --features essential-graph to see "
                    + "which directions the data fix)%n");
        }
        List<String[]> dirs = new ArrayList<>();
        List<Double> p = new ArrayList<>();
        for (EdgeResult.EssentialPair x : r.essentialGraph()) {
            dirs.add(new String[] {x.a(), x.b()});
            p.add(x.aToB());
            dirs.add(new String[] {x.b(), x.a()});
            p.add(x.bToA());
        }
        StringBuilder sb = new StringBuilder();
        sb.append(String.format(Locale.ROOT, "%nCompelled directions P(a -> b compelled): the same in every DAG of the "
                + "equivalence class (DAGs drawn from the posterior: Monte Carlo estimates)%n"));
        int shown = pairTable(sb, dirs, p, width, "from", "to", "compelled", "->", 0.01);
        sb.append(shown == 0 ? String.format(Locale.ROOT, "  (none with P(compelled) >= 0.01: the data fix no direction here)%n")
                : String.format(Locale.ROOT, "  (%d shown: P(compelled) >= 0.01, at most %d)%n", shown, TABLE_PAIRS));
        return sb.toString();
    }

    /**
     * Appends the column line and the rows of a two-name table, most probable first, up to
     * {@link #TABLE_PAIRS} rows and none below {@code min}; returns how many rows it shows.
     */
    private static int pairTable(StringBuilder sb, List<String[]> pairs, List<Double> p, int width,
            String colA, String colB, String colP, String link, double min) {
        Integer[] idx = new Integer[pairs.size()];
        for (int i = 0; i < idx.length; i++) {
            idx[i] = i;
        }
        java.util.Arrays.sort(idx, (x, y) -> Double.compare(p.get(y), p.get(x)));
        sb.append(String.format(Locale.ROOT, "  %-" + width + "s    %-" + width + "s  %9s%n", colA, colB, colP));
        int shown = 0;
        for (int i : idx) {
            if (shown == TABLE_PAIRS || p.get(i) < min) {
                break;
            }
            sb.append(String.format(Locale.ROOT, "  %-" + width + "s " + link + " %-" + width + "s  %9.4f%n",
                    pairs.get(i)[0], pairs.get(i)[1], p.get(i)));
            shown++;
        }
        return shown;
    }

    /** Pairs shown in the essential-graph table. */
    static final int TABLE_PAIRS = 40;

    /** The essential-graph features, most probably adjacent first. */
    static String essentialTable(EdgeResult r) {
        List<EdgeResult.EssentialPair> pairs = new ArrayList<>(r.essentialGraph());
        pairs.sort((x, y) -> Double.compare(y.adjacent(), x.adjacent()));
        int width = 4;
        for (String v : r.variables()) {
            width = Math.max(width, v.length());
        }
        StringBuilder sb = new StringBuilder();
        sb.append(String.format(Locale.ROOT, "%nEssential graph (DAG prior %s; DAGs drawn from the posterior: Monte Carlo estimates)%n", r.dagPrior()));
        sb.append(String.format(Locale.ROOT, "  %-" + width + "s    %-" + width + "s  %8s  %8s  %8s  %10s  %7s%n",
                "a", "b", "adjacent", "a->b", "b->a", "reversible", "mcse"));
        int shown = 0;
        for (EdgeResult.EssentialPair p : pairs) {
            if (shown == TABLE_PAIRS || p.adjacent() < 0.01) {
                break;
            }
            sb.append(String.format(Locale.ROOT, "  %-" + width + "s -- %-" + width + "s  %8.4f  %8.4f  %8.4f  %10.4f  %7.4f%n",
                    p.a(), p.b(), p.adjacent(), p.aToB(), p.bToA(), p.undirected(), p.mcse() == null ? 0.0 : p.mcse()));
            shown++;
        }
        sb.append(String.format(Locale.ROOT, "  (%d of %d pairs shown: adjacent >= 0.01, at most %d; a->b: compelled in every DAG of the class; "
                + "reversible: the data cannot tell the direction)%n", shown, pairs.size(), TABLE_PAIRS));
        return sb.toString();
    }

    /** The convergence block of a sampled result: verdict, why it stopped, targets, worst quantities, what to do next. */
    static String convergence(EdgeResult.Diagnostics d) {
        StringBuilder sb = new StringBuilder();
        sb.append(String.format(Locale.ROOT, "%nConvergence (sampled by MCMC: every posterior carries its Monte Carlo standard error)%n"));
        line(sb, "verdict", ConvergenceAdvice.verdict(d));
        line(sb, "stopped", ConvergenceAdvice.stopped(d) + (d.stopReason() == null ? "" : " (" + d.stopReason() + ")"));
        line(sb, "targets", ConvergenceAdvice.targets(d));
        line(sb, "reached", ConvergenceAdvice.reached(d));
        String agreed = ConvergenceAdvice.agreement(d);
        if (agreed != null) {
            line(sb, "agreeing", agreed);
        }
        if (d.worst() != null) {
            for (int k = 0; k < d.worst().size(); k++) {
                line(sb, k == 0 ? "worst" : "", ConvergenceAdvice.worst(d.worst().get(k)));
            }
        }
        List<String> next = ConvergenceAdvice.next(d, CliNames.RUN);
        for (int k = 0; k < next.size(); k++) {
            line(sb, k == 0 ? "next" : "", next.get(k));
        }
        line(sb, "run", String.format(Locale.ROOT, "%d chains x %d steps (+ %d warm-up), seed %d, acceptance %s, smallest tail eff. n %s",
                d.chains(), d.steps(), d.burnIn(), d.seed(), Double.isNaN(d.acceptance()) ? "- (not saved in the sample)"
                        : String.format(Locale.ROOT, "%.3f", d.acceptance()), d.tailEffectiveSampleSize() == null ? "-"
                        : String.format(Locale.ROOT, "%.0f", d.tailEffectiveSampleSize())));
        return sb.toString();
    }

    private static void line(StringBuilder sb, String key, String text) {
        sb.append(String.format(Locale.ROOT, "  %-8s  %s%n", key, text));
    }

    /**
     * What a result from pruned candidates says about them: the children widened into the store's
     * reserve, those still bound with nothing stored to widen into (a new tally is needed), and those
     * no rule could check. Empty for a store tallied without pruning.
     */
    static String candidates(EdgeResult r) {
        StringBuilder sb = new StringBuilder();
        EdgeResult.CandidateSearch c = r.candidateSearch();
        if (c != null && !c.widened().isEmpty()) {
            List<String> parts = new ArrayList<>();
            for (EdgeResult.Widening w : c.widened()) {
                parts.add(String.format(Locale.ROOT, "%s (+%s; %s, round %d)", w.child(), String.join(", ", w.added()), w.rule(),
                        w.round()));
            }
            sb.append(String.format(Locale.ROOT, "%nCandidates widened into the store's reserve where the posterior reached them, "
                    + "and averaged again: %s.%n", String.join("; ", parts)));
        }
        if (r.candidateBoundary() != null && !r.candidateBoundary().isEmpty()) {
            sb.append(String.format(Locale.ROOT, "%nCAUTION: candidate parents pruned at tally time bound the posterior of: %s%s. Their "
                    + "parent sets may lack a true parent (a proxy then takes its edge): tally again with a larger --candidates "
                    + "(or --reserve), or none.%n", String.join(", ", r.candidateBoundary()),
                    c != null && c.reserve() ? ", with no reserve left to widen into" : ""));
        }
        if (c != null && !c.unchecked().isEmpty()) {
            sb.append(String.format(Locale.ROOT, "%nCAUTION: candidate parents were pruned at tally time and nothing beyond them is "
                    + "stored, so whether they bound the posterior could not be checked for %d %s (%s); an edge into %s may stand "
                    + "for a pruned parent. Tally with --reserve M beside --candidates to check and widen them.%n",
                    c.unchecked().size(), c.unchecked().size() == 1 ? "child" : "children", abbreviated(c.unchecked()),
                    c.unchecked().size() == 1 ? "it" : "them"));
        }
        return sb.toString();
    }

    /** Up to ten names, then how many more. */
    private static String abbreviated(List<String> names) {
        return names.size() <= 10 ? String.join(", ", names)
                : String.join(", ", names.subList(0, 10)) + " and " + (names.size() - 10) + " more";
    }

    /** Lines for the terminal table: the convergence block (sampled) or the word exact, and features, most probable first. */
    static String summary(EdgeResult r) {
        StringBuilder sb = new StringBuilder();
        sb.append(candidates(r));
        EdgeResult.Diagnostics d = r.diagnostics();
        if (d != null) {
            sb.append(convergence(d));
        } else if ("exact".equals(r.method())) {
            sb.append(String.format(Locale.ROOT, "%nEdge posteriors are exact (summed over every order or DAG, not sampled): "
                    + "no Monte Carlo error, no convergence to check.%n"));
        }
        if (r.essentialGraph() != null) {
            sb.append(essentialTable(r));
        }
        if (r.features() != null && !r.features().isEmpty()) {
            List<EdgeResult.Feature> f = new ArrayList<>(r.features());
            f.sort((x, y) -> Double.compare(y.posterior(), x.posterior()));
            sb.append(String.format(Locale.ROOT, "%nFeatures (%s)%n", r.method().equals("exact")
                    ? "from DAGs drawn from the exact posterior: Monte Carlo estimates"
                    : "from one DAG per stored order"));
            int shown = 0;
            for (EdgeResult.Feature x : f) {
                if (shown == 30 || x.posterior() < 0.01) {
                    break;
                }
                sb.append(String.format(Locale.ROOT, "  %-14s %s %s %s  %.4f%s%n", x.kind(), x.from(),
                        x.kind().equals("ancestor") ? "~>" : "--", x.to(), x.posterior(),
                        x.mcse() == null ? "" : String.format(Locale.ROOT, " +- %.4f", x.mcse())));
                shown++;
            }
        }
        return sb.toString();
    }
}
