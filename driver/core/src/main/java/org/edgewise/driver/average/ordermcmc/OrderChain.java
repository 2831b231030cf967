package org.edgewise.driver.average.ordermcmc;

import java.util.SplittableRandom;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.dag.DagFeatures;
import org.edgewise.driver.average.givenorder.OrderSum;
import org.edgewise.driver.average.mcmc.DrawStore;
import org.edgewise.driver.average.mcmc.McmcMemory;
import org.edgewise.driver.average.mcmc.SteppedChain;

/**
 * One order-MCMC chain (Friedman &amp; Koller 2003): Metropolis–Hastings on variable orders with a
 * symmetric proposal — half the steps swap two adjacent positions, half swap two positions
 * chosen uniformly — and target π(≺) ∝ exp(Σ_i log α_i(pred_≺(i))), the order-modular
 * evidence (the uniform order prior over the allowed orders cancels). A proposal that breaks an
 * order constraint has π = 0 and is rejected. Only the variables whose candidate-predecessor
 * mask changes are rescored: the two swapped ones and those between them that have one of
 * the two among their candidates.
 *
 * <p>A share {@code relocate} of the steps are instead a Gibbs move on one variable's position:
 * a variable v drawn uniformly is taken out of the order and put back at position q with
 * probability ∝ π(≺ with v at q) over all n positions (the relative order of the others kept).
 * It is a Gibbs update of v's position given the rest, so it leaves π invariant with no
 * accept/reject; the n scores cost O(n) lookups, because moving v past w changes only the
 * predecessor masks of v and w (one per-child table lookup each, and only when one is a
 * candidate of the other). Positions beyond an order constraint are not offered. This is the
 * single-node move of partition and order samplers in the literature (Kuipers &amp; Moffa 2017,
 * sec. 4.2, "node moves"), applied to orders.
 *
 * <p>As a rung of a {@link TemperedOrderChain} the chain targets π(≺)^β instead (0 &lt; β ≤ 1): the
 * Metropolis–Hastings ratio becomes exp(β·Δ log π) and the relocation draws ∝ π^β — both still
 * leave their target invariant (a symmetric proposal; a Gibbs update of π^β).
 *
 * <p>The draws go to a {@link DrawStore}: the Rao-Blackwellised edge posteriors given the current
 * order (a float per candidate edge), the order's log evidence, the order itself, and — when
 * features are asked — the ancestor and Markov-blanket indicators of one DAG sampled from the
 * parent-set weights given the order.
 *
 * <p>Memory per chain: 84n bytes of state, 4 bytes per candidate edge per draw, 4n per draw for
 * orders, n²/32 bytes per draw for features, and a direct-mapped cache of 4096 entries (17 bytes
 * each: key, value, used flag) per non-tabulated child — planned up front by {@link McmcMemory}.
 * Mutable, confined to one thread at a time.
 */
public final class OrderChain extends SteppedChain {
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

    private final double relocate;
    /** The inverse temperature: the chain targets π(≺)^β (1 unless it is a rung of a {@link TemperedOrderChain}). */
    private double beta = 1;
    // scratch for a relocation
    private final double[] posLog;
    private final long[] vMaskAt;
    private final double[] vLogAt;
    private final double[] wLogAt;
    private final long[] wMaskAt;

    /** What one stored draw carries besides its quantities: the order and (with features) the feature bits. */
    record State(int[] order, long[] features) implements DrawStore.Drawn {
    }

    OrderChain(LocalScores ls, ChildTables tables, OrderConstraints oc, int[][] cpos, int[] edgeOffset,
               boolean features, SplittableRandom rng, DrawStore draws, double relocate) {
        this(ls, tables, oc, cpos, edgeOffset, features, rng, draws, relocate, null);
    }

