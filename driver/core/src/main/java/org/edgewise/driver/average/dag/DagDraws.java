package org.edgewise.driver.average.dag;

import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.convergence.McseBound;

/**
 * Features estimated from DAGs drawn from a posterior, each DAG the parent bitmask of every node
 * (n ≤ 31), in chains of {@code group} DAGs per stored draw, optionally weighted (self-normalised
 * importance weights, e.g. 1/ext(G) of Ellis &amp; Wong 2008).
 * <ul>
 *   <li>Independent unweighted draws (one chain, exact sampling): mean p and MCSE sqrt(p(1−p)/K).</li>
 *   <li>Chains: per stored draw t the group sums num_t = Σ w·f and den_t = Σ w; the ratio
 *       estimate p = Σ num / Σ den; its MCSE, split-R̂ and bulk ESS are those of the mean of
 *       z_t = (num_t − p·den_t) / mean(den) ({@link ChainDiagnostics}; the delta method for a
 *       ratio — common practice for self-normalised estimates from MCMC).</li>
 * </ul>
 * An estimate of exactly 0 or 1 reports the rule-of-three bound 3/K ({@link McseBound}), not 0.
 * Memory: the DAGs (n ints each), their essential graphs and reach sets (n ints each), weights.
 */
public final class DagDraws implements DrawnDags {
    /** A feature of one DAG (by its index in the chain). */
    public interface Feature {
        boolean test(int chain, int k);
    }

    private final int n;
    private final int group;
    private final int[][][] dags;
    private final int[][][] compelled;
    private final double[][] weights;
    private int[][][] reach;

    /**
     * @param dags    per chain, its DAGs in draw order
     * @param group   DAGs per stored draw (consecutive)
     * @param weights per chain and DAG, or null for equal weights
     */
    public DagDraws(int n, List<List<int[]>> dags, int group, double[][] weights) {
        this.n = n;
        this.group = group;
        this.dags = new int[dags.size()][][];
        for (int c = 0; c < dags.size(); c++) {
            this.dags[c] = dags.get(c).toArray(new int[0][]);
        }
        this.compelled = essentialGraphs(this.dags, null);
        this.weights = weights;
    }

    private DagDraws(DagDraws d, int[] fixed) {
        this.n = d.n;
        this.group = d.group;
        this.dags = d.dags;
        this.weights = d.weights;
        this.reach = d.reach;
        this.compelled = essentialGraphs(d.dags, fixed);
    }

    /**
     * The same draws with each DAG's essential graph taken under background knowledge
     * ({@link EssentialGraph#compelled(int[], int[])}): {@code fixed[v]} = the nodes u whose edge
     * with v, when present, must be u → v. Null or all zero: this object.
     */
    public DagDraws knowing(int[] fixed) {
        if (fixed == null || Arrays.stream(fixed).allMatch(m -> m == 0)) {
            return this;
        }
        if (fixed.length != n) {
            throw new IllegalArgumentException("knowledge for " + fixed.length + " variables, draws of " + n);
        }
        return new DagDraws(this, fixed);
    }

    private static int[][][] essentialGraphs(int[][][] dags, int[] fixed) {
        int[][][] out = new int[dags.length][][];
        for (int c = 0; c < dags.length; c++) {
            out[c] = new int[dags[c].length][];
            for (int k = 0; k < dags[c].length; k++) {
                out[c][k] = EssentialGraph.compelled(dags[c][k], fixed);
            }
        }
        return out;
    }

    @Override
    public int variableCount() {
        return n;
    }

    /** Mean, MCSE, R̂ (NaN for independent draws) and ESS of {@code f}. */
    @Override
    public Estimate estimate(Feature f) {
        return estimate(f, dags.length, dags[0].length, group, weights);
    }

