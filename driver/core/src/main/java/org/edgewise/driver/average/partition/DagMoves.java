package org.edgewise.driver.average.partition;

import java.util.SplittableRandom;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;

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
    private final PartitionScores scores;
    private final long[] excluded;
    private final PartitionDag dag;
    private final SplittableRandom rng;
    private final int n;
    /** Block move scratch: the block, each node's position in it (−1 outside), reach bits, bucket sums. */
    private final int[] block = new int[BLOCK];
    private final int[] inBlock;
    private final int[] reach;
    private final long[] savedMask = new long[BLOCK];
    private final int[] savedSet = new int[BLOCK];
    private final double[][] bucket = new double[BLOCK][1 << BLOCK];
    private final double[] dagLog = new double[DAGS[BLOCK].length];
    private final double[] dagWeight = new double[DAGS[BLOCK].length];
    private final double[] bucketSum = new double[1 << BLOCK];
    private final int[][] effective = new int[BLOCK][16];

    /** Per child, the positions of its {@value #BLOCK} − 1 strongest candidates ({@link #strongest(LocalScores, int)}). */
    private final int[][] strongest;
    /**
     * The share of block moves whose block is v and its strongest candidates rather than uniformly
     * drawn ones (0: every block uniform, the former move, with the same random stream).
     */
    double strongShare = STRONG_SHARE;
    /** Whether the block move's draw of a DAG takes each weight's exp twice, as it did (tests, benchmarks: the same draws). */
    boolean expTwice;
    /** Default {@link #strongShare}. */
    static final double STRONG_SHARE = 0;

    /** Largest block of the block move. */
    static final int BLOCK = 4;
    /** A set whose weight is below its bucket's largest by more than this (e^−40 ≈ 4·10⁻¹⁸) adds nothing a double holds. */
    static final double NEGLIGIBLE = -40;
    /** Every DAG on m = 0…{@value #BLOCK} nodes, as parent bitmasks per node (1, 1, 3, 25, 543 of them; OEIS A003024). */
    static final int[][][] DAGS = new int[BLOCK + 1][][];

    static {
        for (int m = 0; m <= BLOCK; m++) {
            java.util.List<int[]> out = new java.util.ArrayList<>();
            enumerate(m, 0, new int[m], out);
            DAGS[m] = out.toArray(new int[0][]);
        }
    }

    private static void enumerate(int m, int v, int[] pa, java.util.List<int[]> out) {
        if (v == m) {
            int removed = 0;
            for (boolean progress = true; progress; ) {
                progress = false;
                for (int x = 0; x < m; x++) {
                    if ((removed >> x & 1) == 0 && (pa[x] & ~removed) == 0) {
                        removed |= 1 << x;
                        progress = true;
                    }
                }
            }
            if (removed == (1 << m) - 1) {
                out.add(pa.clone());
            }
            return;
        }
        for (int mk = 0; mk < 1 << m; mk++) {
            if ((mk >> v & 1) == 0) {
                pa[v] = mk;
                enumerate(m, v + 1, pa, out);
            }
        }
    }

    DagMoves(LocalScores ls, ChildTables tables, PartitionScores scores, PartitionDag dag, SplittableRandom rng) {
        this.ls = ls;
        this.tables = tables;
        this.scores = scores;
        this.excluded = scores.excluded();
        this.dag = dag;
        this.rng = rng;
        this.n = ls.variableCount();
        inBlock = new int[n];
        java.util.Arrays.fill(inBlock, -1);
        reach = new int[n];
        strongest = new int[n][];
        for (int v = 0; v < n; v++) {
            strongest[v] = strongest(ls, v);
        }
    }

    /**
     * Child v's candidates by the weight of the single-parent set {x} (−∞ when {x} is not an allowed
     * set: on the non-dominated sets, when the empty set dominates it), strongest first, as positions
     * in its candidate list; the first {@value #BLOCK} − 1 of them. Fixed by the scores alone.
     */
    private static int[] strongest(LocalScores ls, int v) {
        int k = ls.candidates(v).length;
        double[] single = new double[k];
        java.util.Arrays.fill(single, Double.NEGATIVE_INFINITY);
        long[] masks = ls.masks(v);
        for (int s = 0; s < masks.length; s++) {
            if (Long.bitCount(masks[s]) == 1) {
                single[Long.numberOfTrailingZeros(masks[s])] = ls.weights(v)[s];
            }
        }
        Integer[] pos = new Integer[k];
        for (int x = 0; x < k; x++) {
            pos[x] = x;
        }
        java.util.Arrays.sort(pos, (a, b) -> Double.compare(single[b], single[a]));
        int[] out = new int[Math.min(BLOCK - 1, k)];
        for (int x = 0; x < out.length; x++) {
            out[x] = pos[x];
        }
        return out;
    }

    /**
     * A block Gibbs move: the parent sets of up to {@value #BLOCK} nodes drawn jointly from their full
     * conditional P(U_S | G without S's parents, D). The block S is v (uniform) and up to three of
     * its candidates: with probability {@link #strongShare} its three strongest (by the weight of the
     * single-parent set, fixed by the scores: a group of strongly dependent neighbours, whose
     * directions mix slowest, is then proposed as one block), else three drawn uniformly without
     * replacement — chosen without looking at G either way, so the draw is a heat-bath step on S
     * and needs no accept/reject (a mixture of such steps leaves the posterior invariant too). With S's parents removed (G₋S), u ⇝ x in G₋S
     * never passes through another block node, and a new G is acyclic iff the "effective" graph on
     * S is: u → w when u ∈ U_w, or when some parent x ∈ U_w outside S is reachable from u in G₋S.
     * So each block node's allowed sets are bucketed by their effective parent set E ⊆ S (sets
     * whose E holds w itself would close a cycle and are dropped), every DAG H on S is weighted by
     * Π_w Σ_{U: E(U) = pa_H(w)} exp w_w(U) (our construction: the order-free structure-modular
     * conditional, enumerated — 543 DAGs for four nodes), H is drawn by weight and each U_w from
     * its bucket. It reorients a strongly dependent group (a triangle: all its orientations are
     * equally likely, and single-edge moves must pass through far worse DAGs to turn it) in one
     * step. Cost O(|S|·(n + edges) + Σ_{w∈S} #sets_w + 543·4).
     */
    boolean block() {
        int v = rng.nextInt(n);
        int[] cand = ls.candidates(v);
        int m = 1 + Math.min(BLOCK - 1, cand.length);
        block[0] = v;
        boolean strong = strongShare > 0 && rng.nextDouble() < strongShare;
        for (int p = 1; p < m; p++) {
            int x;
            if (strong) {
                x = cand[strongest[v][p - 1]];
            } else {
                do {
                    x = cand[rng.nextInt(cand.length)];
                } while (inBlock[x] >= 0 || x == v);
            }
            block[p] = x;
            inBlock[x] = p;
        }
        inBlock[v] = 0;
        for (int p = 0; p < m; p++) {
            savedMask[p] = dag.mask(block[p]);
            savedSet[p] = dag.set(block[p]);
            dag.setMask(block[p], 0);
        }
        dag.reachFrom(block, m, reach);
        for (int p = 0; p < m; p++) {
            fillBuckets(p, m);
        }
        int[][] dags = DAGS[m];
        double max = Double.NEGATIVE_INFINITY;
        for (int h = 0; h < dags.length; h++) {
            double lw = 0;
            for (int p = 0; p < m; p++) {
                lw += bucket[p][dags[h][p]];
            }
            dagLog[h] = lw;
            max = Math.max(max, lw);
        }
        int chosen = drawIndex(dagLog, dags.length, max);
        boolean changed = false;
        for (int p = 0; p < m; p++) {
            int w = block[p];
            int s = chosen < 0 ? -1 : drawFromBucket(p, dags[chosen][p], rng.nextDouble());
            if (s < 0) {
                throw new IllegalStateException("block move: no parent set for " + w + " although its current one is allowed");
            }
            dag.setParents(w, s);
            changed |= s != savedSet[p];
        }
        for (int p = 0; p < m; p++) {
            inBlock[block[p]] = -1;
        }
        return changed;
    }

    /**
     * bucket[p][E] = log Σ exp w over block node p's allowed sets with effective parent set E (−∞ if
     * none); each set's E is kept in {@code effective[p]} (−1: dropped) for the draw.
     */
    private void fillBuckets(int p, int m) {
        int w = block[p];
        double[] b = bucket[p];
        long[] masks = ls.masks(w);
        double[] wt = ls.weights(w);
        int[] cand = ls.candidates(w);
        if (effective[p].length < masks.length) {
            effective[p] = new int[masks.length];
        }
        int[] eff = effective[p];
        java.util.Arrays.fill(b, 0, 1 << m, Double.NEGATIVE_INFINITY);
        for (int s = 0; s < masks.length; s++) {
            int e = -1;
            if ((masks[s] & excluded[w]) == 0) {
                e = 0;
                for (long r = masks[s]; r != 0; r &= r - 1) {
                    int x = cand[Long.numberOfTrailingZeros(r)];
                    e |= inBlock[x] >= 0 ? 1 << inBlock[x] : reach[x];
                }
                if ((e >> p & 1) != 0) {
                    e = -1;
                } else if (wt[s] > b[e]) {
                    b[e] = wt[s];
                }
            }
            eff[s] = e;
        }
        double[] sum = bucketSum;
        java.util.Arrays.fill(sum, 0, 1 << m, 0.0);
        for (int s = 0; s < masks.length; s++) {
            if (eff[s] >= 0) {
                double d = wt[s] - b[eff[s]];
                if (d > NEGLIGIBLE) {
                    sum[eff[s]] += Math.exp(d);
                }
            }
        }
        for (int e = 0; e < 1 << m; e++) {
            if (b[e] > Double.NEGATIVE_INFINITY) {
                b[e] += Math.log(sum[e]);
            }
        }
    }

    /** A set of block node p with effective parent set e, drawn ∝ exp w by inversion of u. */
    private int drawFromBucket(int p, int e, double u) {
        int w = block[p];
        double[] wt = ls.weights(w);
        int[] eff = effective[p];
        double z = bucket[p][e];
        double acc = 0;
        int last = -1;
        for (int s = 0; s < ls.setCount(w); s++) {
            if (eff[s] != e) {
                continue;
            }
            last = s;
            double d = wt[s] - z;
            if (d > NEGLIGIBLE) {
                acc += Math.exp(d);
            }
            if (u < acc) {
                break;
            }
        }
        return last;
    }

    /** An index drawn with probability ∝ exp(logW[k] − max); −1 if every weight is 0. */
    private int drawIndex(double[] logW, int count, double max) {
        if (!(max > Double.NEGATIVE_INFINITY)) {
            return -1;
        }
        if (expTwice) {
            return drawIndexExpTwice(logW, count, max);
        }
        // each weight's exp once (kept for the inversion: the same numbers as taking it twice)
        double[] e = dagWeight;
        double total = 0;
        for (int k = 0; k < count; k++) {
            double x = logW[k] > Double.NEGATIVE_INFINITY ? Math.exp(logW[k] - max) : 0;
            e[k] = x;
            total += x;
        }
        double u = rng.nextDouble() * total;
        int last = -1;
        for (int k = 0; k < count; k++) {
            if (logW[k] > Double.NEGATIVE_INFINITY) {
                last = k;
                u -= e[k];
                if (u < 0) {
                    break;
                }
            }
        }
        return last;
    }

    /**
     * A single-edge Metropolis–Hastings move on G (Madigan &amp; York 1995's structure MCMC, with
     * Giudici &amp; Castelo 2003's reversal). With probability ½ a toggle: child i and its candidate j
     * drawn uniformly, the edge j → i added or deleted (symmetric: the reverse toggle draws the same
     * pair); else a reversal: an edge j → i of G drawn uniformly ({@link PartitionDag#randomEdge}),
     * turned into i → j when j may have i as a parent — G' has as many edges, so q(G'|G) = q(G|G') =
     * 1/|E|. Accepted with min(1, Π exp w(U') / Π exp w(U)) when G' is acyclic and its changed sets
     * allowed (in-degree, forbidden, required, tiers). Drawing the edge to reverse among G's edges
     * rather than among all candidate pairs proposes each reversal about n·K/|E| ≈ 10 times as often
     * (measured: the direction of a Markov-equivalent pair is what mixes slowest).
     */
    boolean edge(int[] elem) {
        int i;
        int k;
        boolean toggle = rng.nextBoolean();
        if (toggle) {
            i = rng.nextInt(n);
            if (ls.candidates(i).length == 0) {
                return false;
            }
            k = rng.nextInt(ls.candidates(i).length);
        } else {
            long e = dag.randomEdge(rng);
            if (e < 0) {
                return false;
            }
            i = (int) (e >>> 32);
            k = (int) e;
        }
        int[] cand = ls.candidates(i);
        int j = cand[k];
        long bit = 1L << k;
        long cur = dag.mask(i);
        double[] wi = ls.weights(i);
        int si;
        int sj = -1;
        double logRatio;
        if (toggle) {
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
            logRatio = wi[si] - wi[dag.set(i)] + wj[sj] - wj[dag.set(j)];
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
     * for an edge j → i drawn uniformly among G's edges ({@link PartitionDag#randomEdge}), G0 is
     * G with all parents of i and j removed; j's new set is drawn among its allowed sets that contain
     * i and no descendant of j in G0, ∝ exp w_j, normaliser Z*_j(G0); then i's among its sets with no
     * descendant of i in G0 + that set (G⊕), ∝ exp w_i, normaliser Z_i(G⊕). The reverse move (child
     * j, candidate i) meets the same G0, so with G'⊕ = G0 + i's old set
     * <pre>  A = min(1, (|E| / |E'|) · Z*_j(G0) · Z_i(G⊕) / (Z*_i(G0) · Z_j(G'⊕)))</pre>
     * (the posterior ratio cancels against the proposal's weights; |E| / |E'| is the ratio of the
     * edge draws, 1/|E'| back over 1/|E| forth — Grzegorczyk &amp; Husmeier's own form).
     */
    boolean reversal() {
        long edge = dag.randomEdge(rng);
        if (edge < 0) {
            return false;
        }
        int i = (int) (edge >>> 32);
        int k = (int) edge;
        int[] cand = ls.candidates(i);
        int j = cand[k];
        int[] cj = ls.candidates(j);
        int ki = indexOf(cj, i);
        if (ki < 0 || (excluded[j] >>> ki & 1) != 0) {
            return false;
        }
        int edgesBefore = dag.edgeCount();
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
        if (newI < 0) {
            dag.setParents(j, oldJ);
            return false;
        }
        int edgesAfter = edgesBefore - Long.bitCount(ls.masks(i)[oldI]) - Long.bitCount(ls.masks(j)[oldJ])
                + Long.bitCount(ls.masks(i)[newI]) + Long.bitCount(ls.masks(j)[newJ]);
        double logA = Math.log(edgesBefore) - Math.log(edgesAfter) + zStarJ + zI - zStarI - zJ;
        if (logA < 0 && Math.log(rng.nextDouble()) >= logA) {
            dag.setParents(j, oldJ);
            return false;
        }
        dag.setParents(i, newI);
        dag.setParents(j, newJ);
        return true;
    }

    /** The former {@link #drawIndex}: each exp taken twice (benchmarks side by side; the same draws). */
    private int drawIndexExpTwice(double[] logW, int count, double max) {
        double total = 0;
        for (int k = 0; k < count; k++) {
            total += Math.exp(logW[k] - max);
        }
        double u = rng.nextDouble() * total;
        int last = -1;
        for (int k = 0; k < count; k++) {
            if (logW[k] > Double.NEGATIVE_INFINITY) {
                last = k;
                u -= Math.exp(logW[k] - max);
                if (u < 0) {
                    break;
                }
            }
        }
        return last;
    }

    /** Every candidate of child i, as a mask. */
    private long all(int i) {
        int k = ls.candidates(i).length;
        return k == 64 ? -1L : (1L << k) - 1;
    }

    /** log Σ exp w_i(U) over the allowed U ⊆ b (t = 0), or U ⊆ b meeting t. */
    private double logSumWithin(int i, long b, long t) {
        if (t != 0) {
            return scores.childScore(i, 1, b, t);
        }
        double[] tab = tables.table(i);
        return tab != null ? tab[(int) b] : LogSum.ofSubsets(ls.masks(i), ls.weights(i), b);
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
