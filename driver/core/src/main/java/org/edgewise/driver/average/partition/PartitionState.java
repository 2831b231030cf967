package org.edgewise.driver.average.partition;

import java.util.SplittableRandom;
import org.edgewise.driver.average.LocalScores;

/**
 * The ordered partition Λ of a {@link PartitionChain} with its bookkeeping — element and size of
 * every element, each node's masks (B, T) and score ({@link PartitionScores}), log π(Λ) — and the
 * partition proposals of Kuipers &amp; Moffa (2017, sec. 4): a proposal Λ' is written to scratch
 * arrays, {@link #rescore rescored} for the nodes whose masks change, and {@link #commit committed}
 * or dropped.
 *
 * <ul>
 *   <li>split / join: the neighbours of Λ are every split of an element T_j into (A, T_j ∖ A), A a
 *       non-empty proper subset placed first, and every join of adjacent T_j, T_{j+1}; there are
 *       N(Λ) = Σ_j (2^{|T_j|} − 2) + (m − 1) of them, one proposed uniformly (sec. 4.1);</li>
 *   <li>swap: two nodes in different elements exchange them, the pair uniform among such pairs,
 *       whose number the swap does not change: symmetric (sec. 4.2).</li>
 * </ul>
 *
 * <p>Memory: 2 int arrays of n and 2 of n + 1 for Λ and Λ', 1 int and 6 long/double arrays of n for
 * the masks, scores and the changed nodes. Mutable, confined to its chain's thread.
 */
final class PartitionState {
    private final LocalScores ls;
    private final PartitionScores scores;
    private final int n;

    private int m;
    private int[] elem;
    private int[] size;
    private final long[] pred;
    private final long[] last;
    private final double[] logSum;
    private double score;
    // proposal scratch
    private int newM;
    private int[] newElem;
    private int[] newSize;
    private final int[] chChild;
    private final long[] chPred;
    private final long[] chLast;
    private final double[] chLog;
    private int chCount;
    /** Per node x, the children that have x as a candidate: {@code candidateOf[ofStart[x] … ofStart[x+1])}. */
    private final int[] ofStart;
    private final int[] candidateOf;
    /** {@link #followDag} scratch: the nodes whose layer moved, and a mark per node looked at. */
    private final int[] moved;
    private final int[] seenMark;
    private int seenStamp;

    PartitionState(LocalScores ls, PartitionScores scores) {
        this.ls = ls;
        this.scores = scores;
        this.n = ls.variableCount();
        elem = new int[n];
        size = new int[n + 1];
        newElem = new int[n];
        newSize = new int[n + 1];
        pred = new long[n];
        last = new long[n];
        logSum = new double[n];
        chChild = new int[n];
        chPred = new long[n];
        chLast = new long[n];
        chLog = new double[n];
        ofStart = new int[n + 1];
        for (int i = 0; i < n; i++) {
            for (int x : ls.candidates(i)) {
                ofStart[x + 1]++;
            }
        }
        for (int x = 0; x < n; x++) {
            ofStart[x + 1] += ofStart[x];
        }
        candidateOf = new int[ofStart[n]];
        int[] fill = ofStart.clone();
        for (int i = 0; i < n; i++) {
            for (int x : ls.candidates(i)) {
                candidateOf[fill[x]++] = i;
            }
        }
        moved = new int[n];
        seenMark = new int[n];
    }

    /** Makes the partition with {@code element[v]} the element of node v the state; returns log π(Λ). */
    double start(int[] element) {
        m = 0;
        for (int v = 0; v < n; v++) {
            elem[v] = element[v];
            m = Math.max(m, element[v] + 1);
            size[elem[v]]++;
        }
        score = 0;
        for (int i = 0; i < n; i++) {
            pred[i] = scores.predMask(i, elem);
            last[i] = scores.lastMask(i, elem);
            logSum[i] = scores.childScore(i, elem[i], pred[i], last[i]);
            score += logSum[i];
        }
        return score;
    }

    /** Current log π(Λ). */
    double score() {
        return score;
    }

    /** The number of elements. */
    int elementCount() {
        return m;
    }

    /** The element of every node (the state's own array: read only). */
    int[] elements() {
        return elem;
    }

    /** The nodes whose masks the last committed proposal changed: how many, and the k-th. */
    int changedCount() {
        return chCount;
    }