    /**
     * Mean, MCSE, R̂ and ESS of {@code f} over {@code chains} chains of {@code perChain} draws each
     * ({@code group} consecutive DAGs per stored draw; {@code weights[c][k]} or null), as the class
     * comment says — for any representation of the DAGs (parent bitmasks here, parent lists in a saved sample).
     */
    public static Estimate estimate(Feature f, int chains, int perChain, int group, double[][] weights) {
        if (chains == 1 && group == 1 && weights == null) {
            int k = perChain;
            int hits = 0;
            for (int i = 0; i < k; i++) {
                hits += f.test(0, i) ? 1 : 0;
            }
            double p = hits / (double) k;
            return new Estimate(p, McseBound.reported(p, Math.sqrt(p * (1 - p) / k), k), Double.NaN, k, k,
                    hits == 0 || hits == k ? ChainDiagnostics.State.CONSTANT : ChainDiagnostics.State.VARIES);
        }
        int t = perChain / group;
        double[][] num = new double[chains][t];
        double[][] den = new double[chains][t];
        double sn = 0;
        double sd = 0;
        for (int c = 0; c < chains; c++) {
            for (int s = 0; s < t; s++) {
                for (int j = s * group; j < (s + 1) * group; j++) {
                    double w = weights == null ? 1.0 : weights[c][j];
                    den[c][s] += w;
                    if (f.test(c, j)) {
                        num[c][s] += w;
                    }
                }
                sn += num[c][s];
                sd += den[c][s];
            }
        }
        double p = sn / sd;
        double meanDen = sd / (chains * (double) t);
        double[][] z = new double[chains][t];
        for (int c = 0; c < chains; c++) {
            for (int s = 0; s < t; s++) {
                z[c][s] = (num[c][s] - p * den[c][s]) / meanDen;
            }
        }
        ChainDiagnostics.Summary sum = ChainDiagnostics.summary(z);
        Estimate e = Estimate.of(p, sum);
        return new Estimate(p, McseBound.reported(p, e.mcse(), (long) chains * t), e.rhat(), e.ess(), e.essTail(),
                e.state());
    }

    /** Number of chains. */
    public int chainCount() {
        return dags.length;
    }

    /** Number of DAGs in chain c. */
    public int chainLength(int c) {
        return dags[c].length;
    }

    /** Self-normalisable weight of DAG k of chain c (1 when unweighted). */
    public double weight(int c, int k) {
        return weights == null ? 1.0 : weights[c][k];
    }

    /** Parent bitmask of {@code child} in DAG k of chain c. */
    public int parentsOf(int c, int k, int child) {
        return dags[c][k][child];
    }

    /** The edge a → b. */
    @Override
    public Feature edge(int a, int b) {
        return (c, k) -> (dags[c][k][b] >> a & 1) != 0;
    }

    /** a and b adjacent. */
    @Override
    public Feature adjacent(int a, int b) {
        return (c, k) -> ((dags[c][k][b] >> a | dags[c][k][a] >> b) & 1) != 0;
    }

    /** a → b compelled (directed in the essential graph). */
    @Override
    public Feature compelled(int a, int b) {
        return (c, k) -> (compelled[c][k][b] >> a & 1) != 0;
    }

    /** a and b adjacent and the edge reversible (undirected in the essential graph). */
    @Override
    public Feature reversible(int a, int b) {
        return (c, k) -> ((dags[c][k][b] >> a | dags[c][k][a] >> b) & 1) != 0
                && (compelled[c][k][b] >> a & 1) == 0 && (compelled[c][k][a] >> b & 1) == 0;
    }

    /** a ⇝ b: a directed path from a to b. */
    @Override
    public Feature ancestor(int a, int b) {
        if (reach == null) {
            reach = new int[dags.length][][];
            for (int c = 0; c < dags.length; c++) {
                reach[c] = new int[dags[c].length][];
                for (int k = 0; k < dags[c].length; k++) {
                    reach[c][k] = ancestors(dags[c][k]);
                }
            }
        }
        return (c, k) -> (reach[c][k][b] >> a & 1) != 0;
    }

