package org.edgewise.driver.average.dag;

import java.util.SplittableRandom;
import org.edgewise.driver.average.LocalScores;

/**
 * Features of a structure beyond single edges, estimated by sampling one DAG per sampled order
 * (Friedman &amp; Koller 2003, sec. 4: given ≺, the parent sets are independent, each drawn with
 * probability exp(s(i,U) + log ρ_i(U)) / α_i(pred(i)) among the allowed U ⊆ pred(i)):
 * <ul>
 *   <li>ancestor relation a ⇝ b: a directed path from a to b;</li>
 *   <li>Markov-blanket membership of the unordered pair {a, b}: a is a parent, a child, or a
 *       co-parent (another parent of a common child) of b.</li>
 * </ul>
 * Indicators are packed in a {@code long[]} bitset of 2n² bits: bit a·n+b for a ⇝ b, bit
 * n² + a·n + b (a &lt; b) for Markov-blanket membership — n²/32 bytes per draw.
 */
public final class DagFeatures {
    private DagFeatures() {
    }

    /**
     * One DAG given an order: per child, the index of its parent set in {@code ls.masks(i)}.
     *
     * @param predMask per child, the mask of its candidates that precede it
     * @param logSum   per child, log α_i(predMask) (the normaliser)
     */
    public static int[] sampleDag(LocalScores ls, long[] predMask, double[] logSum, SplittableRandom rng) {
        int n = ls.variableCount();
        int[] chosen = new int[n];
        for (int i = 0; i < n; i++) {
            chosen[i] = drawSet(ls, i, predMask[i], logSum[i], rng.nextDouble());
        }
        return chosen;
    }

    /**
     * Child i's parent set drawn among those inside {@code allowed} (a mask over its candidates)
     * with probability exp(w_i(U) − logZ), logZ = log α_i(allowed), by inversion of the uniform
     * {@code u}: the index in {@code ls.masks(i)}, or −1 when no set fits.
     */
    public static int drawSet(LocalScores ls, int i, long allowed, double logZ, double u) {
        long[] masks = ls.masks(i);
        double[] w = ls.weights(i);
        double acc = 0;
        int last = -1;
        for (int s = 0; s < masks.length; s++) {
            if ((masks[s] & ~allowed) != 0) {
                continue;
            }
            last = s;
            acc += Math.exp(w[s] - logZ);
            if (u < acc) {
                break;
            }
        }
        return last;
    }

    /** Bit index of a ⇝ b. */
    public static int ancestorBit(int a, int b, int n) {
        return a * n + b;
    }

    /** Bit index of Markov-blanket membership of {a, b} (order-free). */
    public static int blanketBit(int a, int b, int n) {
        return n * n + Math.min(a, b) * n + Math.max(a, b);
    }

    /** The indicators of a DAG (parent-set indices per child) whose topological order is {@code order}. */
    public static long[] indicators(LocalScores ls, int[] chosen, int[] order) {
        int n = ls.variableCount();
        int words = (n + 63) >>> 6;
        long[][] anc = new long[n][words];
        long[] bits = new long[(2 * n * n + 63) >>> 6];
        for (int v : order) {
            int[] pa = ls.parents(v, chosen[v]);
            for (int p : pa) {
                anc[v][p >>> 6] |= 1L << p;
                for (int k = 0; k < words; k++) {
                    anc[v][k] |= anc[p][k];
                }
                set(bits, blanketBit(p, v, n));
                for (int p2 : pa) {
                    if (p2 != p) {
                        set(bits, blanketBit(p, p2, n));
                    }
                }
            }
        }
        for (int b = 0; b < n; b++) {
            for (int k = 0; k < words; k++) {
                for (long r = anc[b][k]; r != 0; r &= r - 1) {
                    int a = (k << 6) + Long.numberOfTrailingZeros(r);
                    set(bits, ancestorBit(a, b, n));
                }
            }
        }
        return bits;
    }

    public static boolean get(long[] bits, int i) {
        return (bits[i >>> 6] >>> i & 1L) != 0;
    }

    private static void set(long[] bits, int i) {
        bits[i >>> 6] |= 1L << i;
    }
}