    int changed(int k) {
        return chChild[k];
    }

    /** Proposes the partition of {@code dag} (its layering). */
    void proposeLayers(PartitionDag dag) {
        newM = dag.layers(newElem);
        java.util.Arrays.fill(newSize, 0);
        for (int v = 0; v < n; v++) {
            newSize[newElem[v]]++;
        }
    }

    /**
     * Proposes the partition of {@code dag} after DAG moves that changed the masks it marked dirty
     * (Λ the partition of the DAG before them) and rescores it: the same proposal, masks, scores and
     * ratio as {@link #proposeLayers} then {@link #rescore} (the sum of the ratio's terms taken in
     * another order), but only the nodes whose layer moved and the children that have one of them as
     * a candidate are looked at — O(moved · (n/64 + K)) instead of O(n·K). Returns log π(Λ') − log π(Λ).
     */
    double followDag(PartitionDag dag) {
        System.arraycopy(elem, 0, newElem, 0, n);
        int count = dag.relayer(newElem, moved);
        java.util.Arrays.fill(newSize, 0);
        newM = 0;
        for (int v = 0; v < n; v++) {
            newSize[newElem[v]]++;
            newM = Math.max(newM, newElem[v] + 1);
        }
        chCount = 0;
        seenStamp++;
        double delta = 0;
        for (int k = 0; k < count; k++) {
            int x = moved[k];
            double d = rescoreNode(x);
            delta += d;
            for (int q = ofStart[x]; q < ofStart[x + 1] && d > Double.NEGATIVE_INFINITY; q++) {
                d = rescoreNode(candidateOf[q]);
                delta += d;
            }
            if (!(d > Double.NEGATIVE_INFINITY)) {
                return Double.NEGATIVE_INFINITY;
            }
        }
        return delta;
    }

    /** Node i's masks and score under the proposal when they change, once per {@link #followDag}; its score's change. */
    private double rescoreNode(int i) {
        if (seenMark[i] == seenStamp) {
            return 0;
        }
        seenMark[i] = seenStamp;
        return stage(i);
    }

    /**
     * Node i's masks under the proposal; when they differ from the current ones, its new score is
     * staged for {@link #commit} and its change returned (0 when unchanged, −∞ when no allowed set).
     */
    private double stage(int i) {
        long b = scores.predMask(i, newElem);
        long t = scores.lastMask(i, newElem);
        boolean first = newElem[i] == 0;
        if (b == pred[i] && t == last[i] && first == (elem[i] == 0)) {
            return 0;
        }
        double l = scores.childScore(i, newElem[i], b, t);
        if (!(l > Double.NEGATIVE_INFINITY)) {
            return Double.NEGATIVE_INFINITY;
        }
        chChild[chCount] = i;
        chPred[chCount] = b;
        chLast[chCount] = t;
        chLog[chCount] = l;
        chCount++;
        return l - logSum[i];
    }

    /** Makes the proposal (rescored, {@code delta}) the state. */
    void commit(double delta) {
        int[] t = elem;
        elem = newElem;
        newElem = t;
        t = size;
        size = newSize;
        newSize = t;
        m = newM;
        for (int k = 0; k < chCount; k++) {
            int v = chChild[k];
            pred[v] = chPred[k];
            last[v] = chLast[k];
            logSum[v] = chLog[k];
        }
        score += delta;
    }

    private static double neighbours(int[] sz, int mm) {
        double s = mm - 1;
        for (int j = 0; j < mm; j++) {
            s += Math.pow(2, sz[j]) - 2;
        }
        return s;
    }

