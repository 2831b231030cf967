package org.edgewise.driver.cli;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
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
        if (d.worst() != null) {
            for (int k = 0; k < d.worst().size(); k++) {
                line(sb, k == 0 ? "worst" : "", ConvergenceAdvice.worst(d.worst().get(k)));
            }
        }
        List<String> next = ConvergenceAdvice.next(d, CliNames.RUN);
        for (int k = 0; k < next.size(); k++) {
            line(sb, k == 0 ? "next" : "", next.get(k));
        }
        line(sb, "run", String.format(Locale.ROOT, "%d chains x %d steps (+ %d warm-up), seed %d, acceptance %.3f, smallest tail eff. n %s",
                d.chains(), d.steps(), d.burnIn(), d.seed(), d.acceptance(), d.tailEffectiveSampleSize() == null ? "-"
                        : String.format(Locale.ROOT, "%.0f", d.tailEffectiveSampleSize())));
        return sb.toString();
    }

    private static void line(StringBuilder sb, String key, String text) {
        sb.append(String.format(Locale.ROOT, "  %-8s  %s%n", key, text));
    }

    /** Lines for the terminal table: the convergence block (sampled) or the word exact, and features, most probable first. */
    static String summary(EdgeResult r) {
        StringBuilder sb = new StringBuilder();
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
