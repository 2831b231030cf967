package org.edgewise.driver.effect;

import java.util.Arrays;
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

    /**
     * Per child and parent set (aligned with {@link LocalScores#masks(int)}), the parents as a bitset over
     * variable indices ({@code ⌈n/64⌉} words; any number of variables).
     */
    static long[][][] variableMasks(LocalScores ls) {
        int n = ls.variableCount();
        int words = (n + 63) >>> 6;
        long[][][] out = new long[n][][];
        for (int c = 0; c < n; c++) {
            out[c] = new long[ls.setCount(c)][];
            for (int s = 0; s < out[c].length; s++) {
                out[c][s] = Parameters.mask(ls.parents(c, s), words);
            }
        }
        return out;
    }

    /** A set of variables as a map key (content equality). */
    private record State(long[] bits, int hash) {
        State(long[] bits) {
            this(bits, Arrays.hashCode(bits));
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof State s && hash == s.hash && Arrays.equals(bits, s.bits);
        }

        @Override
        public int hashCode() {
            return hash;
        }

        boolean meets(long[] mask) {
            for (int w = 0; w < bits.length; w++) {
                if ((bits[w] & mask[w]) != 0) {
                    return true;
                }
            }
            return false;
        }

        State with(int v) {
            long[] b = bits.clone();
            b[v >>> 6] |= 1L << v;
            return new State(b);
        }
    }

    /**
     * P(no directed path from {@code from} to {@code to} | D, ≺) exactly, or NaN when the pass
     * would track more than {@link #MAX_STATES} sets.
     *
     * @param order      the order
     * @param posteriors per child, the parent-set posteriors under the order (aligned with {@code masks})
     * @param masks      per child and set, the parents as a bitset over variable indices
     */
    static double exact(int[] order, double[][] posteriors, long[][][] masks, boolean[] from, boolean[] to) {
        int n = order.length;
        int first = -1;
        int last = -1;
        long[] start = new long[(n + 63) >>> 6];
        for (int p = 0; p < n; p++) {
            int v = order[p];
            if (from[v]) {
                start[v >>> 6] |= 1L << v;
                first = first < 0 ? p : first;
            }
            if (to[v]) {
                last = p;
            }
        }
        if (first < 0 || last < first) {
            return 1; // every outcome precedes every intervened variable
        }
        Map<State, Double> states = new HashMap<>();
        states.put(new State(start), 1.0);
        for (int p = first + 1; p <= last; p++) {
            int v = order[p];
            if (from[v]) {
                continue;
            }
            Map<State, Double> next = new HashMap<>();
            for (Map.Entry<State, Double> e : states.entrySet()) {
                State s = e.getKey();
                double in = 0;
                double out = 0; // summed separately, not 1 − in, to keep small complements accurate
                double[] w = posteriors[v];
                for (int k = 0; k < w.length; k++) {
                    if (s.meets(masks[v][k])) {
                        in += w[k];
                    } else {
                        out += w[k];
                    }
                }
                if (out > 0) {
                    next.merge(s, e.getValue() * out, Double::sum);
                }
                if (!to[v] && in > 0) {
                    next.merge(s.with(v), e.getValue() * in, Double::sum);
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
