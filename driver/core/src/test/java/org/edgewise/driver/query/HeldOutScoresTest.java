package org.edgewise.driver.query;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Held-out scores against values worked by hand from their definitions on tiny tables: log loss
 * (the logarithmic rule, Good 1952: mean −ln p of the true state), Brier's score (Brier 1950, Monthly
 * Weather Review 78(1): mean over rows of Σ over states of (p − o)²), and the AUC as the share of
 * (positive, negative) pairs the positive scores higher, ties ½ (Mann &amp; Whitney 1947's U over
 * n_pos·n_neg; Hanley &amp; McNeil 1982); one-vs-rest macro average for more states (Fawcett 2006).
 */
class HeldOutScoresTest {
    /** Two states; P(s1) = 0.9, 0.6, 0.6, 0.2 with truths s1, s0, s1, s0. */
    static final double[][] BINARY = {{0.1, 0.9}, {0.4, 0.6}, {0.4, 0.6}, {0.8, 0.2}};
    static final int[] BINARY_TRUTH = {1, 0, 1, 0};

    @Test
    void binaryByHand() {
        HeldOutScores.Scores s = HeldOutScores.of(BINARY, BINARY_TRUTH, 2, 10);
        // log loss: −(ln 0.9 + ln 0.4 + ln 0.6 + ln 0.8)/4 = (0.1053605 + 0.9162907 + 0.5108256 + 0.2231436)/4
        assertEquals(0.43890511, s.logLoss(), 1e-8);
        // Brier (1950), both states: 2·(0.1² + 0.6² + 0.4² + 0.2²)/4 = 2·0.57/4
        assertEquals(0.285, s.brier(), 1e-12);
        // pairs (pos, neg): (0.9, 0.6) 1, (0.9, 0.2) 1, (0.6, 0.6) ½, (0.6, 0.2) 1 → 3.5 / 4
        assertEquals(0.875, s.auc(), 1e-12);
        assertEquals(0.875, s.aucPerState()[0], 1e-12, "with two states both states' AUCs agree");
        assertEquals(0.875, s.aucPerState()[1], 1e-12);
        // one table, of s1: bins [0.2, 0.3) 1 row (0.2, none s1), [0.6, 0.7) 2 rows (mean 0.6, one s1), [0.9, 1] 1 row (s1)
        assertEquals(1, s.calibration().size());
        HeldOutScores.Calibration c = s.calibration().get(0);
        assertEquals(1, c.state());
        assertEquals(10, c.bins().size());
        assertBin(c.bins().get(2), 1, 0.2, 0.0);
        assertBin(c.bins().get(6), 2, 0.6, 0.5);
        assertBin(c.bins().get(9), 1, 0.9, 1.0);
        int total = 0;
        for (HeldOutScores.Bin b : c.bins()) {
            total += b.count();
            assertTrue(b.count() > 0 || Double.isNaN(b.meanPredicted()), "an empty bin has no mean");
        }
        assertEquals(4, total);
    }

    @Test
    void threeStatesByHand() {
        double[][] p = {{.7, .2, .1}, {.2, .5, .3}, {.1, .3, .6}, {.3, .4, .3}, {.5, .25, .25}};
        int[] truth = {0, 1, 2, 2, 1};
        HeldOutScores.Scores s = HeldOutScores.of(p, truth, 3, 10);
        assertEquals(-(Math.log(.7) + Math.log(.5) + Math.log(.6) + Math.log(.3) + Math.log(.25)) / 5, s.logLoss(), 1e-12);
        // per row Σ_k (p − o)²: .14, .38, .26, .74, .875 → 2.395 / 5
        assertEquals(0.479, s.brier(), 1e-12);
        // s0: the one positive (0.7) beats all four negatives → 1
        assertEquals(1.0, s.aucPerState()[0], 1e-12);
        // s1: positives 0.5, 0.25 vs negatives 0.2, 0.3, 0.4: 3 + 1 = 4 of 6
        assertEquals(4 / 6.0, s.aucPerState()[1], 1e-12);
        // s2: positives 0.6, 0.3 vs negatives 0.1, 0.3, 0.25: 3 + (1 + ½ + 1) = 5.5 of 6
        assertEquals(5.5 / 6, s.aucPerState()[2], 1e-12);
        assertEquals((1 + 4 / 6.0 + 5.5 / 6) / 3, s.auc(), 1e-12);
        assertEquals(3, s.calibration().size(), "one table per state beyond two states");
    }

    @Test
    void aucUndefinedWithoutBothClasses() {
        double[][] p = {{.7, .2, .1}, {.2, .5, .3}};
        int[] truth = {0, 1};
        HeldOutScores.Scores s = HeldOutScores.of(p, truth, 3, 10);
        assertTrue(Double.isNaN(s.aucPerState()[2]), "no row of s2: no AUC");
        assertEquals((1.0 + 1.0) / 2, s.auc(), 1e-12, "the macro average over the states that have one");
        assertTrue(Double.isNaN(HeldOutScores.of(new double[][] {{.3, .7}}, new int[] {1}, 2, 10).auc()));
    }

    /** The rank form against the pair count of the definition, on random scores with many ties. */
    @Test
    void rankFormEqualsPairCount() {
        SplittableRandom rng = new SplittableRandom(19_4L);
        for (int rep = 0; rep < 20; rep++) {
            int n = 5 + rng.nextInt(60);
            double[] score = new double[n];
            boolean[] pos = new boolean[n];
            for (int i = 0; i < n; i++) {
                score[i] = rng.nextInt(7) / 6.0;
                pos[i] = rng.nextInt(3) == 0;
            }
            double wins = 0;
            long pairs = 0;
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (pos[a] && !pos[b]) {
                        wins += score[a] > score[b] ? 1 : score[a] == score[b] ? 0.5 : 0;
                        pairs++;
                    }
                }
            }
            double expected = pairs == 0 ? Double.NaN : wins / pairs;
            assertEquals(expected, HeldOutScores.auc(score, pos), 1e-12, "rep " + rep);
        }
    }

    @Test
    void probabilityOneFallsInTheLastBin() {
        HeldOutScores.Scores s = HeldOutScores.of(new double[][] {{0, 1}, {1, 0}}, new int[] {1, 0}, 2, 10);
        assertBin(s.calibration().get(0).bins().get(9), 1, 1.0, 1.0);
        assertBin(s.calibration().get(0).bins().get(0), 1, 0.0, 0.0);
        assertEquals(0.0, s.brier(), 1e-15);
        assertEquals(0.0, s.logLoss(), 1e-15);
    }

    static void assertBin(HeldOutScores.Bin b, int count, double mean, double observed) {
        assertEquals(count, b.count());
        assertEquals(mean, b.meanPredicted(), 1e-12);
        assertEquals(observed, b.observedFrequency(), 1e-12);
    }
}
