package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** AUROC and average precision against hand computations and the Mann–Whitney pair count. */
class RankMetricsTest {
    static boolean[] labels(int... l) {
        boolean[] b = new boolean[l.length];
        for (int i = 0; i < l.length; i++) {
            b[i] = l[i] == 1;
        }
        return b;
    }

    @Test
    void aurocOnTinyCasesByHand() {
        // positives {0.9, 0.7}, negatives {0.8, 0.1}: 3 of 4 pairs ordered correctly (by hand)
        assertEquals(0.75, RankMetrics.auroc(new double[] {0.9, 0.8, 0.7, 0.1}, labels(1, 0, 1, 0)), 1e-15);
        // a positive tied with a negative counts 1/2 (midrank convention): (1 + 1 + 0.5 + 1) / 4
        assertEquals(0.875, RankMetrics.auroc(new double[] {0.9, 0.6, 0.6, 0.2}, labels(1, 1, 0, 0)), 1e-15);
        // all tied: chance level
        assertEquals(0.5, RankMetrics.auroc(new double[] {0.5, 0.5, 0.5}, labels(1, 0, 0)), 1e-15);
        assertEquals(1.0, RankMetrics.auroc(new double[] {3, 2, 1}, labels(1, 1, 0)), 1e-15);
        assertEquals(0.0, RankMetrics.auroc(new double[] {1, 2, 3}, labels(1, 1, 0)), 1e-15);
        assertTrue(Double.isNaN(RankMetrics.auroc(new double[] {1, 2}, labels(0, 0))), "no positives: undefined");
    }

    /** Mann & Whitney (1947): U = #{(pos, neg): pos > neg} + ½ #{pos = neg}; AUROC = U / (n₁ n₀). */
    @Test
    void equalsTheMannWhitneyPairCount() {
        SplittableRandom rng = new SplittableRandom(11);
        for (int trial = 0; trial < 200; trial++) {
            int n = 2 + rng.nextInt(40);
            double[] s = new double[n];
            boolean[] y = new boolean[n];
            for (int i = 0; i < n; i++) {
                s[i] = Math.round(rng.nextDouble() * 10) / 10.0; // many ties
                y[i] = rng.nextDouble() < 0.3 + 0.4 * s[i];
            }
            double u = 0;
            long n1 = 0;
            long n0 = 0;
            for (int i = 0; i < n; i++) {
                if (y[i]) {
                    n1++;
                } else {
                    n0++;
                }
                for (int j = 0; j < n; j++) {
                    if (y[i] && !y[j]) {
                        u += s[i] > s[j] ? 1 : s[i] == s[j] ? 0.5 : 0;
                    }
                }
            }
            double auc = RankMetrics.auroc(s, y);
            if (n1 == 0 || n0 == 0) {
                assertTrue(Double.isNaN(auc));
            } else {
                assertEquals(u / (n1 * n0), auc, 1e-12, "trial " + trial);
            }
        }
    }

    @Test
    void averagePrecisionByHand() {
        // Manning, Raghavan & Schütze (2008) §8.4: mean of the precision at each relevant item;
        // hits at ranks 1, 3, 5: (1/1 + 2/3 + 3/5) / 3 = 34/45
        assertEquals(34.0 / 45, RankMetrics.averagePrecision(new double[] {0.9, 0.8, 0.7, 0.6, 0.5},
                labels(1, 0, 1, 0, 1)), 1e-15);
        // ties enter as one threshold: {0.5, 0.5} holds the one positive at precision 1/2, after
        // the negative at 0.9: recall reaches 1 at precision 1/3 (convention: score >= t, from memory)
        assertEquals(1.0 / 3, RankMetrics.averagePrecision(new double[] {0.9, 0.5, 0.5}, labels(0, 1, 0)), 1e-15);
        assertEquals(1.0, RankMetrics.averagePrecision(new double[] {0.9, 0.8, 0.1}, labels(1, 1, 0)), 1e-15);
        assertTrue(Double.isNaN(RankMetrics.averagePrecision(new double[] {0.3}, labels(0))));
    }
}
