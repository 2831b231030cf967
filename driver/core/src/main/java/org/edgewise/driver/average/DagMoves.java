package org.edgewise.driver.average;

import java.util.SplittableRandom;

/**
 * The DAG moves of a {@link PartitionChain}: proposals on its DAG G ({@link PartitionDag}), each
 * leaving the structure-modular posterior P(G | D) ∝ Π_i exp w_i(U_i) invariant on its own. A move
 * that returns true has changed G; the chain then makes G's partition its own. Forbidden and
 * required edges are in the allowed sets already; tiers through {@code excluded} (per child, the
 * candidates that must follow it). Memory: none beyond the chain's; confined to its thread.
 */
final class DagMoves {
    private final LocalScores ls;
    private final ChildTables tables;
    private final PartitionChain chain;
    private final long[] excluded;
    private final PartitionDag dag;
    private final SplittableRandom rng;
    private final int n;

    DagMoves(LocalScores ls, ChildTables tables, PartitionChain chain, long[] excluded, PartitionDag dag, SplittableRandom rng) {
        this.ls = ls;
        this.tables = tables;
        this.chain = chain;
        this.excluded = excluded;
        this.dag = dag;
        this.rng = rng;
        this.n = ls.variableCount();
    }

    /**
     * A single-edge Metropolis–Hastings move on the chain's DAG G (Madigan &amp; York 1995's structure
     * MCMC, with Giudici &amp; Castelo 2003's reversal), its partition following: child i and its
     * candidate j drawn uniformly; with probability ½ the edge j → i is added or deleted (symmetric:
     * the reverse toggle draws the same pair), else, when j → i is in G and j may have i as a parent,
     * it is reversed, q(G'|G) = 1/(n·K_i), q(G|G') = 1/(n·K_j), Hastings ratio K_i / K_j. Accepted
     * with min(1, ratio · Π exp w(U') / Π exp w(U)) when G' is acyclic and its changed sets allowed
     * (in-degree, forbidden, required, tiers). The target is P(G | D) under the structure-modular
     * prior, whose image on partitions is π: so the move and the partition moves leave the same joint
     * invariant, and edge moves let the partition change where no partition move has weight (a node
     * whose only parent in the element before it moves away).
     */
    boolean edge(int[] elem) {
        int i = rng.nextInt(n);
        int[] cand = ls.candidates(i);
        if (cand.length == 0) {
            return false;
        }
        int k = rng.nextInt(cand.length);
        int j = cand[k];
        long bit = 1L << k;
        long cur = dag.mask(i);
        double[] wi = ls.weights(i);
        int si;
        int sj = -1;
        double logRatio;
        if (rng.nextBoolean()) {
            long next = cur ^ bit;
            if ((next & excluded[i]) != 0) {
                return false;
            }
            si = dag.setOf(i, next);
            if (si < 0 || (next & bit) != 0 && dag.reaches(i, j, -1, -1, elem)) {
                return false;
            }
            logRatio = wi[si] - wi[dag.set(i)];
        } else {
            if ((cur & bit) == 0) {
                return false;
            }
            int[] cj = ls.candidates(j);
            int ki = indexOf(cj, i);
            if (ki < 0 || (excluded[j] >>> ki & 1) != 0) {
                return false;
            }
            si = dag.setOf(i, cur & ~bit);
            sj = dag.setOf(j, dag.mask(j) | 1L << ki);
            if (si < 0 || sj < 0 || dag.reaches(j, i, j, i, elem)) {
                return false;
            }
            double[] wj = ls.weights(j);
            logRatio = wi[si] - wi[dag.set(i)] + wj[sj] - wj[dag.set(j)] + Math.log(cand.length) - Math.log(cj.length);
        }
        if (logRatio < 0 && Math.log(rng.nextDouble()) >= logRatio) {
            return false;
        }
        dag.setParents(i, si);
        if (sj >= 0) {
            dag.setParents(j, sj);
        }
        return true;
    }

    /**
     * Gibbs update of one child's parent set (heat bath): i drawn uniformly, its new set drawn from
     * all its allowed sets that contain no descendant of i in G, with probability ∝ exp w_i(U) — the
     * full conditional P(U_i | G without i's parents, D) of the structure-modular posterior, so it
     * needs no accept/reject. Cost O(n + edges) for the descendants, O(#sets) for the draw.
     */
    boolean parents() {
        int i = rng.nextInt(n);
        int mark = dag.markDescendants(i);
        long ok = all(i) & ~dag.markedCandidates(i, mark) & ~excluded[i];
        int s = drawWithin(i, ok, 0, logSumWithin(i, ok, 0), rng.nextDouble());
        if (s < 0 || s == dag.set(i)) {
            return false;
        }
        dag.setParents(i, s);
        return true;
    }

