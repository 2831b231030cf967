package org.edgewise.driver.average;

import java.util.Arrays;

/**
 * Parent sets that the samplers (partition MCMC, order MCMC) may leave out with a stated bound on what that costs:
 * a set U of child i is <em>dominated</em> when some allowed proper subset U' ⊊ U weighs at least
 * {@code margin} nats more, w_i(U') ≥ w_i(U) + margin (w = log score + log prior). On a table with
 * many rows almost every set is: an irrelevant parent costs about (r − 1)·q/2 · log N nats of BDeu
 * penalty (on a random network's 40 × 100,000 table, d = 3, no candidate limit, 3,914 of 396,800
 * sets are left at margin 40), and every sum, draw and bucket of the partition sampler runs over the
 * sets left, so a step costs that much less.
 *
 * <p><b>The bound</b> (our derivation). Replacing U_i = U by its dominating subset U' in a DAG G
 * gives a DAG G' (a subset of its edges: still acyclic, still allowed by forbidden / required edges
 * since U' is an allowed set, and by the tiers) with P(G' | D) ≥ e^margin · P(G | D) under the
 * structure-modular prior, P(G | D) ∝ Π_j exp w_j(U_j). The map G ↦ G' is at most #sets_i to one (G
 * is G' with U_i put back), so the posterior mass of the DAGs in which child i has a dominated set is
 * at most #sets_i · e^−margin, and of the DAGs in which any child has one at most
 * <pre>  ε = e^−margin · Σ_i #sets_i</pre>
 * The posterior restricted to the other DAGs — the target of a chain run on the {@link #keep kept}
 * sets — is then within total variation ε of the full one, so every edge, feature or parent-set
 * posterior moves by at most ε (1.7·10⁻¹² for the table above at margin 40, far below any MCSE).
 * The empty set has no proper subset and is never dropped.
 *
 * <p>The same bound holds for the order-modular posterior: (≺, G) ↦ (≺, G') keeps the order
 * consistent and is at most #sets_i to one, and P(≺, G | D) ∝ Π_j exp w_j(U_j). Tempered rungs
 * ({@code TemperedOrderChain}) run on the kept sets too; exchanges leave each rung's target
 * invariant, so the reported (β = 1) chain's target is the restricted posterior, within ε.
 */
public final class DominatedSets {
    /**
     * The margin the sampler uses: e^−40 ≈ 4.2·10⁻¹⁸, so ε stays below 10⁻¹⁰ up to 2·10⁷ allowed
     * sets in all (n = 500 with 40,000 sets per child).
     */
    public static final double MARGIN = 40;

    private DominatedSets() {
    }

    /**
     * Per child, the ascending indices of its sets that are not dominated at {@code margin}; null for
     * a child that keeps every set. Cost O(Σ_i #sets_i · 2^d · log #sets_i) (each proper subset of a
     * set looked up in the child's sorted masks).
     */
    public static int[][] keep(LocalScores ls, double margin) {
        int n = ls.variableCount();
        int[][] keep = new int[n][];
        for (int i = 0; i < n; i++) {
            long[] masks = ls.masks(i);
            double[] w = ls.weights(i);
            int k = masks.length;
            long[] sorted = new long[k];
            int[] at = new int[k];
            long[] order = new long[k];
            for (int s = 0; s < k; s++) {
                order[s] = s;
            }
            sortByMask(masks, order);
            for (int j = 0; j < k; j++) {
                at[j] = (int) order[j];
                sorted[j] = masks[at[j]];
            }
            int[] kept = new int[k];
            int count = 0;
            for (int s = 0; s < k; s++) {
                if (!dominated(masks[s], w[s], w, sorted, at, margin)) {
                    kept[count++] = s;
                }
            }
            keep[i] = count == k ? null : Arrays.copyOf(kept, count);
        }
        return keep;
    }

    /** Whether a proper subset of {@code mk} among the sorted masks weighs at least {@code ws + margin}. */
    private static boolean dominated(long mk, double ws, double[] w, long[] sorted, int[] at, double margin) {
        if (mk == 0) {
            return false;
        }
        for (long sub = (mk - 1) & mk; ; sub = (sub - 1) & mk) {
            int j = Arrays.binarySearch(sorted, sub);
            if (j >= 0 && w[at[j]] >= ws + margin) {
                return true;
            }
            if (sub == 0) {
                return false;
            }
        }
    }

    /** Sorts the indices in {@code idx} by {@code masks[idx]} (masks are distinct within a child). */
    private static void sortByMask(long[] masks, long[] idx) {
        // signed order, as Arrays.binarySearch uses (a mask over 64 candidates may be negative)
        long[] key = new long[idx.length];
        for (int j = 0; j < idx.length; j++) {
            key[j] = masks[(int) idx[j]];
        }
        mergeSort(key, idx, new long[idx.length], new long[idx.length], 0, idx.length);
    }

    private static void mergeSort(long[] key, long[] val, long[] tk, long[] tv, int lo, int hi) {
        if (hi - lo < 2) {
            return;
        }
        int mid = (lo + hi) >>> 1;
        mergeSort(key, val, tk, tv, lo, mid);
        mergeSort(key, val, tk, tv, mid, hi);
        int a = lo;
        int b = mid;
        for (int o = lo; o < hi; o++) {
            if (b >= hi || (a < mid && key[a] <= key[b])) {
                tk[o] = key[a];
                tv[o] = val[a++];
            } else {
                tk[o] = key[b];
                tv[o] = val[b++];
            }
        }
        System.arraycopy(tk, lo, key, lo, hi - lo);
        System.arraycopy(tv, lo, val, lo, hi - lo);
    }

    /** ε = e^−margin · Σ_i #sets_i when some set is dropped, else 0 (see the class comment). */
    public static double massBound(LocalScores ls, int[][] keep, double margin) {
        long sets = 0;
        boolean dropped = false;
        for (int i = 0; i < ls.variableCount(); i++) {
            sets += ls.setCount(i);
            dropped |= keep[i] != null;
        }
        return dropped ? Math.exp(-margin) * sets : 0;
    }
}
