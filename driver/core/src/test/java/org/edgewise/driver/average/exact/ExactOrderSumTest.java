package org.edgewise.driver.average.exact;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.special.Gamma;
import org.edgewise.driver.UserError;
import org.edgewise.driver.score.StructurePrior;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.BruteForceOrders;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.TestStores;

/**
 * The exact DP over orders (Koivisto &amp; Sood 2004; Koivisto 2006) against the independent
 * brute force: all n! orders enumerated, each by the given-order closed form, log-sum-exp.
 */
class ExactOrderSumTest {

    private static void assertMatches(LocalScores ls, OrderConstraints oc, double evidenceTol) {
        ExactOrderSum.Result dp = ExactOrderSum.run(ls, oc);
        BruteForceOrders bf = new BruteForceOrders(ls, oc);
        int n = ls.variableCount();
        // the uniform order prior: 1/N over the allowed orders, N counted by the enumeration itself
        assertEquals(Math.log(bf.orders), dp.logOrderCount(), 1e-9);
        assertEquals(bf.logOrderSum, dp.logOrderSum(), evidenceTol);
        assertEquals(bf.logOrderSum - Math.log(bf.orders), dp.logEvidence(), evidenceTol);
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                assertEquals(bf.edges[a][b], dp.edgePosterior()[a][b], 1e-9, "edge " + a + "->" + b);
            }
        }
    }

    @Test
    void equalsBruteForceOverAllOrders() {
        // n = 7: 5040 orders; d = 3, binary, 300 rows of a random network
        ScoreStore s = TestStores.random(7, 2, 3, 300, 11);
        LocalScores ls = TestStores.scores(s);
        assertMatches(ls, OrderConstraints.none(7), 1e-9);
    }

    @Test
    void equalsBruteForceWithSizePriorAndTernary() {
        ScoreStore s = TestStores.random(6, 3, 2, 400, 5);
        LocalScores ls = LocalScores.build(s, ScoringOptions.asStored().withPrior(StructurePrior.SIZE));
        assertMatches(ls, OrderConstraints.none(6), 1e-9);
    }

    @Test
    void numericallySafeWithScoresOfMinusAMillion() {
        // every family score multiplied by ~2000 so that scores are about −10⁶ and differ by
        // thousands of nats: plain exponentials underflow; the log-space DP must not.
        ScoreStore base = TestStores.random(6, 2, 2, 500, 3);
        double min = java.util.Arrays.stream(base.logScores()).min().orElseThrow();
        ScoreStore s = TestStores.scaled(base, 1e6 / -min);
        LocalScores ls = TestStores.scores(s);
        ExactOrderSum.Result dp = ExactOrderSum.run(ls, OrderConstraints.none(6));
        assertTrue(dp.logEvidence() < -1e6 && Double.isFinite(dp.logEvidence()), "evidence " + dp.logEvidence());
        // 1e-9 relative to |logEvidence| ≈ 6·10⁶: the ulp there is ~10⁻⁹
        assertMatches(ls, OrderConstraints.none(6), 1e-9 * Math.abs(dp.logEvidence()));
    }

    @Test
    void tiersForbidAndRequireMatchBruteForce() {
        ScoreStore s = TestStores.random(6, 2, 2, 300, 21);
        LocalScores ls = TestStores.scores(s, List.of(new EdgeRule("v0", "v3")), List.of(new EdgeRule("v5", "v1")));
        OrderConstraints oc = OrderConstraints.of(ls, List.of(List.of("v2", "v4"), List.of("v0", "v1")));
        // v2,v4 before v0,v1; v3, v5 free: 6! · 2!·2! / 4! = 120 orders
        assertEquals(Math.log(120), oc.logOrderCount(), 1e-12);
        assertMatches(ls, oc, 1e-9);
        ExactOrderSum.Result dp = ExactOrderSum.run(ls, oc);
        assertEquals(1.0, dp.edgePosterior()[5][1], 1e-12);
        assertEquals(0.0, dp.edgePosterior()[0][3], 0.0);
    }

    @Test
    void edgePosteriorsOfOneChildSumToItsExpectedParentCount() {
        // Σ_j P(j→i) = E[|U_i|] ≤ d; and with the uniform prior on 2 variables P(a→b) + P(b→a)
        // is the posterior of a dependence — checked against the two orders by hand (n = 2:
        // logZ = log(e^{s(a)+log(e^{s(b)}+e^{s(b|a)})} + e^{s(b)+log(e^{s(a)}+e^{s(a|b)})})).
        ScoreStore s = TestStores.random(2, 2, 1, 200, 9);
        LocalScores ls = TestStores.scores(s);
        double a = s.logScore(0), ab = s.logScore(1), b = s.logScore(2), ba = s.logScore(3);
        double z = LogSum.add(a + LogSum.add(b, ba), b + LogSum.add(a, ab));
        ExactOrderSum.Result dp = ExactOrderSum.run(ls, OrderConstraints.none(2));
        assertEquals(z - Math.log(2), dp.logEvidence(), 1e-12);
        assertEquals(Math.exp(a + ba - z), dp.edgePosterior()[0][1], 1e-12);
        assertEquals(Math.exp(b + ab - z), dp.edgePosterior()[1][0], 1e-12);
        assertEquals(Gamma.logGamma(3), ExactOrderSum.run(ls, OrderConstraints.none(2)).logOrderCount() + Math.log(1), 1e-12);
    }

    @Test
    void refusesWhenMemoryDoesNotFitAndSaysWhichNFits() {
        ExactOrderSum.Estimate e = ExactOrderSum.estimate(30, 2, 4L << 30);
        // 8·(30·2^29 + 2·2^30) bytes = 136 GiB; with 4 GiB the largest n is 25 (8·(25·2^24+2·2^25) = 3.6 GiB; n = 26: 7.5 GiB)
        assertEquals(8L * (30L * (1L << 29) + 2L * (1L << 30)), e.bytes());
        assertEquals(25, e.largestN());
        assertTrue(e.toString().contains("this JVM allows n <= 25"), e.toString());
        assertTrue(e.toString().startsWith("exact sum over orders for n = 30 needs about 136.0 GiB"), e.toString());
        assertTrue(ExactOrderSum.estimate(100, 2, 4L << 30).toString().contains("needs about 4.9e+23 GiB"));
    }

    /**
     * The subset transform (log space, terms more than 40 nats below cut off) against the
     * direct log-sum over every subset (LogSum.add, log space), on log weights of a million-row table's
     * size: around −10^6, spread over 3,000 nats (so most terms vanish beside the largest), some −∞.
     */
    @Test
    void subsetZetaAgreesWithDirectSumsAtLargeScoreRanges() {
        int bits = 10;
        double[] x = new double[1 << bits];
        java.util.SplittableRandom r = new java.util.SplittableRandom(7);
        for (int k = 0; k < x.length; k++) {
            x[k] = k % 7 == 3 ? Double.NEGATIVE_INFINITY : -1e6 + r.nextDouble() * 3000 * (Integer.bitCount(k) % 3 == 0 ? 1 : 0.01);
        }
        double[] sub = x.clone();
        ExactOrderSum.subsetZeta(sub, bits);
        for (int s = 0; s < x.length; s++) {
            double direct = Double.NEGATIVE_INFINITY;
            for (int t = 0; t < x.length; t++) {
                if ((t & ~s) == 0) {
                    direct = LogSum.add(direct, x[t]);
                }
            }
            if (direct == Double.NEGATIVE_INFINITY) {
                assertEquals(Double.NEGATIVE_INFINITY, sub[s], "subset " + s);
            } else {
                assertEquals(direct, sub[s], 1e-9, "subset " + s); // 1e-15 relative at 10^6
            }
        }
    }

    @Test
    void zetaTransformsAgreeWithDirectSums() {
        // fast zeta (Yates) vs direct Σ_{T⊆S} / Σ_{T⊇S} over 4 bits
        double[] x = new double[16];
        java.util.SplittableRandom r = new java.util.SplittableRandom(1);
        for (int k = 0; k < 16; k++) {
            x[k] = k == 5 ? Double.NEGATIVE_INFINITY : r.nextDouble() * 10 - 5;
        }
        double[] sub = x.clone();
        double[] sup = x.clone();
        ExactOrderSum.subsetZeta(sub, 4);
        ExactOrderSum.supersetZeta(sup, 4);
        for (int s = 0; s < 16; s++) {
            double ds = Double.NEGATIVE_INFINITY, dp = Double.NEGATIVE_INFINITY;
            for (int t = 0; t < 16; t++) {
                if ((t & ~s) == 0) {
                    ds = LogSum.add(ds, x[t]);
                }
                if ((s & ~t) == 0) {
                    dp = LogSum.add(dp, x[t]);
                }
            }
            assertEquals(ds, sub[s], 1e-12);
            assertEquals(dp, sup[s], 1e-12);
        }
        // truncated superset transform: exact on the entries with at most d bits
        double[] y = new double[1 << 7];
        for (int k = 0; k < y.length; k++) {
            y[k] = r.nextDouble() * 20 - 10;
        }
        double[] full = y.clone();
        ExactOrderSum.supersetZeta(full, 7);
        for (int d = 0; d <= 7; d++) {
            double[] t = y.clone();
            ExactOrderSum.supersetZetaUpTo(t, 7, d);
            for (int k = 0; k < y.length; k++) {
                if (Integer.bitCount(k) <= d) {
                    assertEquals(full[k], t[k], 1e-12, "d=" + d + " k=" + k);
                }
            }
        }
        assertThrows(UserError.class, () -> { throw new UserError("x"); });
    }
}
