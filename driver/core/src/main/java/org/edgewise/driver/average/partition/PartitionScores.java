package org.edgewise.driver.average.partition;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;

/**
 * The per-node score of an ordered partition Λ = (T_1, …, T_m) under the convention of
 * {@link PartitionChain}: a node in T_k, k &gt; 1, takes its parents from B_k = T_1 ∪ … ∪ T_{k−1}
 * with at least one in T_{k−1}, a node in T_1 has none; so its score is
 * <pre>  log Σ_{U ⊆ B, U ∩ T ≠ ∅} exp w_i(U)      (U = ∅ alone in T_1)</pre>
 * with w_i(U) = s(i,U) + log ρ_i(U). By inclusion–exclusion on the {@link ChildTables} zeta transform
 * α_i(P) = Σ_{U ⊆ P} exp w_i(U) the sum is α_i(B) − α_i(B ∖ T), two lookups (Kuipers &amp; Moffa 2017,
 * sec. 3); when the two agree to a relative {@value #DIRECT_BELOW} (the difference would lose digits)
 * or the child is not tabulated, it is summed directly over the child's allowed sets, O(#sets).
 *
 * <p>Tiers are honoured by removing from each child's B and T the candidates that must follow it
 * ({@link #excluded}). Immutable after construction; shared by a chain and its {@link DagMoves}.
 */
public final class PartitionScores {
    private static final double DIRECT_BELOW = 1e-4;

    private final LocalScores ls;
    private final ChildTables tables;
    /** Per child, the candidates (as a mask) that the tiers place after it. */
    private final long[] excluded;
    /** Per child, the weight of the empty parent set (−∞ when not allowed). */
    private final double[] emptyLog;

    PartitionScores(LocalScores ls, ChildTables tables, OrderConstraints oc) {
        this.ls = ls;
        this.tables = tables;
        int n = ls.variableCount();
        excluded = new long[n];
        emptyLog = new double[n];
        for (int i = 0; i < n; i++) {
            int[] cand = ls.candidates(i);
            for (int k = 0; k < cand.length; k++) {
                if (oc.restricts() && oc.mustPrecede(i, cand[k])) {
                    excluded[i] |= 1L << k;
                }
            }
            emptyLog[i] = Double.NEGATIVE_INFINITY;
            long[] masks = ls.masks(i);
            for (int s = 0; s < masks.length; s++) {
                if (masks[s] == 0) {
                    emptyLog[i] = ls.weights(i)[s];
                }
            }
        }
    }

    /** Per child, the candidates the tiers place after it (shared, not copied: read only). */
    long[] excluded() {
        return excluded;
    }

    /** B of node i: its candidates in earlier elements, given {@code el[v]} the element of each node. */
    long predMask(int i, int[] el) {
        int[] cand = ls.candidates(i);
        int e = el[i];
        long mk = 0;
        for (int k = 0; k < cand.length; k++) {
            if (el[cand[k]] < e) {
                mk |= 1L << k;
            }
        }
        return mk & ~excluded[i];
    }

    /** T of node i: its candidates in the element just before its own. */
    long lastMask(int i, int[] el) {
        int[] cand = ls.candidates(i);
        int e = el[i] - 1;
        long mk = 0;
        for (int k = 0; k < cand.length; k++) {
            if (el[cand[k]] == e) {
                mk |= 1L << k;
            }
        }
        return mk & ~excluded[i];
    }

    /** Whether parent set {@code mk} is allowed for a node with masks (b, t), in the first element or not. */
    public static boolean allowed(long mk, boolean first, long b, long t) {
        return first ? mk == 0 : (mk & ~b) == 0 && (mk & t) != 0;
    }

    /** log Σ exp w_i(U) over U ⊆ b with U ∩ t ≠ ∅ (U = ∅ alone in the first element). */
    double childScore(int i, int element, long b, long t) {
        if (element == 0) {
            return emptyLog[i];
        }
        if (t == 0) {
            return Double.NEGATIVE_INFINITY;
        }
        double[] tab = tables.table(i);
        if (tab != null) {
            double a = tab[(int) b];
            double c = tab[(int) (b & ~t)];
            if (!(c > Double.NEGATIVE_INFINITY)) {
                return a;
            }
            double share = -Math.expm1(c - a);
            if (share > DIRECT_BELOW) {
                return a + Math.log(share);
            }
        }
        return direct(i, b, t);
    }

    private double direct(int i, long b, long t) {
        long[] masks = ls.masks(i);
        double[] w = ls.weights(i);
        double max = Double.NEGATIVE_INFINITY;
        for (int s = 0; s < masks.length; s++) {
            if ((masks[s] & ~b) == 0 && (masks[s] & t) != 0 && w[s] > max) {
                max = w[s];
            }
        }
        if (!(max > Double.NEGATIVE_INFINITY)) {
            return max;
        }
        double sum = 0;
        for (int s = 0; s < masks.length; s++) {
            if ((masks[s] & ~b) == 0 && (masks[s] & t) != 0) {
                sum += Math.exp(w[s] - max);
            }
        }
        return max + Math.log(sum);
    }

    /** log π(Λ) of the partition with {@code element[v]} the (0-based) element of node v. */
    double logScoreOf(int[] element) {
        double sum = 0;
        for (int i = 0; i < element.length; i++) {
            sum += childScore(i, element[i], predMask(i, element), lastMask(i, element));
        }
        return sum;
    }
}
