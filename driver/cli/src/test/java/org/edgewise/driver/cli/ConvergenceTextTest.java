package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.result.EdgeResult;
import org.junit.jupiter.api.Test;

/**
 * The words a user of {@code edges --method mcmc} reads about convergence, asserted word for word:
 * the stop reason in the words of {@code report.ConvergenceAdvice} (the one place they are written),
 * "effective sample size" / "eff. n" for the MCMC's (never "ESS", BDeu's word), "warm-up".
 */
class ConvergenceTextTest {
    static EdgeResult.Diagnostics diagnostics(boolean converged, String stop, List<EdgeResult.Worst> worst) {
        return new EdgeResult.Diagnostics(4, 640_000, 640_000, 1, 0.3124, 1.0071, 644, converged, null, 100, 1.01, 400.0,
                0.01, converged ? 0.0081 : 0.0173, 512.0, stop, 300, 120, 0, 0.005, worst, 1250, 0.1, 6, 1.2, 2.4, null, null);
    }

    /** The lines every unconverged run's block starts with (the same run stopped by its time budget). */
    static final String UNCONVERGED_HEAD = """

                Convergence (sampled by MCMC: every posterior carries its Monte Carlo standard error)
                  verdict   NOT converged: do not use these posteriors yet
                  stopped   the time budget ran out before every target was met (max-time)
                  targets   R-hat < 1.01, bulk effective sample size >= 400, MCSE <= 0.01 for every edge and feature posterior
                  reached   largest R-hat 1.0071, smallest bulk effective sample size 644, largest MCSE 0.0173
                  worst     edge v20 -> v19: R-hat 1.007, bulk eff. n 812, MCSE 0.0173
                """;

    /** The last line of every block here: the same run. */
    static final String RUN_LINE =
            "  run       4 chains x 640000 steps (+ 640000 warm-up), seed 1, acceptance 0.312, smallest tail eff. n 512\n";

    /**
     * Checks the block of an unconverged run ({@link #UNCONVERGED_HEAD}, {@code rest}, {@link #RUN_LINE})
     * computed from {@code d}, and the warning computed from {@code dWarning}.
     */
    static void assertUnconverged(String rest, EdgeResult.Diagnostics d, String warning, EdgeResult.Diagnostics dWarning,
            boolean allowUnconverged) {
        assertEquals(UNCONVERGED_HEAD + rest + RUN_LINE, UnknownOrderEdges.convergence(d));
        assertEquals(warning, UnknownOrderEdges.notConverged("edges", dWarning, allowUnconverged));
    }

    @Test
    void aSharedTrapIsNamedWithTheRuleThatJudgedEveryAgreeingQuantity() {
        EdgeResult.Diagnostics base = diagnostics(false, "max-time",
                List.of(new EdgeResult.Worst("edge v20 -> v19", null, null, 1.0e-4, null, "trap")));
        EdgeResult.Diagnostics d = new EdgeResult.Diagnostics(base.chains(), base.steps(), base.burnIn(), base.seed(),
                base.acceptance(), base.rhat(), base.bulkEffectiveSampleSize(), false, null, base.traceThin(), base.rhatTarget(),
                base.effectiveSampleSizeTarget(), base.mcseTarget(), base.mcse(), base.tailEffectiveSampleSize(),
                base.stopReason(), base.constant(), base.settled(), base.stuck(), base.settleSpan(), base.worst(),
                base.drawsPerChain(), base.relocateShare(), base.checks(), base.checkSeconds(), base.samplingSeconds(), null, null,
                40, 1);
        assertEquals("""

                Convergence (sampled by MCMC: every posterior carries its Monte Carlo standard error)
                  verdict   NOT converged: do not use these posteriors yet
                  stopped   the time budget ran out before every target was met (max-time)
                  targets   R-hat < 1.01, bulk effective sample size >= 400, MCSE <= 0.01 for every edge and feature posterior
                  reached   largest R-hat 1.0071, smallest bulk effective sample size 644, largest MCSE 0.0173
                  agreeing  120 settled (chains that started on both sides agree), 40 negligible (the other value below 1e-6 in every chain), 1 trap (every chain started on one side and stayed: it blocks)
                  worst     edge v20 -> v19: R-hat inf, bulk eff. n -, MCSE 0.0001 (trap: the same value in every draw, and every chain started on one side of it)
                  next      Run longer: raise the time budget (--max-time).
                            A trap means every chain started on the same side of a quantity and none came to the other side, so the chains may share one wrong mode: run longer, try more chains (--chains) or, where the number of variables allows, the exact method (--method exact).
                            Until then, treat every posterior of this result as unreliable.
                """ + RUN_LINE, UnknownOrderEdges.convergence(d));
    }

