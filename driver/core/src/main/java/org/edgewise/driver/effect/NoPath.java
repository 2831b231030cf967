package org.edgewise.driver.effect;

import java.util.HashMap;
import java.util.Map;
import org.edgewise.driver.average.LocalScores;

/**
 * The posterior probability, given an order ≺, that no directed path leads from an intervened
 * variable to the outcome (the target, and the evidence when given): then P(y | do(x), w) does not
 * depend on x. Given ≺ the parent sets are independent a posteriori (Friedman &amp; Koller 2003),
 * but a path depends on several of them at once, so the probability is not a product. It is
 * computed exactly by a forward pass through the order whose state is the set S of variables
 * already known to be descendants of the intervened ones: a later variable v joins S with
 * probability Σ_{U ∩ S ≠ ∅} P(U | D, ≺); an outcome variable must stay out of S. The number of
 * states is at most 2^(variables between the first intervened variable and the last outcome);
 * above {@link #MAX_STATES} the pass gives up (NaN) and the caller samples DAGs instead.
 *
 * <p>Memory: one map entry (≈ 50 bytes) per state, at most {@link #MAX_STATES}.
 */
final class NoPath {
    /** Largest number of descendant sets tracked exactly. */
    static final int MAX_STATES = 1 << 16;

    private NoPath() {
    }

    /** Per child and parent set (aligned with {@link LocalScores#masks(int)}), the parents as a mask over variable indices. */
    static long[][] variableMasks(LocalScores ls) {
        int n = ls.variableCount();
        long[][] out = new long[n][];
        for (int c = 0; c < n; c++) {
            out[c] = new long[ls.setCount(c)];
            for (int s = 0; s < out[c].length; s++) {
                out[c][s] = Parameters.mask(ls.parents(c, s));
            }
        }
        return out;
    }

    /**
     * P(no directed path from {@code from} to {@code to} | D, ≺) exactly, or NaN when the pass
     * would track more than {@link #MAX_STATES} sets.
     *
     * @param order      the order
     * @param posteriors per child, the parent-set posteriors under the order (aligned with {@code masks})
     * @param masks      per child and set, the parents as a mask over variable indices
     */
    static double exact(int[] order, double[][] posteriors, long[][] masks, boolean[] from, boolean[] to) {
        int n = order.length;
        int first = -1;
        int last = -1;
        long start = 0;
        for (int p = 0; p < n; p++) {
            int v = order[p];
            if (from[v]) {
                start |= 1L << v;
                first = first < 0 ? p : first;
            }
            if (to[v]) {
                last = p;
            }
        }
        if (first < 0 || last < first) {
            return 1; // every outcome precedes every intervened variable
        }
        Map<Long, Double> states = new HashMap<>();
        states.put(start, 1.0);
        for (int p = first + 1; p <= last; p++) {
            int v = order[p];
            if (from[v]) {
                continue;
            }
            Map<Long, Double> next = new HashMap<>();
            for (Map.Entry<Long, Double> e : states.entrySet()) {
                long s = e.getKey();
                double in = 0;
                double out = 0; // summed separately, not 1 − in, to keep small complements accurate
                double[] w = posteriors[v];
                for (int k = 0; k < w.length; k++) {
                    if ((masks[v][k] & s) != 0) {
                        in += w[k];
                    } else {
                        out += w[k];
                    }
                }
                if (out > 0) {
                    next.merge(s, e.getValue() * out, Double::sum);
                }
                if (!to[v] && in > 0) {
                    next.merge(s | 1L << v, e.getValue() * in, Double::sum);
                }
            }
            if (next.size() > MAX_STATES) {
                return Double.NaN;
            }
            states = next;
        }
        double total = 0;
        for (double x : states.values()) {
            total += x;
        }
        return Math.min(1, total);
    }
}
