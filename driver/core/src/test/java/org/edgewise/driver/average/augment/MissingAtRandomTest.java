package org.edgewise.driver.average.augment;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * A simulation under missing at random: values of d and e are hidden with a probability that depends
 * on the observed a (30 % of the rows incomplete). The edge posteriors of the complete table (before
 * masking, exact over every DAG on 5 variables, order-modular prior) are the reference; averaging
 * over the missing values by data augmentation should come closer to them, on average over the
 * edges, than dropping the incomplete rows (which throws away what they do show) or counting
 * "missing" as a state (whose dependence on a reads as an edge) — the usual account of the two
 * (Little &amp; Rubin, Statistical Analysis with Missing Data, ch. 3). Both of those are computed
 * exactly; the augmented ones are sampled (common practice: three data sets, the mean gap).
 */
class MissingAtRandomTest {
    static final int N = 5;

    /** a → b, a → c, b → d, c → d, d → e, all binary. */
    static int[][] rows(int count, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        int[][] rows = new int[count][N];
        for (int[] x : rows) {
            x[0] = bit(rng, 0.5);
            x[1] = bit(rng, x[0] == 1 ? 0.8 : 0.25);
            x[2] = bit(rng, x[0] == 1 ? 0.3 : 0.75);
            x[3] = bit(rng, x[1] + x[2] == 2 ? 0.9 : x[1] + x[2] == 1 ? 0.5 : 0.1);
            x[4] = bit(rng, x[3] == 1 ? 0.85 : 0.2);
        }
        return rows;
    }

    static int bit(SplittableRandom rng, double p) {
        return rng.nextDouble() < p ? 1 : 0;
    }

    /** d hidden with probability 0.45 when a = 1, 0.08 when a = 0; e with 0.06: about 30 % of rows. */
    static int[][] mask(int[][] rows, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        int[][] out = AugmentationTest.copy(rows);
        for (int[] x : out) {
            if (rng.nextDouble() < (x[0] == 1 ? 0.45 : 0.08)) {
                x[3] = -1;
            }
            if (rng.nextDouble() < 0.06) {
                x[4] = -1;
            }
        }
        return out;
    }

    static double meanGap(double[][] p, double[][] ref) {
        double s = 0;
        for (int a = 0; a < N; a++) {
            for (int b = 0; b < N; b++) {
                if (a != b) {
                    s += Math.abs(p[a][b] - ref[a][b]);
                }
            }
        }
        return s / (N * (N - 1));
    }

    @Test
    void averagingComesCloserToTheCompleteTableThanDroppingOrAState() {
        List<Variable> vars = AugmentationTest.binary(N);
        List<Variable> withState = new ArrayList<>(vars);
        withState.set(3, new Variable("x3", List.of("0", "1", "(missing)")));
        withState.set(4, new Variable("x4", List.of("0", "1", "(missing)")));
        double sumAverage = 0;
        double sumDrop = 0;
        double sumState = 0;
        for (long seed = 1; seed <= 3; seed++) {
            int[][] full = rows(300, seed);
            int[][] masked = mask(full, 100 + seed);
            long incomplete = java.util.Arrays.stream(masked).filter(x -> x[3] < 0 || x[4] < 0).count();
            double[][] reference = AugmentationTest.exactEdges(vars, full, N - 1);
            int[][] kept = java.util.Arrays.stream(masked).filter(x -> x[3] >= 0 && x[4] >= 0).toArray(int[][]::new);
            double[][] drop = AugmentationTest.exactEdges(vars, kept, N - 1);
            int[][] stated = AugmentationTest.copy(masked);
            for (int[] x : stated) {
                x[3] = x[3] < 0 ? 2 : x[3];
                x[4] = x[4] < 0 ? 2 : x[4];
            }
            double[][] state = AugmentationTest.exactEdges(withState, stated, N - 1);
            Augmentation.Outcome o = AugmentationTest.augment(vars, masked, N - 1,
                    new Augmentation.Settings(300, 50, 2, 20, seed));
            double[][] average = new double[N][N];
            for (int a = 0; a < N; a++) {
                for (int b = 0; b < N; b++) {
                    if (a != b) {
                        average[a][b] = AugmentationTest.edge(o, a, b).mean();
                    }
                }
            }
            double ga = meanGap(average, reference);
            double gd = meanGap(drop, reference);
            double gs = meanGap(state, reference);
            System.out.printf(Locale.ROOT, "MAR data set %d: %d of 300 rows incomplete; mean |edge gap| to the complete "
                    + "table: average %.4f, drop %.4f, state %.4f%n", seed, incomplete, ga, gd, gs);
            sumAverage += ga;
            sumDrop += gd;
            sumState += gs;
        }
        System.out.printf(Locale.ROOT, "MAR, mean over 3 data sets: average %.4f, drop %.4f, state %.4f%n", sumAverage / 3,
                sumDrop / 3, sumState / 3);
        assertTrue(sumAverage < sumDrop, "averaging is closer than dropping");
        assertTrue(sumAverage < sumState, "averaging is closer than a missing state");
    }
}