    /**
     * The new edge reversal move (Grzegorczyk &amp; Husmeier 2008, "Improving the structure MCMC
     * sampler for Bayesian networks by introducing a new edge reversal move", Machine Learning 71):
     * for the edge j → i (child i and candidate j drawn uniformly, as in {@link #edge}), G0 is
     * G with all parents of i and j removed; j's new set is drawn among its allowed sets that contain
     * i and no descendant of j in G0, ∝ exp w_j, normaliser Z*_j(G0); then i's among its sets with no
     * descendant of i in G0 + that set (G⊕), ∝ exp w_i, normaliser Z_i(G⊕). The reverse move (child
     * j, candidate i) meets the same G0, so with G'⊕ = G0 + i's old set
     * <pre>  A = min(1, (K_i / K_j) · Z*_j(G0) · Z_i(G⊕) / (Z*_i(G0) · Z_j(G'⊕)))</pre>
     * (the posterior ratio cancels against the proposal's weights; K_i / K_j is the ratio of the
     * pair draws, 1/(n·K_j) back over 1/(n·K_i) forth).
     */
    boolean reversal() {
        int i = rng.nextInt(n);
        int[] cand = ls.candidates(i);
        if (cand.length == 0) {
            return false;
        }
        int k = rng.nextInt(cand.length);
        if ((dag.mask(i) >>> k & 1) == 0) {
            return false;
        }
        int j = cand[k];
        int[] cj = ls.candidates(j);
        int ki = indexOf(cj, i);
        if (ki < 0 || (excluded[j] >>> ki & 1) != 0) {
            return false;
        }
        int oldI = dag.set(i);
        int oldJ = dag.set(j);
        dag.setMask(i, 0);
        dag.setMask(j, 0);
        long okJ = all(j) & ~dag.markedCandidates(j, dag.markDescendants(j)) & ~excluded[j];
        double zStarJ = logSumWithin(j, okJ, 1L << ki);
        int newJ = drawWithin(j, okJ, 1L << ki, zStarJ, rng.nextDouble());
        long okI0 = all(i) & ~dag.markedCandidates(i, dag.markDescendants(i)) & ~excluded[i];
        double zStarI = logSumWithin(i, okI0, 1L << k);
        if (newJ < 0) {
            dag.setParents(i, oldI);
            dag.setParents(j, oldJ);
            return false;
        }
        dag.setParents(j, newJ);
        long okI = all(i) & ~dag.markedCandidates(i, dag.markDescendants(i)) & ~excluded[i];
        double zI = logSumWithin(i, okI, 0);
        int newI = drawWithin(i, okI, 0, zI, rng.nextDouble());
        dag.setMask(j, 0);
        dag.setParents(i, oldI);
        long okJ2 = all(j) & ~dag.markedCandidates(j, dag.markDescendants(j)) & ~excluded[j];
        double zJ = logSumWithin(j, okJ2, 0);
        double logA = Math.log(cand.length) - Math.log(cj.length) + zStarJ + zI - zStarI - zJ;
        if (newI < 0 || logA < 0 && Math.log(rng.nextDouble()) >= logA) {
            dag.setParents(j, oldJ);
            return false;
        }
        dag.setParents(i, newI);
        dag.setParents(j, newJ);
        return true;
    }

    /** Every candidate of child i, as a mask. */
    private long all(int i) {
        int k = ls.candidates(i).length;
        return k == 64 ? -1L : (1L << k) - 1;
    }

    /** log Σ exp w_i(U) over the allowed U ⊆ b (t = 0), or U ⊆ b meeting t. */
    private double logSumWithin(int i, long b, long t) {
        if (t != 0) {
            return chain.childScore(i, 1, b, t);
        }
        double[] tab = tables.table(i);
        if (tab != null) {
            return tab[(int) b];
        }
        long[] masks = ls.masks(i);
        double[] w = ls.weights(i);
        double max = Double.NEGATIVE_INFINITY;
        for (int s = 0; s < masks.length; s++) {
            if ((masks[s] & ~b) == 0) {
                max = Math.max(max, w[s]);
            }
        }
        if (!(max > Double.NEGATIVE_INFINITY)) {
            return max;
        }
        double sum = 0;
        for (int s = 0; s < masks.length; s++) {
            if ((masks[s] & ~b) == 0) {
                sum += Math.exp(w[s] - max);
            }
        }
        return max + Math.log(sum);
    }

    /** A set U ⊆ b (meeting t unless t = 0) drawn ∝ exp w_i(U) by inversion of u, given log normaliser z; −1 if none. */
    private int drawWithin(int i, long b, long t, double z, double u) {
        if (!(z > Double.NEGATIVE_INFINITY)) {
            return -1;
        }
        long[] masks = ls.masks(i);
        double[] w = ls.weights(i);
        double acc = 0;
        int chosen = -1;
        for (int s = 0; s < masks.length; s++) {
            if ((masks[s] & ~b) == 0 && (t == 0 || (masks[s] & t) != 0)) {
                chosen = s;
                acc += Math.exp(w[s] - z);
                if (u < acc) {
                    break;
                }
            }
        }
        return chosen;
    }

    private static int indexOf(int[] a, int x) {
        for (int k = 0; k < a.length; k++) {
            if (a[k] == x) {
                return k;
            }
        }
        return -1;
    }
}
