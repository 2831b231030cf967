package org.edgewise.driver.average.givenorder;

import java.util.Arrays;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.exact.ExactOrderSum;

/**
 * An order whose best network is the single highest-scoring DAG, argmax_G Π_i β_i(U_i) with
 * β_i(U) = exp(s(i,U) + log ρ_i(U)) over the admitted DAGs — the maximum a posteriori DAG under
 * the structure-modular prior. Max-product dynamic programming over subsets (Silander &amp;
 * Myllymäki 2006; Koivisto &amp; Sood 2004 with max for sum):
 * <pre>
 *   b_i(W) = max_{U ⊆ W} log β_i(U),   M(∅) = 0,   M(S) = max_{i ∈ S, i ≺c-maximal in S} M(S∖{i}) + b_i(S∖{i})
 * </pre>
 * Every DAG admitted under the precedences ≺c has a linear extension respecting them, so
 * max over allowed orders of the best DAG consistent with the order is the best admitted DAG;
 * {@link OrderPosterior#of} on the returned order then picks the argmax set per child.
 * Cost O(n 2^n) time, n 2^(n−1) + 2^n doubles (n ≤ 30).
 */
public final class BestDagOrder {
    private BestDagOrder() {
    }

    /** The order; ties are broken towards the smaller variable index. */
    public static int[] of(LocalScores ls, OrderConstraints oc) {
        int n = ls.variableCount();
        double[][] b = new double[n][];
        int half = 1 << (n - 1);
        for (int i = 0; i < n; i++) {
            double[] a = ExactOrderSum.scatter(ls, i, ls.weights(i), true);
            for (int bit = 1; bit < half; bit <<= 1) {
                for (int k = 0; k < half; k++) {
                    if ((k & bit) != 0) {
                        a[k] = Math.max(a[k], a[k ^ bit]);
                    }
                }
            }
            b[i] = a;
        }
        int[] before = oc.predecessorMasks();
        int full = (1 << n) - 1;
        double[] m = new double[full + 1];
        int[] last = new int[full + 1];
        Arrays.fill(m, Double.NEGATIVE_INFINITY);
        m[0] = 0;
        for (int s = 1; s <= full; s++) {
            for (int i = 0; i < n; i++) {
                int rest = s & ~(1 << i);
                // i may come last in S only when nothing in S must follow it
                if ((s >>> i & 1) == 0 || (before[i] & ~rest) != 0 || !precedesNoneOf(before, i, rest)) {
                    continue;
                }
                double v = m[rest] + b[i][ExactOrderSum.compress(rest, i)];
                if (v > m[s]) {
                    m[s] = v;
                    last[s] = i;
                }
            }
        }
        int[] order = new int[n];
        for (int s = full, p = n - 1; p >= 0; p--) {
            order[p] = last[s];
            s &= ~(1 << last[s]);
        }
        return order;
    }

    /** True when no member of {@code rest} must come after {@code i}. */
    private static boolean precedesNoneOf(int[] before, int i, int rest) {
        for (int r = rest; r != 0; r &= r - 1) {
            if ((before[Integer.numberOfTrailingZeros(r)] >>> i & 1) != 0) {
                return false;
            }
        }
        return true;
    }
}
