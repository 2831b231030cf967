package org.edgewise.driver.average.convergence;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.edgewise.driver.UserError;
import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.TestStores;
import org.edgewise.driver.average.mcmc.ChainRunner;
import org.edgewise.driver.average.mcmc.DrawStore;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;

/**
 * The MCSE target of the convergence verdict ({@link ConvergenceTargets}): on chains of iid
 * Bernoulli(p) draws the MCSE is the standard error of a mean of N independent Bernoulli draws,
 * √(p(1 − p)/N) (any statistics text, e.g. Casella &amp; Berger, Statistical Inference, sec. 5.2 —
 * from memory), so the verdict must pass or fail where that formula says; and the runner keeps
 * doubling until the target is met, and not longer.
 */
class McseTargetTest {

    /** M chains of T iid Bernoulli(p) draws of one quantity, and an iid normal log score, in draw stores. */
    static List<DrawStore> bernoulliChains(int m, int t, double p, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        List<DrawStore> out = new ArrayList<>();
        for (int c = 0; c < m; c++) {
            DrawStore d = new DrawStore(1, t, 1, 0);
            for (int s = 1; s <= t; s++) {
                d.add(s, new float[] {rng.nextDouble() < p ? 1f : 0f}, gaussian(rng), null);
            }
            out.add(d);
        }
        return out;
    }

    private static double gaussian(SplittableRandom rng) {
        return Math.sqrt(-2 * Math.log(1 - rng.nextDouble())) * Math.cos(2 * Math.PI * rng.nextDouble());
    }

    @Test
    void mcseOfIidBernoulliDrawsIsTheBinomialStandardError() {
        for (double p : new double[] {0.5, 0.2}) {
            List<DrawStore> ch = bernoulliChains(4, 2000, p, 7);
            MultiChainDiagnostics.Report r = MultiChainDiagnostics.evaluate(ch, 0, MultiChainDiagnostics.rows(q -> "edge a -> b", 1),
                    ConvergenceTargets.DEFAULTS);
            double expected = Math.sqrt(p * (1 - p) / 8000); // √(p(1−p)/N), N = 4 × 2,000 independent draws
            // the ESS of 8,000 iid draws is estimated with relative sd ~ 1/√N·const: 10 % is ample
            assertEquals(expected, r.quantities()[0].mcse(), 0.1 * expected, "p = " + p);
            assertEquals(r.quantities()[0].mcse(), r.maxMcse(), 0.0);
        }
    }

    @Test
    void theVerdictFailsOnMcseAloneAndNamesTheQuantity() {
        // 4 × 400 iid draws of p = 0.5: MCSE ≈ √(0.25/1600) = 0.0125 > 0.01, yet R̂ ≈ 1 and ESS ≈ 1,600 ≥ 400
        List<DrawStore> few = bernoulliChains(4, 400, 0.5, 3);
        MultiChainDiagnostics.Report r = MultiChainDiagnostics.evaluate(few, 0, MultiChainDiagnostics.rows(q -> "edge a -> b", 1),
                ConvergenceTargets.DEFAULTS);
        ChainDiagnostics.Summary s = r.quantities()[0];
        assertTrue(s.rhat() < 1.01 && s.essBulk() >= 400, s.toString());
        assertTrue(s.converged(1.01), "R-hat and ESS alone are met");
        assertFalse(s.converged(ConvergenceTargets.DEFAULTS, true), s.toString());
        assertTrue(s.converged(ConvergenceTargets.DEFAULTS, false), "the MCSE target applies to probabilities only");
        assertFalse(r.converged());
        assertEquals("edge a -> b", r.worst().get(0).quantity());
        assertEquals(s.mcse(), r.worst().get(0).mcse(), 0.0);
        assertTrue(r.worst().get(0).mcse() > 0.01 && r.worst().get(0).mcse() < 0.015, r.worst().toString());
        // a target of 0.02 is met by the same draws; 4 × 4,000 draws (MCSE ≈ 0.004) meet 0.01
        assertTrue(MultiChainDiagnostics.evaluate(few, 0, MultiChainDiagnostics.rows(q -> "e", 1),
                ConvergenceTargets.DEFAULTS.withMcse(0.02)).converged());
        assertTrue(MultiChainDiagnostics.evaluate(bernoulliChains(4, 4000, 0.5, 3), 0, MultiChainDiagnostics.rows(q -> "e", 1),
                ConvergenceTargets.DEFAULTS).converged());
    }

