package org.edgewise.driver.average.ordermcmc;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashMap;
import java.util.Map;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.TestStores;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.givenorder.OrderSum;
import org.edgewise.driver.average.mcmc.ChainSet;
import org.edgewise.driver.average.mcmc.DrawStore;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;

/**
 * Metropolis-coupled order chains (parallel tempering; Geyer 1991, Earl &amp; Deem 2005): the swap
 * rule by hand, and the β = 1 rung against exact enumeration of every order.
 */
class TemperedOrderChainTest {

    @Test
    void swapAcceptanceIsTheMetropolisRatioOnTheProductSpace() {
        // hand-checked: the ratio is π(x_b)^β_a π(x_a)^β_b / (π(x_a)^β_a π(x_b)^β_b).
        // β_a = 1, β_b = 0.5, L_a = −98, L_b = −100: exp(−100 − 49 + 98 + 50) = exp(−1)
        assertEquals(-1.0, TemperedOrderChain.logSwapAcceptance(1.0, 0.5, -98, -100), 1e-15);
        // the better state on the hotter rung always comes down: exp(+1) capped at 1
        assertEquals(0.0, TemperedOrderChain.logSwapAcceptance(1.0, 0.5, -100, -98), 0.0);
        // β_a = 0.8, β_b = 0.2, L_a = −10, L_b = −15: (0.6)(−5) = −3
        assertEquals(-3.0, TemperedOrderChain.logSwapAcceptance(0.8, 0.2, -10, -15), 1e-15);
        // equal states: always accepted
        assertEquals(0.0, TemperedOrderChain.logSwapAcceptance(1.0, 0.3, -7, -7), 0.0);
    }

    @Test
    void geometricLadderRunsFromOneToTheSmallestInverseTemperature() {
        // β_r = β_min^{r/(R−1)}: 0.125^{0, 1/3, 2/3, 1} = 1, 0.5, 0.25, 0.125 (by hand)
        assertArrayEquals(new double[] {1, 0.5, 0.25, 0.125}, TemperedOrderChain.geometricLadder(4, 0.125), 1e-15);
        assertArrayEquals(new double[] {1}, TemperedOrderChain.geometricLadder(1, 0.3), 0.0);
    }

    @Test
    void ladderGrowsWithTheWidth() {
        // R = max(1, round(4·√(n/200))) up to 200, by hand: n = 28 → 4·0.374 = 1.50 − ε → 1; 29 → 1.52 → 2;
        // 78 → 2.498 → 2; 79 → 2.51 → 3; 200 → 4; then round(n/50): 201 → 4; 500 → 10; an explicit count wins
        McmcSettings auto = McmcSettings.defaults(1);
        assertEquals(1, auto.rungsFor(5));
        assertEquals(1, auto.rungsFor(28));
        assertEquals(2, auto.rungsFor(29));
        assertEquals(2, auto.rungsFor(78));
        assertEquals(3, auto.rungsFor(79));
        assertEquals(4, auto.rungsFor(200));
        assertEquals(4, auto.rungsFor(201));
        assertEquals(10, auto.rungsFor(500));
        assertEquals(1, auto.withTempering(1, 0.3).rungsFor(500));
        // β_min = 0.3 up to 200, then 0.3·(200/n)^1.2: n = 500 → 0.3·0.4^1.2 = 0.3·0.33302 = 0.09991 (by hand)
        assertEquals(0.3, auto.betaMinFor(200), 0.0);
        assertEquals(0.09991, auto.betaMinFor(500), 1e-5);
        assertEquals(0.3, auto.withTempering(6, 0.3).betaMinFor(500), 0.0);
    }

