package org.edgewise.driver.average.mcmc;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.TestStores;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.exact.StructureSum;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;
import org.edgewise.driver.average.partition.PartitionMcmc;
import org.edgewise.driver.average.ordermcmc.OrderMcmcTest;

/**
 * Order MCMC and partition MCMC run until converged (R̂ &lt; 1.01, bulk-ESS ≥ 400 and the MCSE target
 * for every quantity, Vehtari et al. 2021): two seeds agree with each other, and with the exact sum
 * (over orders, Koivisto &amp; Sood 2004; over DAGs, Tian &amp; He 2009) where that is feasible.
 */
public class UntilConvergedTest {

    /** A sampler run until converged: order MCMC or partition MCMC (same result shape). */
    interface Sampler {
        McmcResult run(LocalScores ls, OrderConstraints oc, McmcSettings s);
    }

    static final Sampler ORDER = (ls, oc, s) -> OrderMcmc.run(ls, oc, s, null);
    static final Sampler PARTITION = (ls, oc, s) -> PartitionMcmc.run(ls, oc, s, null).chains();

    /** The test-scale figure: two seeds on 40 windowed variables both converge and agree within 0.05 on every edge. */
    static void assertTwoSeedsAgree(Sampler sampler) {
        LocalScores ls = TestStores.scores(TestStores.windowed(40, 3, 2, 400, 5));
        McmcResult[] r = new McmcResult[2];
        for (int k = 0; k < 2; k++) {
            r[k] = sampler.run(ls, OrderConstraints.none(40),
                    McmcSettings.defaults(11 + k).withSteps(20_000, 0).untilConverged(Long.MAX_VALUE / 4, 120));
            assertTrue(r[k].converged(), "seed " + (11 + k) + ": " + r[k].report().worst());
            assertEquals(ChainRunner.StopReason.CONVERGED, r[k].outcome().stop());
        }
        double d = OrderMcmcTest.maxDiff(r[0], means(r[1], 40));
        assertTrue(d < 0.05, "max |seed 11 - seed 12| = " + d);
    }

    /**
     * Within 0.03 on every edge of the exact sum (the figure for n = 15–18); the first check
     * after 200,000 steps per chain.
     */
    static void assertAgreesWithExact(Sampler sampler, LocalScores ls, double[][] exact) {
        McmcResult mc = sampler.run(ls, OrderConstraints.none(ls.variableCount()),
                McmcSettings.defaults(3).withSteps(200_000, 0).untilConverged(Long.MAX_VALUE / 4, 120));
        assertTrue(mc.converged(), mc.report().worst().toString());
        double d = OrderMcmcTest.maxDiff(mc, exact);
        assertTrue(d < 0.03, "max |mcmc - exact| = " + d);
    }

    @Test
    void twoSeedsOnFortyVariablesAgreeAndBothConverge() {
        assertTwoSeedsAgree(ORDER);
    }

    @Test
    void partitionMcmcTwoSeedsOnFortyVariablesAgreeAndBothConverge() {
        assertTwoSeedsAgree(PARTITION);
    }

    @Test
    void agreesWithTheExactSumOnFifteenVariables() {
        // against Koivisto & Sood's exact sum over orders (ExactOrderSum)
        LocalScores ls = TestStores.scores(TestStores.random(15, 2, 2, 400, 41));
        assertAgreesWithExact(ORDER, ls, ExactOrderSum.run(ls, OrderConstraints.none(15)).edgePosterior());
    }

    @Test
    void partitionMcmcAgreesWithTheExactStructureModularSumOnFifteenVariables() {
        // against Tian & He's exact sum over DAGs (StructureSum)
        LocalScores ls = TestStores.scores(TestStores.random(15, 2, 2, 400, 41));
        assertAgreesWithExact(PARTITION, ls, StructureSum.run(ls, OrderConstraints.none(15)).edgePosterior());
    }

    /** The edge means of {@code r} as a matrix (0 for non-candidates). */
    public static double[][] means(McmcResult r, int n) {
        double[][] p = new double[n][n];
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                p[a][b] = r.edges()[a][b] == null ? 0 : r.edges()[a][b].mean();
            }
        }
        return p;
    }
}
