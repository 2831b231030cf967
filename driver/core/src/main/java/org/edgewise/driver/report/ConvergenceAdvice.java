package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.num;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.result.EdgeResult;

/**
 * The convergence verdict of a sampled result in plain words — whether it converged, why the run
 * stopped, the targets, the worst quantities and what to do next — shared by the HTML report
 * ({@link ConvergenceSection}) and the command line's text summary, so both say the same thing.
 * The targets: rank-normalised R̂ and bulk effective sample size (Vehtari, Gelman, Simpson, Carpenter
 * &amp; Bürkner 2021) and the MCSE of every reported posterior ({@code average.ConvergenceTargets}).
 *
 * <p>Words: "effective sample size" (in tight places "eff. n") is the MCMC's; "ESS" is never used
 * here, as it names BDeu's equivalent sample size everywhere else. The steps discarded first are
 * the "warm-up".
 */
public final class ConvergenceAdvice {
    private ConvergenceAdvice() {
    }

    /** One line: converged or not. */
    public static String verdict(EdgeResult.Diagnostics d) {
        return d.converged() ? "converged: every quantity met the targets"
                : "NOT converged: do not use these posteriors yet";
    }

    /** Why the run stopped (the one wording of the stop reasons: the report's and the command line's). */
    public static String stopped(EdgeResult.Diagnostics d) {
        String r = d.stopReason();
        if (r == null) {
            return "not recorded";
        }
        return switch (r) {
            case "converged" -> d.converged() ? "every target was met by the chains"
                    : "the chains met the targets, the reported posteriors did not";
            case "max-time" -> "the time budget ran out before every target was met";
            case "max-steps" -> "the step cap was reached before every target was met";
            case "steps" -> "a fixed number of steps was run, with no check until converged";
            case "rounds" -> "a fixed number of rounds of data augmentation was run over the missing values";
            case "max-rounds" -> "the cap on rounds of data augmentation was reached before every target was met";
            default -> r;
        };
    }

    /** The targets, e.g. {@code R-hat < 1.01, bulk effective sample size >= 400, MCSE <= 0.01 for every edge and feature posterior}. */
    public static String targets(EdgeResult.Diagnostics d) {
        return "R-hat < " + num(rhatTarget(d)) + ", bulk effective sample size >= " + num(effectiveSampleSizeTarget(d))
                + (d.mcseTarget() == null ? " (no MCSE target: the result predates it)"
                : ", MCSE <= " + num(d.mcseTarget()) + " for every edge and feature posterior");
    }

    /** What the run reached: the largest R̂, the smallest bulk effective sample size, the largest MCSE. */
    public static String reached(EdgeResult.Diagnostics d) {
        return "largest R-hat " + (Double.isInfinite(d.rhat()) ? "inf" : String.format(Locale.ROOT, "%.4f", d.rhat()))
                + ", smallest bulk effective sample size " + String.format(Locale.ROOT, "%.0f", d.bulkEffectiveSampleSize())
                + ", largest MCSE " + orDash(d.mcse(), "%.4f");
    }

    /** One worst quantity: {@code edge a -> b: R-hat 1.020, bulk eff. n 380, MCSE 0.0150 (stuck: …)}. */
    public static String worst(EdgeResult.Worst w) {
        return w.quantity() + ": R-hat " + (w.rhat() == null ? "inf" : String.format(Locale.ROOT, "%.3f", w.rhat()))
                + ", bulk eff. n " + orDash(w.bulkEffectiveSampleSize(), "%.0f") + ", MCSE " + orDash(w.mcse(), "%.4f")
                + ("stuck".equals(w.state()) ? " (stuck: each chain keeps its own value)"
                : "trap".equals(w.state()) ? " (trap: the same value in every draw, and every chain started on one side of it)"
                : "");
    }

    /**
     * Which rule judged the quantities whose draws agree, e.g. {@code 40 settled (chains that started
     * on both sides agree), 50 negligible (...), 2 traps (...)}; null when the result predates the rules.
     */
    public static String agreement(EdgeResult.Diagnostics d) {
        if (d.negligible() == null || d.traps() == null) {
            return null;
        }
        return (d.settled() == null ? 0 : d.settled()) + " settled (chains that started on both sides agree), "
                + d.negligible() + " negligible (the other value below 1e-6 in every chain), "
                + d.traps() + (d.traps() == 1 ? " trap" : " traps") + " (every chain started on one side and stayed: "
                + (d.traps() == 0 ? "none to block" : d.traps() == 1 ? "it blocks" : "they block") + ")";
    }