    /**
     * The β = 1 rung of a 4-rung ladder (β down to 0.01, so swaps bring states from an almost flat
     * distribution) visits each of the 5! = 120 orders with the frequency of its exact posterior
     * P(≺ | D) ∝ exp(logEvidence(≺)), every order evaluated in closed form ({@link OrderSum#evaluate};
     * the most probable order has 0.039). Seed fixed; 400,000 ladder steps, a draw every 4 steps
     * (100,000 draws). Tolerance: total variation distance ≤ 0.03. Measured while writing the test:
     * 0.008–0.009 for seeds 1–2 (an untempered chain of the same length: 0.009–0.010); with the
     * exponent's sign flipped in the swap rule, 0.63 — so the check sees a wrong swap rule.
     */
    @Test
    void coldRungVisitsEveryOrderInProportionToItsExactPosterior() {
        LocalScores ls = TestStores.scores(TestStores.random(5, 2, 2, 1000, 23));
        int n = 5;
        Map<String, Double> exact = new HashMap<>();
        double[] logs = new double[120];
        String[] keys = new String[120];
        int[] k = {0};
        permutations(new int[] {0, 1, 2, 3, 4}, 0, order -> {
            keys[k[0]] = java.util.Arrays.toString(order);
            logs[k[0]] = OrderSum.evaluate(ls, order).logEvidence();
            k[0]++;
        });
        double z = LogSum.of(logs);
        for (int i = 0; i < 120; i++) {
            exact.put(keys[i], Math.exp(logs[i] - z));
        }
        DrawStore store = new DrawStore(ChainSet.edgeOffsets(ls)[n], 100_000, 4, 0);
        TemperedOrderChain ladder = ladder(ls, 4, 0.01, 0.1, new SplittableRandom(7), store);
        ladder.advance(400_000, () -> false);
        Map<String, Integer> seen = new HashMap<>();
        for (int t = 0; t < store.size(); t++) {
            seen.merge(java.util.Arrays.toString(((DrawStore.Drawn) store.state(t)).order()), 1, Integer::sum);
        }
        double tv = 0;
        for (String key : keys) {
            tv += Math.abs(seen.getOrDefault(key, 0) / (double) store.size() - exact.get(key));
        }
        tv /= 2;
        assertTrue(tv <= 0.03, "total variation distance " + tv);
        // the swaps did happen (else the test says nothing about them)
        for (double a : ladder.swapAcceptance()) {
            assertTrue(a > 0.05 && a < 0.99, "swap acceptance " + a);
        }
    }

    /**
     * Edge posteriors of tempered order MCMC (4 chains, each a ladder of 3 rungs down to β = 0.2)
     * against the exact order-modular sum over all 6! orders ({@link ExactOrderSum}, Koivisto &amp;
     * Sood 2004), seed fixed: within 0.02 on every edge.
     */
    @Test
    void temperedEdgePosteriorsAgreeWithTheExactSumOverOrders() {
        LocalScores ls = TestStores.scores(TestStores.random(6, 2, 2, 150, 41));
        double[][] exact = ExactOrderSum.run(ls, OrderConstraints.none(6)).edgePosterior();
        McmcResult mc = OrderMcmc.run(ls, OrderConstraints.none(6),
                McmcSettings.defaults(3).withSteps(60_000, 5_000).withChains(4, 5000).withTempering(3, 0.2), null);
        assertTrue(OrderMcmcTest.maxDiff(mc, exact) < 0.02, "max |mcmc - exact| = " + OrderMcmcTest.maxDiff(mc, exact));
        assertEquals(2, mc.swapAcceptance().length);
        assertTrue(mc.memory().rungs() == 3 && mc.memory().chains() == 4);
    }

    static TemperedOrderChain ladder(LocalScores ls, int rungs, double betaMin, double relocate, SplittableRandom rng,
                                     DrawStore store) {
        int n = ls.variableCount();
        int[][] cpos = ChainSet.candidatePositions(ls);
        ChildTables tables = new ChildTables(ls, 1L << 20);
        OrderChain[] r = new OrderChain[rungs];
        for (int i = 0; i < rungs; i++) {
            r[i] = new OrderChain(ls, tables, OrderConstraints.none(n), cpos, ChainSet.edgeOffsets(ls), false, rng.split(),
                    null, relocate);
        }
        return new TemperedOrderChain(r, TemperedOrderChain.geometricLadder(rungs, betaMin), rng.split(), store);
    }

    private static void permutations(int[] a, int from, java.util.function.Consumer<int[]> visit) {
        if (from == a.length) {
            visit.accept(a.clone());
            return;
        }
        for (int i = from; i < a.length; i++) {
            int t = a[from];
            a[from] = a[i];
            a[i] = t;
            permutations(a, from + 1, visit);
            a[i] = a[from];
            a[from] = t;
        }
    }
}