    @Test
    void theDefaultTargetBoundsTheDifferenceOfTwoRuns() {
        // ConvergenceTargets' argument: two runs each with MCSE 0.01 differ by N(0, 2·0.01²); P(|Δ| > 0.05) = 2(1 − Φ(3.54))
        double tail = 2 * (1 - new NormalDistribution().cumulativeProbability(0.05 / (Math.sqrt(2) * 0.01)));
        assertEquals(4.1e-4, tail, 0.05e-4);
        assertTrue(1 - 20 * tail >= 0.99 && 1 - 100 * tail >= 0.95, "union bound over 20 and 100 edges");
        // the draws kept per chain allow ESS σ²/t² = 2,500 at half their count: 1/(M·t²)
        assertEquals(2500, ConvergenceTargets.DEFAULTS.drawsPerChain(1000, 4));
        assertEquals(1000, ConvergenceTargets.DEFAULTS.withMcse(0.5).drawsPerChain(1000, 4));
        assertEquals(3000, ConvergenceTargets.DEFAULTS.drawsPerChain(3000, 4));
    }

    @Test
    void aTargetOutsideItsRangeIsRefusedInOneLine() {
        assertEquals("the Monte Carlo standard error target must be between 0.005 and 0.5, got 0.001",
                assertThrows(UserError.class, () -> ConvergenceTargets.mcse(0.001, "the Monte Carlo standard error target")).getMessage());
        assertEquals("the Monte Carlo standard error target must be between 0.005 and 0.5, got NaN",
                assertThrows(UserError.class, () -> McmcSettings.defaults(1).withTargets(ConvergenceTargets.DEFAULTS.withMcse(Double.NaN))).getMessage());
    }

    /** Each convergence check's report of a run, in order. */
    private static List<MultiChainDiagnostics.Report> checks(McmcSettings st, LocalScores ls, int n, McmcResult[] out) {
        List<MultiChainDiagnostics.Report> seen = new ArrayList<>();
        out[0] = OrderMcmc.run(ls, OrderConstraints.none(n), st, (done, planned, acc, report) -> {
            if (report != null && (seen.isEmpty() || seen.get(seen.size() - 1) != report)) {
                seen.add(report);
            }
        });
        return seen;
    }

    @Test
    void theRunnerDoublesUntilTheMcseTargetIsMetAndNoLonger() {
        int n = 5;
        LocalScores ls = TestStores.scores(TestStores.random(n, 2, 2, 400, 23));
        McmcSettings base = McmcSettings.defaults(5).withSteps(5_000, 0).untilConverged(Long.MAX_VALUE / 4, 0);
        McmcResult[] r = new McmcResult[1];
        List<MultiChainDiagnostics.Report> loose = checks(base.withTargets(base.targets().withMcse(0.5)), ls, n, r);
        assertEquals(ChainRunner.StopReason.CONVERGED, r[0].outcome().stop());
        List<MultiChainDiagnostics.Report> tight = checks(base.withTargets(base.targets().withMcse(0.005)), ls, n, r);
        assertEquals(ChainRunner.StopReason.CONVERGED, r[0].outcome().stop());
        assertTrue(tight.size() > loose.size(), loose.size() + " vs " + tight.size() + " checks");
        for (MultiChainDiagnostics.Report c : tight.subList(0, tight.size() - 1)) {
            assertFalse(c.converged());
        }
        MultiChainDiagnostics.Report before = tight.get(tight.size() - 2);
        MultiChainDiagnostics.Report last = tight.get(tight.size() - 1);
        assertTrue(before.maxMcse() > 0.005 && before.worst().get(0).mcse() > 0.005, before.worst().toString());
        assertTrue(last.converged() && last.maxMcse() <= 0.005, last.worst().toString());
        // with a step cap at the check before, the same seed stops there and says why
        long capped = r[0].outcome().stepsPerChain() / 2;
        checks(base.withTargets(base.targets().withMcse(0.005)).untilConverged(capped, 0), ls, n, r);
        assertEquals(ChainRunner.StopReason.MAX_STEPS, r[0].outcome().stop());
        assertFalse(r[0].converged());
        assertTrue(r[0].report().worst().get(0).mcse() > 0.005, r[0].report().worst().toString());
    }
}
