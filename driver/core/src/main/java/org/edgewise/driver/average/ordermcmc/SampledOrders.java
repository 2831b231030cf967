package org.edgewise.driver.average.ordermcmc;

import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.dag.DagFeatures;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.givenorder.OrderSum;

/**
 * Averages over a sample of orders, each order weighted alike — orders drawn from P(≺ | D) by
 * {@link ExactOrderSum} (independent draws) or stored by {@link OrderMcmc} (a Markov chain).
 *
 * <ul>
 *   <li>parent-set posteriors: the mean over orders of P(U | D, ≺) =
 *       exp(s(i,U) + log ρ_i(U)) / α_i(pred_≺(i)) (Rao-Blackwellised, Friedman &amp; Koller 2003);</li>
 *   <li>features beyond edges ({@link DagFeatures}): one DAG drawn per order from its
 *       parent-set weights, indicators averaged; for independent orders the Monte Carlo standard
 *       error is sqrt(p(1−p)/K).</li>
 * </ul>
 * Memory: one double per allowed parent set (set posteriors); 2n² doubles (features).
 */
public final class SampledOrders {
    private SampledOrders() {
    }

    /** Mean over {@code orders} of each child's parent-set posterior, aligned with {@link LocalScores#masks(int)}. */
    public static double[][] setPosteriors(LocalScores ls, List<int[]> orders) {
        int n = ls.variableCount();
        double[][] out = new double[n][];
        for (int i = 0; i < n; i++) {
            out[i] = new double[ls.setCount(i)];
        }
        double share = 1.0 / orders.size();
        for (int[] order : orders) {
            int[] pos = OrderSum.positions(order, n);
            for (int i = 0; i < n; i++) {
                long pred = ls.predecessorMask(i, pos);
                double z = OrderSum.childLogSum(ls, i, pred);
                long[] masks = ls.masks(i);
                double[] w = ls.weights(i);
                for (int s = 0; s < masks.length; s++) {
                    if ((masks[s] & ~pred) == 0) {
                        out[i][s] += share * Math.exp(w[s] - z);
                    }
                }
            }
        }
        return out;
    }

    /**
     * Ancestor ({@code [0][a][b]}: a ⇝ b) and Markov-blanket ({@code [1][a][b]}, symmetric)
     * frequencies over one DAG per order; {@code [2]} and {@code [3]} their standard errors
     * sqrt(p(1−p)/K) for independent orders.
     */
    public static double[][][] features(LocalScores ls, List<int[]> orders, long seed) {
        int n = ls.variableCount();
        double[][][] out = new double[4][n][n];
        SplittableRandom rng = new SplittableRandom(seed);
        long[] mask = new long[n];
        double[] z = new double[n];
        for (int[] order : orders) {
            int[] pos = OrderSum.positions(order, n);
            for (int i = 0; i < n; i++) {
                mask[i] = ls.predecessorMask(i, pos);
                z[i] = OrderSum.childLogSum(ls, i, mask[i]);
            }
            long[] bits = DagFeatures.indicators(ls, DagFeatures.sampleDag(ls, mask, z, rng), order);
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (a != b) {
                        if (DagFeatures.get(bits, DagFeatures.ancestorBit(a, b, n))) {
                            out[0][a][b]++;
                        }
                        if (DagFeatures.get(bits, DagFeatures.blanketBit(a, b, n))) {
                            out[1][a][b]++;
                        }
                    }
                }
            }
        }
        int k = orders.size();
        for (int f = 0; f < 2; f++) {
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    double p = out[f][a][b] / k;
                    out[f][a][b] = p;
                    out[f + 2][a][b] = Math.sqrt(p * (1 - p) / k);
                }
            }
        }
        return out;
    }
}
