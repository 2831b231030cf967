package org.edgewise.driver.average;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.UserError;

/**
 * One order-MCMC chain (Friedman &amp; Koller 2003): Metropolis–Hastings on variable orders with a
 * symmetric proposal — half the steps swap two adjacent positions, half swap two positions
 * chosen uniformly — and target π(≺) ∝ exp(Σ_i log α_i(pred_≺(i))), the order-modular
 * evidence (the uniform order prior over the allowed orders cancels). A proposal that breaks an
 * order constraint has π = 0 and is rejected. Only the variables whose candidate-predecessor
 * mask changes are rescored: the two swapped ones and those between them that have one of
 * the two among their candidates.
 *
 * <p>Every {@code thin} steps after burn-in a draw is stored: the Rao-Blackwellised edge
 * posteriors given the current order (a double per candidate edge), the order's log evidence,
 * the order itself, and — when features are asked — the ancestor and Markov-blanket indicators
 * of one DAG sampled from the parent-set weights given the order.
 *
 * <p>Memory per chain: O(n) state, 8 bytes per candidate edge per draw, 4n per draw for orders,
 * n²/32 bytes per draw for features, and a direct-mapped cache of 4096 entries (16 bytes each)
 * per non-tabulated child. Mutable, confined to one thread at a time.
 */
final class OrderChain {
    private static final int CACHE_BITS = 12;
    private final LocalScores ls;
    private final ChildTables tables;
    private final OrderConstraints oc;
    private final int[][] cpos;
    private final int[] edgeOffset;
    private final int edgeCount;
    private final boolean features;
    private final int n;
    private final int[] order;
    private final int[] pos;
    private final long[] mask;
    private final double[] logSum;
    private double score;
    private final SplittableRandom rng;
    private final SplittableRandom featureRng;
    private final long[][] cacheKey;
    private final double[][] cacheVal;
    private final boolean[][] cacheUsed;
    // scratch for one proposal
    private final int[] chChild;
    private final long[] chMask;
    private final double[] chLog;
    private int chCount;

    private long stepsDone;
    private long cpuNanos;
    private long accepted;
    private volatile long publishedSteps;
    private volatile long publishedAccepted;
    final List<double[]> edgeDraws = new ArrayList<>();
    final List<long[]> featureDraws = new ArrayList<>();
    final List<int[]> orderDraws = new ArrayList<>();
    final List<Double> trace = new ArrayList<>();

    OrderChain(LocalScores ls, ChildTables tables, OrderConstraints oc, int[][] cpos, int[] edgeOffset,
               boolean features, SplittableRandom rng) {
        this.ls = ls;
        this.tables = tables;
        this.oc = oc;
        this.cpos = cpos;
        this.edgeOffset = edgeOffset;
        this.n = ls.variableCount();
        this.edgeCount = edgeOffset[n];
        this.features = features;
        this.rng = rng;
        // split off before any use, features on or off, so the chain's own stream is the same either way
        this.featureRng = rng.split();
        this.cacheKey = new long[n][];
        this.cacheVal = new double[n][];
        this.cacheUsed = new boolean[n][];
        for (int i = 0; i < n; i++) {
            if (tables.table(i) == null) {
                cacheKey[i] = new long[1 << CACHE_BITS];
                cacheVal[i] = new double[1 << CACHE_BITS];
                cacheUsed[i] = new boolean[1 << CACHE_BITS];
            }
        }
        order = new int[n];
        pos = new int[n];
        mask = new long[n];
        logSum = new double[n];
        chChild = new int[n];
        chMask = new long[n];
        chLog = new double[n];
        for (int attempt = 0; ; attempt++) {
            int[] start = oc.randomOrder(rng);
            System.arraycopy(start, 0, order, 0, n);
            for (int p = 0; p < n; p++) {
                pos[order[p]] = p;
            }
            score = 0;
            for (int i = 0; i < n; i++) {
                mask[i] = ls.predecessorMask(i, pos);
                logSum[i] = childLogSum(i, mask[i]);
                score += logSum[i];
            }
            if (score > Double.NEGATIVE_INFINITY) {
                break;
            }
            if (attempt == 1000) {
                throw new UserError("no starting order with positive posterior found in 1000 random orders "
                        + "(the required edges and the in-degree bound leave almost no order possible)");
            }
        }
    }

    private double childLogSum(int i, long m) {
        double[] t = tables.table(i);
        if (t != null) {
            return t[(int) m];
        }
        int slot = (int) ((m * 0x9E3779B97F4A7C15L) >>> (64 - CACHE_BITS));
        if (cacheUsed[i][slot] && cacheKey[i][slot] == m) {
            return cacheVal[i][slot];
        }
        double v = OrderSum.childLogSum(ls, i, m);
        cacheUsed[i][slot] = true;
        cacheKey[i][slot] = m;
        cacheVal[i][slot] = v;
        return v;
    }

    long steps() {
        return publishedSteps;
    }

