package org.edgewise.driver.report;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.result.EdgeResult;

/**
 * The convergence verdict of a sampled result in plain words — whether it converged, why the run
 * stopped, the targets, the worst quantities and what to do next — shared by the HTML report
 * ({@link ConvergenceSection}) and the command line's text summary, so both say the same thing.
 * The targets: rank-normalised R̂ and bulk-ESS (Vehtari, Gelman, Simpson, Carpenter &amp; Bürkner
 * 2021) and the MCSE of every reported posterior ({@code average.ConvergenceTargets}).
 */
public final class ConvergenceAdvice {
    private ConvergenceAdvice() {
    }

    /** One line: converged or not. */
    public static String verdict(EdgeResult.Diagnostics d) {
        return d.converged() ? "converged: every quantity met the targets"
                : "NOT converged: do not use these posteriors yet";
    }

    /** Why the run stopped. */
    public static String stopped(EdgeResult.Diagnostics d) {
        String r = d.stopReason();
        if (r == null) {
            return "not recorded";
        }
        return switch (r) {
            case "converged" -> "every target was met by the chains";
            case "max-time" -> "the time budget ran out before every target was met";
            case "max-steps" -> "the step cap was reached before every target was met";
            case "steps" -> "a fixed number of steps was run (no check until converged)";
            default -> r;
        };
    }

    /** The targets, e.g. {@code R-hat < 1.01, bulk ESS >= 400, MCSE <= 0.01 for every edge and feature posterior}. */
    public static String targets(EdgeResult.Diagnostics d) {
        return "R-hat < " + num(d.rhatTarget() == null ? 1.01 : d.rhatTarget()) + ", bulk ESS >= "
                + num(d.essTarget() == null ? 400 : d.essTarget())
                + (d.mcseTarget() == null ? " (no MCSE target: the result predates it)"
                : ", MCSE <= " + num(d.mcseTarget()) + " for every edge and feature posterior");
    }

    /** What the run reached: the largest R̂, the smallest bulk ESS, the largest MCSE. */
    public static String reached(EdgeResult.Diagnostics d) {
        return String.format(Locale.ROOT, "largest R-hat %s, smallest bulk ESS %.0f, largest MCSE %s",
                Double.isInfinite(d.rhat()) ? "inf" : String.format(Locale.ROOT, "%.4f", d.rhat()), d.ess(),
                d.mcse() == null ? "-" : String.format(Locale.ROOT, "%.4f", d.mcse()));
    }

    /** One worst quantity: {@code edge a -> b: R-hat 1.020, bulk ESS 380, MCSE 0.0150 (stuck)}. */
    public static String worst(EdgeResult.Worst w) {
        return w.quantity() + ": R-hat " + (w.rhat() == null ? "inf" : String.format(Locale.ROOT, "%.3f", w.rhat()))
                + ", bulk ESS " + (w.ess() == null ? "-" : String.format(Locale.ROOT, "%.0f", w.ess()))
                + ", MCSE " + (w.mcse() == null ? "-" : String.format(Locale.ROOT, "%.4f", w.mcse()))
                + ("stuck".equals(w.state()) ? " (stuck: each chain keeps its own value)" : "");
    }

    /** What to do next, in plain sentences naming the settings as {@code h} does. */
    public static List<String> next(EdgeResult.Diagnostics d, RunHint h) {
        List<String> out = new ArrayList<>();
        if (d.converged()) {
            out.add("Nothing more is needed. Each posterior carries its MCSE; two runs with other seeds differ on an edge "
                    + "by about 1.4 x its MCSE (the spread of a difference of two independent estimates).");
            return out;
        }
        boolean stuck = false;
        boolean onlyMcse = d.worst() != null && !d.worst().isEmpty() && d.mcseTarget() != null;
        double rt = d.rhatTarget() == null ? 1.01 : d.rhatTarget();
        double et = d.essTarget() == null ? 400 : d.essTarget();
        if (d.worst() != null) {
            for (EdgeResult.Worst w : d.worst()) {
                stuck |= "stuck".equals(w.state());
                onlyMcse &= w.rhat() != null && w.rhat() < rt && (w.ess() == null || w.ess() >= et)
                        && w.mcse() != null && w.mcse() > d.mcseTarget();
            }
        }
        onlyMcse &= !stuck;
        String r = d.stopReason() == null ? "" : d.stopReason();
        switch (r) {
            case "max-time" -> out.add("Run longer: raise the time budget (" + h.maxTime() + ")"
                    + (onlyMcse ? "; the chains agree, only the Monte Carlo error is still above its target." : "."));
            case "max-steps" -> out.add("Run longer: raise or drop the step cap (" + h.maxSteps() + ").");
            case "steps" -> out.add("Run until converged instead of a fixed number of steps (" + h.untilConverged() + ").");
            case "converged" -> out.add("The chains met the targets but a posterior as reported did not (a posterior of "
                    + "exactly 0 or 1 reports the rule-of-three bound): lower the MCSE target (" + h.mcseTarget()
                    + ", e.g. 0.005) so that the chains run longer and keep more draws.");
            default -> out.add("Run longer (" + h.maxTime() + ").");
        }
        if (stuck) {
            out.add("A stuck quantity means the chains sit in different modes, which running longer may not cure: try more "
                    + "chains (" + h.chains() + ") or, where the number of variables allows, the exact method (" + h.exact() + ").");
        }
        if (onlyMcse && !"converged".equals(r)) {
            out.add("Or accept a larger Monte Carlo error with a larger MCSE target (" + h.mcseTarget()
                    + "): two runs then rarely differ on an edge by more than about 3.5 x that target.");
        }
        out.add("Until then, treat every posterior of this result as unreliable.");
        return out;
    }

    /** What an MCSE is, for a reader. */
    public static String mcseNote() {
        return "Sampled figures carry a Monte Carlo standard error (MCSE): every edge and feature posterior of this result is an "
                + "average over MCMC draws, and its MCSE is how much it would typically move if the run were repeated with "
                + "another seed. It measures sampling noise only, not whether the model's assumptions hold.";
    }

    static String num(double x) {
        return x == Math.rint(x) && Math.abs(x) < 1e15 ? String.valueOf((long) x) : String.valueOf(x);
    }
}