    @Test
    void anUnconvergedRunSaysWhyAndWhatToDo() {
        EdgeResult.Diagnostics d = diagnostics(false, "max-time",
                List.of(new EdgeResult.Worst("edge v20 -> v19", 1.0071, 812.0, 0.0173, 640.0, "varies"),
                        new EdgeResult.Worst("edge v3 -> v4", null, null, 0.25, null, "stuck")));
        assertUnconverged("""
                            edge v3 -> v4: R-hat inf, bulk eff. n -, MCSE 0.2500 (stuck: each chain keeps its own value)
                  next      Run longer: raise the time budget (--max-time).
                            A stuck quantity means the chains sit in different modes, which running longer may not cure: try more chains (--chains) or, where the number of variables allows, the exact method (--method exact).
                            Until then, treat every posterior of this result as unreliable.
                """, d, "edges: WARNING: not converged (the time budget ran out before every target was met; needs R-hat < 1.01, "
                + "bulk effective sample size >= 400, MCSE <= 0.01 for every edge and feature posterior): the posteriors are not "
                + "reliable. Worst: edge v20 -> v19: R-hat 1.007, bulk eff. n 812, MCSE 0.0173; edge v3 -> v4: R-hat inf, bulk "
                + "eff. n -, MCSE 0.2500 (stuck: each chain keeps its own value). Run longer: raise the time budget (--max-time). "
                + "Exit status 3 (not converged; the result is written): give --allow-unconverged to accept an unconverged run "
                + "with exit status 0.", d, false);
    }

    @Test
    void onlyTheMcseMissingAndAReportedFigureMissing() {
        List<EdgeResult.Worst> noisy = List.of(new EdgeResult.Worst("edge v20 -> v19", 1.0071, 812.0, 0.0173, 640.0, "varies"));
        assertUnconverged("""
                  next      Run longer: raise the time budget (--max-time); the chains agree, only the Monte Carlo error is still above its target.
                            Or accept a larger Monte Carlo error with a larger MCSE target (--mcse-target): two runs then rarely differ on an edge by more than about 3.5 x that target.
                            Until then, treat every posterior of this result as unreliable.
                """, diagnostics(false, "max-time", noisy),
                "edges: WARNING: not converged (the chains met the targets, the reported posteriors did not; needs R-hat < 1.01, bulk effective "
                + "sample size >= 400, MCSE <= 0.01 for every edge and feature posterior): the posteriors are not reliable. Worst: "
                + "edge v20 -> v19: R-hat 1.007, bulk eff. n 812, MCSE 0.0173. The chains met the targets but a posterior as "
                + "reported did not (a posterior of exactly 0 or 1 reports the rule-of-three bound): lower the MCSE target "
                + "(--mcse-target, e.g. 0.005) so that the chains run longer and keep more draws. "
                + "Exit status 0: --allow-unconverged accepts an unconverged run.",
                diagnostics(false, "converged", noisy), true);
    }

    @Test
    void aConvergedRun() {
        assertEquals("""

                Convergence (sampled by MCMC: every posterior carries its Monte Carlo standard error)
                  verdict   converged: every quantity met the targets
                  stopped   every target was met by the chains (converged)
                  targets   R-hat < 1.01, bulk effective sample size >= 400, MCSE <= 0.01 for every edge and feature posterior
                  reached   largest R-hat 1.0071, smallest bulk effective sample size 644, largest MCSE 0.0081
                  next      Nothing more is needed. Each posterior carries its MCSE; two runs with other seeds differ on an edge by about 1.4 x its MCSE (the spread of a difference of two independent estimates).
                """ + RUN_LINE, UnknownOrderEdges.convergence(diagnostics(true, "converged", List.of())));
    }

    @Test
    void theProgressLineShowsEachFigureWithItsTarget() {
        assertEquals("acceptance 0.312  worst R-hat 1.021 (< 1.01)  min eff. n 388 (>= 400)  max MCSE 0.0143 (<= 0.01)",
                ProgressBars.line(new ProgressListener.ChainState(0.3124, 1.0214, 388.2, 0.01432, 1.01, 400, 0.01)));
        assertEquals("acceptance 0.312  worst R-hat - (< 1.01)  min eff. n - (>= 400)  max MCSE - (<= 0.005)",
                ProgressBars.line(new ProgressListener.ChainState(0.3124, Double.NaN, Double.NaN, Double.NaN, 1.01, 400, 0.005)));
    }

    /** Help says "effective sample size" for the MCMC's and "warm-up" for the discarded steps; the option keeps its name. */
    @Test
    void helpTextsUseOneWordPerMeaning() {
        for (String command : List.of("edges", "predict", "effect")) {
            CliRun help = CliRun.of(command, "--help");
            String text = help.out().replaceAll("\\s+", " ");
            assertFalse(text.contains("bulk ESS"), command + ": " + text);
            assertFalse(text.replace("--burn-in", "").contains("burn-in"), command + ": " + text);
            assertTrue(text.contains("bulk effective sample size >= 400"), command + ": " + text);
            assertTrue(text.contains("--burn-in=N mcmc with --steps: warm-up,"), command + ": " + text);
        }
    }
}