    /** Proposes a uniformly drawn split or join; returns log N(Λ) − log N(Λ'). */
    double proposeSplitJoin(SplittableRandom rng) {
        double total = neighbours(size, m);
        double r = rng.nextDouble() * total;
        int split = -1;
        for (int j = 0; j < m; j++) {
            double c = Math.pow(2, size[j]) - 2;
            if (r < c) {
                split = j;
                break;
            }
            r -= c;
        }
        System.arraycopy(size, 0, newSize, 0, m + 1);
        if (split >= 0) {
            int j = split;
            // a uniform non-empty proper subset A of T_j: fair coins, redrawn when empty or full
            int inA;
            do {
                inA = 0;
                for (int v = 0; v < n; v++) {
                    if (elem[v] == j) {
                        boolean a = rng.nextBoolean();
                        newElem[v] = a ? j : j + 1;
                        inA += a ? 1 : 0;
                    } else {
                        newElem[v] = elem[v] > j ? elem[v] + 1 : elem[v];
                    }
                }
            } while (inA == 0 || inA == size[j]);
            for (int k = m; k > j + 1; k--) {
                newSize[k] = size[k - 1];
            }
            newSize[j] = inA;
            newSize[j + 1] = size[j] - inA;
            newM = m + 1;
        } else {
            int j = Math.min(m - 2, (int) r);
            for (int v = 0; v < n; v++) {
                newElem[v] = elem[v] > j ? elem[v] - 1 : elem[v];
            }
            newSize[j] = size[j] + size[j + 1];
            for (int k = j + 1; k < m - 1; k++) {
                newSize[k] = size[k + 1];
            }
            newSize[m - 1] = 0;
            newM = m - 1;
        }
        return Math.log(total) - Math.log(neighbours(newSize, newM));
    }

    /** Proposes that two nodes in different elements exchange them (symmetric: returns 0). Needs m ≥ 2. */
    double proposeSwap(SplittableRandom rng) {
        int v;
        int w;
        do {
            v = rng.nextInt(n);
            w = rng.nextInt(n);
        } while (elem[v] == elem[w]);
        System.arraycopy(elem, 0, newElem, 0, n);
        System.arraycopy(size, 0, newSize, 0, m + 1);
        newElem[v] = elem[w];
        newElem[w] = elem[v];
        newM = m;
        return 0;
    }

    /** Masks and scores of the nodes whose masks change under the proposal; returns log π(Λ') − log π(Λ). */
    double rescore() {
        chCount = 0;
        double delta = 0;
        for (int i = 0; i < n; i++) {
            double d = stage(i);
            if (!(d > Double.NEGATIVE_INFINITY)) {
                return Double.NEGATIVE_INFINITY;
            }
            delta += d;
        }
        return delta;
    }

    /** Child v's parent set drawn among those allowed in Λ, by weight (inversion of u). */
    int drawAllowed(int v, double u) {
        long[] masks = ls.masks(v);
        double[] w = ls.weights(v);
        boolean first = elem[v] == 0;
        double acc = 0;
        int chosen = -1;
        for (int s = 0; s < masks.length; s++) {
            if (PartitionScores.allowed(masks[s], first, pred[v], last[v])) {
                chosen = s;
                acc += Math.exp(w[s] - logSum[v]);
                if (u < acc) {
                    break;
                }
            }
        }
        return chosen;
    }

    /**
     * Child i's allowed sets in Λ: adds each one's weight share P(U | Λ, D) to {@code row[off + k]} for
     * every candidate k in it (the Rao-Blackwellised edge estimates) and returns one set drawn by
     * weight (inversion of u; the last allowed one when rounding leaves u ≥ the total).
     */
    int tallyAndDraw(int i, double u, float[] row, int off) {
        long[] masks = ls.masks(i);
        double[] w = ls.weights(i);
        double z = logSum[i];
        long b = pred[i];
        long t = last[i];
        boolean first = elem[i] == 0;
        double acc = 0;
        int chosen = -1;
        for (int s = 0; s < masks.length; s++) {
            long mk = masks[s];
            if (!PartitionScores.allowed(mk, first, b, t)) {
                continue;
            }
            double p = Math.exp(w[s] - z);
            acc += p;
            if (chosen < 0 && u < acc) {
                chosen = s;
            }
            for (long r = mk; r != 0; r &= r - 1) {
                row[off + Long.numberOfTrailingZeros(r)] += (float) p;
            }
            if (chosen < 0) {
                chosen = -2 - s; // last allowed so far, in case rounding leaves u ≥ acc
            }
        }
        return chosen >= 0 ? chosen : -2 - chosen;
    }

    /** The nodes by element (a linear extension of every DAG of Λ). */
    int[] linearExtension() {
        int[] start = new int[m + 1];
        for (int v = 0; v < n; v++) {
            start[elem[v] + 1]++;
        }
        for (int j = 0; j < m; j++) {
            start[j + 1] += start[j];
        }
        int[] order = new int[n];
        for (int v = 0; v < n; v++) {
            order[start[elem[v]]++] = v;
        }
        return order;
    }
}