    long acceptedSteps() {
        return publishedAccepted;
    }

    /** Runs {@code count} steps; stores a draw whenever the step count passes burn-in and is a multiple of {@code thin}. */
    void advance(long count, long burnIn, long thin) {
        var mx = java.lang.management.ManagementFactory.getThreadMXBean();
        long cpu0 = mx.isCurrentThreadCpuTimeSupported() ? mx.getCurrentThreadCpuTime() : 0;
        for (long k = 0; k < count; k++) {
            step();
            stepsDone++;
            if (stepsDone > burnIn && (stepsDone - burnIn) % thin == 0) {
                record();
            }
            if ((stepsDone & 1023) == 0) {
                publishedSteps = stepsDone;
                publishedAccepted = accepted;
            }
        }
        publishedSteps = stepsDone;
        publishedAccepted = accepted;
        cpuNanos += mx.isCurrentThreadCpuTimeSupported() ? mx.getCurrentThreadCpuTime() - cpu0 : 0;
    }

    /** CPU time this chain's steps have used, seconds (the machine may be shared: wall time misleads). */
    double cpuSeconds() {
        return cpuNanos / 1e9;
    }

    private void step() {
        if (n < 2) {
            return;
        }
        int p;
        int q;
        if (rng.nextBoolean()) {
            p = rng.nextInt(n - 1);
            q = p + 1;
        } else {
            p = rng.nextInt(n);
            q = rng.nextInt(n - 1);
            if (q >= p) {
                q++;
            } else {
                int t = p;
                p = q;
                q = t;
            }
        }
        int a = order[p];
        int b = order[q];
        if (oc.restricts()) {
            if (oc.mustPrecede(a, b)) {
                return;
            }
            for (int k = p + 1; k < q; k++) {
                int w = order[k];
                if (oc.mustPrecede(a, w) || oc.mustPrecede(w, b)) {
                    return;
                }
            }
        }
        chCount = 0;
        double delta = 0;
        // a moves to q: gains order[p+1..q] as predecessors
        long m = mask[a];
        for (int k = p + 1; k <= q; k++) {
            int c = cpos[a][order[k]];
            if (c >= 0) {
                m |= 1L << c;
            }
        }
        delta += change(a, m);
        // b moves to p: loses order[p..q-1]
        m = mask[b];
        for (int k = p; k < q; k++) {
            int c = cpos[b][order[k]];
            if (c >= 0) {
                m &= ~(1L << c);
            }
        }
        delta += change(b, m);
        for (int k = p + 1; k < q && delta > Double.NEGATIVE_INFINITY; k++) {
            int w = order[k];
            m = mask[w];
            int ca = cpos[w][a];
            int cb = cpos[w][b];
            if (ca >= 0) {
                m &= ~(1L << ca);
            }
            if (cb >= 0) {
                m |= 1L << cb;
            }
            delta += change(w, m);
        }
        if (!(delta > Double.NEGATIVE_INFINITY)) {
            return;
        }
        if (delta < 0 && Math.log(rng.nextDouble()) >= delta) {
            return;
        }
        accepted++;
        order[p] = b;
        order[q] = a;
        pos[a] = q;
        pos[b] = p;
        for (int k = 0; k < chCount; k++) {
            int v = chChild[k];
            mask[v] = chMask[k];
            logSum[v] = chLog[k];
        }
        score += delta;
    }

    /** Records a proposed new mask of {@code v}; returns the change of its log sum. */
    private double change(int v, long m) {
        if (m == mask[v]) {
            return 0;
        }
        double l = childLogSum(v, m);
        chChild[chCount] = v;
        chMask[chCount] = m;
        chLog[chCount] = l;
        chCount++;
        return l - logSum[v];
    }

    private void record() {
        double[] row = new double[edgeCount];
        for (int i = 0; i < n; i++) {
            long m = mask[i];
            double[] t = tables.table(i);
            int off = edgeOffset[i];
            if (t != null) {
                double z = t[(int) m];
                for (long r = m; r != 0; r &= r - 1) {
                    int c = Long.numberOfTrailingZeros(r);
                    row[off + c] = -Math.expm1(t[(int) (m & ~(1L << c))] - z);
                }
            } else {
                long[] masks = ls.masks(i);
                double[] w = ls.weights(i);
                double z = logSum[i];
                for (int s = 0; s < masks.length; s++) {
                    long u = masks[s];
                    if (u == 0 || (u & ~m) != 0) {
                        continue;
                    }
                    double pr = Math.exp(w[s] - z);
                    for (; u != 0; u &= u - 1) {
                        row[off + Long.numberOfTrailingZeros(u)] += pr;
                    }
                }
            }
        }
        edgeDraws.add(row);
        trace.add(score);
        orderDraws.add(order.clone());
        if (features) {
            featureDraws.add(DagFeatures.indicators(ls, DagFeatures.sampleDag(ls, mask, logSum, featureRng), order));
        }
    }
}