    /**
     * A chain from {@code startOrder} ({@link org.edgewise.driver.average.mcmc.DispersedStart}), or
     * from a random allowed order when it is null or has no positive posterior; the start's
     * quantities go to {@code draws} ({@link DrawStore#start}) when there is one.
     */
    OrderChain(LocalScores ls, ChildTables tables, OrderConstraints oc, int[][] cpos, int[] edgeOffset,
               boolean features, SplittableRandom rng, DrawStore draws, double relocate, int[] startOrder) {
        super(draws);
        this.ls = ls;
        this.tables = tables;
        this.oc = oc;
        this.cpos = cpos;
        this.edgeOffset = edgeOffset;
        this.n = ls.variableCount();
        this.edgeCount = edgeOffset[n];
        this.features = features;
        this.rng = rng;
        this.relocate = relocate;
        posLog = new double[n];
        vMaskAt = new long[n];
        vLogAt = new double[n];
        wLogAt = new double[n];
        wMaskAt = new long[n];
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
            int[] start = attempt == 0 && startOrder != null ? startOrder : oc.randomOrder(rng);
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
        if (draws != null) {
            recordStart(draws);
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

    /** A Gibbs relocation with probability {@code relocate}, else a Metropolis–Hastings move. */
    /** Accepted steps so far (for a ladder that counts its cold rung's acceptances). */
    long acceptedCount() {
        return accepted;
    }

    @Override
    protected void move() {
        if (relocate > 0 && rng.nextDouble() < relocate) {
            relocateOne();
        } else {
            step();
        }
    }

    /** The log target at β = 1 of the current order: Σ_i log α_i(pred(i)). */
    double score() {
        return score;
    }

    double beta() {
        return beta;
    }

    /** Sets the inverse temperature (a rung of a ladder; 0 &lt; β ≤ 1). */
    void beta(double b) {
        beta = b;
    }

    /** The current order (a copy). */
    int[] order() {
        return order.clone();
    }

    /**
     * A hill-climb: {@code sweeps}·n relocations, each of a variable drawn at random to its best
     * position (the relocation move in the limit β → ∞, where the draw ∝ π^β puts all weight on the
     * argmax; ties go to the leftmost). The score never falls; the chain's counts are left as they were.
     */
    void climb(int sweeps) {
        double b = beta;
        long acc = accepted;
        beta = 1e12;
        for (long k = 0; k < (long) sweeps * n; k++) {
            relocateOne();
        }
        beta = b;
        accepted = acc;
    }

    /**
     * The order a hill-climb ({@link #climb}, {@value #CLIMB_SWEEPS} sweeps) reaches from {@code start}
     * with random stream {@code seed}: the climbed start of {@link org.edgewise.driver.average.mcmc.DispersedStart}.
     */
    public static int[] climbed(LocalScores ls, ChildTables tables, OrderConstraints oc, int[][] cpos, int[] edgeOffset,
                                int[] start, long seed) {
        OrderChain c = new OrderChain(ls, tables, oc, cpos, edgeOffset, false, new SplittableRandom(seed), null, 1, start);
        c.climb(CLIMB_SWEEPS);
        return c.order();
    }

    /** Relocations per variable of the hill-climbed start (enough for the climb to stall on the tables measured). */
    static final int CLIMB_SWEEPS = 20;

    /** The Gibbs move of one variable's position (see the class comment). */
    private void relocateOne() {
        if (n < 2) {
            return;
        }
        int v = rng.nextInt(n);
        int p = pos[v];
        long vm = mask[v];
        double vl = logSum[v];
        posLog[p] = 0;
        vMaskAt[p] = vm;
        vLogAt[p] = vl;
        double max = 0;
        int lo = p;
        int hi = p;
        // v moves right past order[p+1..q]: v gains them, each w loses v
        double dw = 0;
        for (int k = p + 1; k < n; k++) {
            int w = order[k];
            if (oc.restricts() && oc.mustPrecede(v, w)) {
                break;
            }
            int cv = cpos[v][w];
            if (cv >= 0) {
                vm |= 1L << cv;
                vl = childLogSum(v, vm);
            }
            int cw = cpos[w][v];
            wMaskAt[k] = mask[w];
            wLogAt[k] = logSum[w];
            if (cw >= 0) {
                wMaskAt[k] = mask[w] & ~(1L << cw);
                wLogAt[k] = childLogSum(w, wMaskAt[k]);
                dw += wLogAt[k] - logSum[w];
            }
            vMaskAt[k] = vm;
            vLogAt[k] = vl;
            posLog[k] = vl - logSum[v] + dw;
            hi = k;
            if (posLog[k] > max) {
                max = posLog[k];
            }
        }
        vm = mask[v];
        vl = logSum[v];
        dw = 0;
        for (int k = p - 1; k >= 0; k--) {
            int w = order[k];
            if (oc.restricts() && oc.mustPrecede(w, v)) {
                break;
            }
            int cv = cpos[v][w];
            if (cv >= 0) {
                vm &= ~(1L << cv);
                vl = childLogSum(v, vm);
            }
            int cw = cpos[w][v];
            wMaskAt[k] = mask[w];
            wLogAt[k] = logSum[w];
            if (cw >= 0) {
                wMaskAt[k] = mask[w] | (1L << cw);
                wLogAt[k] = childLogSum(w, wMaskAt[k]);
                dw += wLogAt[k] - logSum[w];
            }
            vMaskAt[k] = vm;
            vLogAt[k] = vl;
            posLog[k] = vl - logSum[v] + dw;
            lo = k;
            if (posLog[k] > max) {
                max = posLog[k];
            }
        }
        // a tempered rung draws ∝ π^β: the Gibbs update of the tempered target
        double total = 0;
        for (int k = lo; k <= hi; k++) {
            total += Math.exp(beta * (posLog[k] - max)); // exp(−∞) = 0: impossible positions are never drawn
        }
        double u = rng.nextDouble() * total;
        int q = hi;
        for (int k = lo; k <= hi; k++) {
            u -= Math.exp(beta * (posLog[k] - max));
            if (u < 0) {
                q = k;
                break;
            }
        }
        if (!(posLog[q] > Double.NEGATIVE_INFINITY) || q == p) {
            return;
        }
        accepted++;
        score += posLog[q];
        if (q > p) {
            for (int k = p + 1; k <= q; k++) {
                int w = order[k];
                mask[w] = wMaskAt[k];
                logSum[w] = wLogAt[k];
                order[k - 1] = w;
                pos[w] = k - 1;
            }
        } else {
            for (int k = p - 1; k >= q; k--) {
                int w = order[k];
                mask[w] = wMaskAt[k];
                logSum[w] = wLogAt[k];
                order[k + 1] = w;
                pos[w] = k + 1;
            }
        }
        order[q] = v;
        pos[v] = q;
        mask[v] = vMaskAt[q];
        logSum[v] = vLogAt[q];
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
        if (delta < 0 && Math.log(rng.nextDouble()) >= beta * delta) {
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

    @Override
    protected void record() {
        recordInto(draws, stepsDone);
    }

    /** Keeps the current state in {@code store} as the chain's start ({@link DrawStore#start}). */
    void recordStart(DrawStore store) {
        long[] feats = features ? DagFeatures.indicators(ls, DagFeatures.sampleDag(ls, mask, logSum, featureRng), order) : null;
        store.start(edgeRow(), new State(order.clone(), feats));
    }

    /** Stores the current state into {@code store} as the draw after step {@code step}. */
    void recordInto(DrawStore store, long step) {
        float[] row = edgeRow();
        long[] feats = features ? DagFeatures.indicators(ls, DagFeatures.sampleDag(ls, mask, logSum, featureRng), order) : null;
        store.add(step, row, score, new State(order.clone(), feats));
    }

    /** The Rao-Blackwellised P(j → i | D, ≺) of every candidate edge given the current order (a float each). */
    private float[] edgeRow() {
        float[] row = new float[edgeCount];
        for (int i = 0; i < n; i++) {
            long m = mask[i];
            double[] t = tables.table(i);
            int off = edgeOffset[i];
            if (t != null) {
                double z = t[(int) m];
                for (long r = m; r != 0; r &= r - 1) {
                    int c = Long.numberOfTrailingZeros(r);
                    row[off + c] = (float) -Math.expm1(t[(int) (m & ~(1L << c))] - z);
                }
            } else {
                double[] acc = new double[ls.candidates(i).length];
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
                        acc[Long.numberOfTrailingZeros(u)] += pr;
                    }
                }
                for (int c = 0; c < acc.length; c++) {
                    row[off + c] = (float) acc[c];
                }
            }
        }
        return row;
    }
}
