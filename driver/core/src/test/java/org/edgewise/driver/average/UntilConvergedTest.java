package org.edgewise.driver.average;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;

/**
 * Order MCMC and partition MCMC run until converged (R̂ &lt; 1.01, bulk-ESS ≥ 400 and the MCSE target
 * for every quantity, Vehtari et al. 2021): two seeds agree with each other, and with the exact sum
 * (over orders, Koivisto &amp; Sood 2004; over DAGs, Tian &amp; He 2009) where that is feasible.
 */
class UntilConvergedTest {

    @Test
    void twoSeedsOnFortyVariablesAgreeAndBothConverge() {
        // the test-scale figure: within 0.05 on every edge
        ScoreStore s = TestStores.windowed(40, 3, 2, 400, 5);
        LocalScores ls = TestStores.scores(s);
        OrderMcmc.Result[] r = new OrderMcmc.Result[2];
        for (int k = 0; k < 2; k++) {
            r[k] = OrderMcmc.run(ls, OrderConstraints.none(40),
                    OrderMcmc.Settings.defaults(11 + k).withSteps(20_000, 0).untilConverged(Long.MAX_VALUE / 4, 120), null);
            assertTrue(r[k].converged(), "seed " + (11 + k) + ": " + r[k].report().worst());
            assertEquals(ChainRunner.StopReason.CONVERGED, r[k].outcome().stop());
        }
        double d = OrderMcmcTest.maxDiff(r[0], means(r[1], 40));
        assertTrue(d < 0.05, "max |seed 11 - seed 12| = " + d);
    }

    @Test
    void agreesWithTheExactSumOnFifteenVariables() {
        // within 0.03 on every edge (the figure for n = 15–18); the first check after 200,000 steps per chain so
        // that every edge's MCSE is well below 0.03 / 3 (converged alone — bulk ESS >= 400 — allows MCSE ~ 0.025)
        ScoreStore s = TestStores.random(15, 2, 2, 400, 41);
        LocalScores ls = TestStores.scores(s);
        double[][] exact = ExactOrderSum.run(ls, OrderConstraints.none(15)).edgePosterior();
        OrderMcmc.Result mc = OrderMcmc.run(ls, OrderConstraints.none(15),
                OrderMcmc.Settings.defaults(3).withSteps(200_000, 0).untilConverged(Long.MAX_VALUE / 4, 120), null);
        assertTrue(mc.converged(), mc.report().worst().toString());
        double d = OrderMcmcTest.maxDiff(mc, exact);
        assertTrue(d < 0.03, "max |mcmc - exact| = " + d);
    }

    @Test
    void partitionMcmcTwoSeedsOnFortyVariablesAgreeAndBothConverge() {
        // the same figure under the structure-modular prior (partition MCMC with DAG moves)
        ScoreStore s = TestStores.windowed(40, 3, 2, 400, 5);
        LocalScores ls = TestStores.scores(s);
        OrderMcmc.Result[] r = new OrderMcmc.Result[2];
        for (int k = 0; k < 2; k++) {
            r[k] = PartitionMcmc.run(ls, OrderConstraints.none(40),
                    OrderMcmc.Settings.defaults(11 + k).withSteps(20_000, 0).untilConverged(Long.MAX_VALUE / 4, 120), null).chains();
            assertTrue(r[k].converged(), "seed " + (11 + k) + ": " + r[k].report().worst());
            assertEquals(ChainRunner.StopReason.CONVERGED, r[k].outcome().stop());
        }
        double d = OrderMcmcTest.maxDiff(r[0], means(r[1], 40));
        assertTrue(d < 0.05, "max |seed 11 - seed 12| = " + d);
    }

    @Test
    void partitionMcmcAgreesWithTheExactStructureModularSumOnFifteenVariables() {
        // within 0.03 on every edge against Tian & He's exact sum over DAGs (StructureSum)
        ScoreStore s = TestStores.random(15, 2, 2, 400, 41);
        LocalScores ls = TestStores.scores(s);
        double[][] exact = StructureSum.run(ls, OrderConstraints.none(15)).edgePosterior();
        OrderMcmc.Result mc = PartitionMcmc.run(ls, OrderConstraints.none(15),
                OrderMcmc.Settings.defaults(3).withSteps(200_000, 0).untilConverged(Long.MAX_VALUE / 4, 120), null).chains();
        assertTrue(mc.converged(), mc.report().worst().toString());
        double d = OrderMcmcTest.maxDiff(mc, exact);
        assertTrue(d < 0.03, "max |mcmc - exact| = " + d);
    }

    /** The edge means of {@code r} as a matrix (0 for non-candidates). */
    static double[][] means(OrderMcmc.Result r, int n) {
        double[][] p = new double[n][n];
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                p[a][b] = r.edges()[a][b] == null ? 0 : r.edges()[a][b].mean();
            }
        }
        return p;
    }
}