    /** a in the Markov blanket of b: parent, child or co-parent. */
    @Override
    public Feature blanket(int a, int b) {
        return (c, k) -> {
            int[] g = dags[c][k];
            if (((g[b] >> a | g[a] >> b) & 1) != 0) {
                return true;
            }
            for (int v = 0; v < n; v++) {
                if ((g[v] >> a & 1) != 0 && (g[v] >> b & 1) != 0) {
                    return true;
                }
            }
            return false;
        };
    }

    /** Per node, the bitmask of its ancestors. */
    static int[] ancestors(int[] pa) {
        int n = pa.length;
        int[] anc = new int[n];
        boolean changed = true;
        System.arraycopy(pa, 0, anc, 0, n);
        while (changed) {
            changed = false;
            for (int v = 0; v < n; v++) {
                int r = anc[v];
                for (int rest = anc[v]; rest != 0; rest &= rest - 1) {
                    r |= anc[Integer.numberOfTrailingZeros(rest)];
                }
                if (r != anc[v]) {
                    anc[v] = r;
                    changed = true;
                }
            }
        }
        return anc;
    }

    /**
     * Number of linear extensions of a DAG, allowing only orders in which each variable also
     * follows {@code before[v]}: dynamic programming over the down-sets (ideals), one layer of
     * equal size at a time, ext(S ∪ {v}) += ext(S) (Brightwell &amp; Winkler 1991: #P-complete in
     * general; this is O(#ideals · n)). Counts above 2^53 are rounded (doubles).
     */
    public static double linearExtensions(int[] pa, int[] before) {
        int n = pa.length;
        int[] need = new int[n];
        for (int v = 0; v < n; v++) {
            need[v] = pa[v] | (before == null ? 0 : before[v]);
        }
        IntDoubleMap layer = new IntDoubleMap(16);
        layer.add(0, 1.0);
        for (int size = 0; size < n; size++) {
            IntDoubleMap next = new IntDoubleMap(Math.max(16, layer.size() * 4));
            for (int e = 0; e < layer.capacity(); e++) {
                if (!layer.used(e)) {
                    continue;
                }
                int s = layer.key(e);
                double cnt = layer.value(e);
                for (int v = 0; v < n; v++) {
                    if ((s >> v & 1) == 0 && (need[v] & ~s) == 0) {
                        next.add(s | 1 << v, cnt);
                    }
                }
            }
            layer = next;
        }
        return layer.size() == 0 ? 0 : layer.value(layer.find((1 << n) - 1));
    }

    /** Open-addressing int → double map (no boxing): 12 bytes per slot. */
    private static final class IntDoubleMap {
        private int[] keys;
        private double[] values;
        private boolean[] used;
        private int size;

        IntDoubleMap(int expected) {
            int cap = Integer.highestOneBit(Math.max(4, expected * 2) - 1) << 1;
            keys = new int[cap];
            values = new double[cap];
            used = new boolean[cap];
        }

        int size() {
            return size;
        }

        int capacity() {
            return keys.length;
        }

        boolean used(int e) {
            return used[e];
        }

        int key(int e) {
            return keys[e];
        }

        double value(int e) {
            return values[e];
        }

        int find(int k) {
            int mask = keys.length - 1;
            int e = (k * 0x9E3779B9) >>> 1 & mask;
            while (used[e] && keys[e] != k) {
                e = (e + 1) & mask;
            }
            return e;
        }

        void add(int k, double v) {
            if (2 * (size + 1) > keys.length) {
                int[] ok = keys;
                double[] ov = values;
                boolean[] ou = used;
                keys = new int[ok.length * 2];
                values = new double[ok.length * 2];
                used = new boolean[ok.length * 2];
                size = 0;
                for (int e = 0; e < ok.length; e++) {
                    if (ou[e]) {
                        add(ok[e], ov[e]);
                    }
                }
            }
            int e = find(k);
            if (!used[e]) {
                used[e] = true;
                keys[e] = k;
                size++;
            }
            values[e] += v;
        }
    }

    @Override
    public String toString() {
        return "DagDraws" + Arrays.toString(new int[] {n, dags.length, group});
    }
}