    /**
     * The one-line warning of an unconverged run (after the caller's prefix): why it stopped, the
     * targets, the worst quantities and the first thing to do, the settings named as {@code h} does.
     */
    public static String warning(EdgeResult.Diagnostics d, RunHint h) {
        StringBuilder sb = new StringBuilder("WARNING: not converged (").append(stopped(d)).append("; needs ")
                .append(targets(d)).append("): the posteriors are not reliable. Worst: ");
        if (d.worst() == null || d.worst().isEmpty()) {
            sb.append('-');
        } else {
            for (int k = 0; k < d.worst().size(); k++) {
                sb.append(k == 0 ? "" : "; ").append(worst(d.worst().get(k)));
            }
        }
        return sb.append(". ").append(next(d, h).get(0)).toString();
    }

    /**
     * How to run longer after a run that stopped for {@code stopReason}: a fixed run ({@code steps})
     * raises its steps or runs until converged, one stopped by the step cap raises the cap, any other
     * the time budget. Lower case, no full stop.
     */
    public static String runLonger(String stopReason, RunHint h) {
        return switch (stopReason == null ? "" : stopReason) {
            case "steps" -> "run longer: raise the steps per chain (" + h.steps() + ") or run until converged instead ("
                    + h.untilConverged() + ")";
            case "max-steps" -> "run longer: raise or drop the step cap (" + h.maxSteps() + ")";
            case "rounds", "max-rounds" -> "run longer: tally the table again with more rounds of data augmentation";
            default -> "run longer: raise the time budget (" + h.maxTime() + ")";
        };
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
        boolean trap = false;
        boolean onlyMcse = d.worst() != null && !d.worst().isEmpty() && d.mcseTarget() != null;
        double rt = rhatTarget(d);
        double et = effectiveSampleSizeTarget(d);
        if (d.worst() != null) {
            for (EdgeResult.Worst w : d.worst()) {
                stuck |= "stuck".equals(w.state());
                trap |= "trap".equals(w.state());
                // && (not &=): without an MCSE target the comparison below must not run
                onlyMcse = onlyMcse && w.rhat() != null && w.rhat() < rt
                        && (w.bulkEffectiveSampleSize() == null || w.bulkEffectiveSampleSize() >= et)
                        && w.mcse() != null && w.mcse() > d.mcseTarget();
            }
        }
        onlyMcse &= !stuck && !trap;
        String r = d.stopReason() == null ? "" : d.stopReason();
        if ("converged".equals(r)) {
            out.add("The chains met the targets but a posterior as reported did not (a posterior of "
                    + "exactly 0 or 1 reports the rule-of-three bound): lower the MCSE target (" + h.mcseTarget()
                    + ", e.g. 0.005) so that the chains run longer and keep more draws.");
        } else {
            out.add("R" + runLonger(r, h).substring(1) + ("max-time".equals(r) && onlyMcse
                    ? "; the chains agree, only the Monte Carlo error is still above its target." : "."));
        }
        if (stuck) {
            out.add("A stuck quantity means the chains sit in different modes, which running longer may not cure: try more "
                    + "chains (" + h.chains() + ") or, where the number of variables allows, the exact method (" + h.exact() + ").");
        }
        if (trap) {
            out.add("A trap means every chain started on the same side of a quantity and none came to the other side, so "
                    + "the chains may share one wrong mode: run longer, try more chains (" + h.chains()
                    + ") or, where the number of variables allows, the exact method (" + h.exact() + ").");
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

    static double rhatTarget(EdgeResult.Diagnostics d) {
        return d.rhatTarget() == null ? 1.01 : d.rhatTarget();
    }

    static double effectiveSampleSizeTarget(EdgeResult.Diagnostics d) {
        return d.effectiveSampleSizeTarget() == null ? 400 : d.effectiveSampleSizeTarget();
    }

    private static String orDash(Double x, String format) {
        return x == null ? "-" : String.format(Locale.ROOT, format, x);
    }
}
