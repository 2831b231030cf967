package org.edgewise.driver.average.dag;

import java.util.Arrays;
import java.util.HashMap;
import java.util.Map;
import org.edgewise.driver.average.convergence.Estimate;

/**
 * Features of drawn DAGs given as parent lists (per DAG, per node its parents, ascending): the
 * path for any number of variables, where {@link DagDraws}' one-int bitmasks stop at 31. One stored
 * draw per DAG ({@code group} 1), chains in draw order, optional weights; every estimate is
 * {@link DagDraws#estimate(DagDraws.Feature, int, int, int, double[][])}'s, so both representations
 * give the same figures on the same DAGs.
 *
 * <p>Chains revisit the same DAGs: on the 40-variable sample of {@code scripts/bench sample-once},
 * 6,536 draws hold 132 distinct DAGs. So each draw is mapped once to its distinct DAG, and everything
 * structural (parent bitsets, the essential graph, ancestor sets) is computed once per distinct DAG.
 * A feature is then the set of distinct DAGs where it holds; two features holding on the same set
 * have the same per-draw values, hence the same estimate, which is computed once (the chain
 * diagnostics behind an estimate, with their rank-normalisation and FFTs, are most of the cost).
 * Memory: the DAGs as given (shared, not copied), one int per draw, per distinct DAG its parent,
 * compelled-parent and (when asked) ancestor bitsets (3 × n × ⌈n/64⌉ longs: 40 variables 960 bytes),
 * and per distinct feature pattern its estimate.
 */
public final class ParentListDraws implements DrawnDags {
    private final int n;
    private final int words;
    private final int[][][][] dags;
    private final double[][] weights;
    /** {@code id[c][k]}: the distinct DAG of draw k of chain c. */
    private final int[][] id;
    /** Per distinct DAG its parent lists (those of its first draw). */
    private final int[][][] unique;
    /** Per distinct DAG, node v's parents at words [v·words, (v+1)·words). */
    private final long[][] parentBits;
    private long[][] compelledBits;
    private long[][] reachBits;
    private final Map<Pattern, Estimate> cache = new HashMap<>();

    /**
     * @param dags    per chain, per draw, per node its parents ascending
     * @param weights per chain and draw, or null for equal weights
     */
    public ParentListDraws(int n, int[][][][] dags, double[][] weights) {
        this.n = n;
        this.words = (n + 63) >>> 6;
        this.dags = dags;
        this.weights = weights;
        this.id = new int[dags.length][];
        Map<DagKey, Integer> seen = new HashMap<>();
        java.util.List<int[][]> list = new java.util.ArrayList<>();
        for (int c = 0; c < dags.length; c++) {
            id[c] = new int[dags[c].length];
            for (int k = 0; k < dags[c].length; k++) {
                DagKey key = new DagKey(dags[c][k]);
                Integer u = seen.get(key);
                if (u == null) {
                    u = list.size();
                    seen.put(key, u);
                    list.add(dags[c][k]);
                }
                id[c][k] = u;
            }
        }
        this.unique = list.toArray(new int[0][][]);
        this.parentBits = new long[unique.length][];
        for (int u = 0; u < unique.length; u++) {
            parentBits[u] = bits(unique[u]);
        }
    }

    /** The parents in {@code mask} (a parent bitmask, n ≤ 31), ascending. */
    public static int[] parents(int mask) {
        int[] pa = new int[Integer.bitCount(mask)];
        for (int m = mask, i = 0; m != 0; m &= m - 1) {
            pa[i++] = Integer.numberOfTrailingZeros(m);
        }
        return pa;
    }

    /** The parents of every variable of a DAG given as parent bitmasks, ascending. */
    public static int[][] parentLists(int[] masks) {
        int[][] pa = new int[masks.length][];
        for (int v = 0; v < masks.length; v++) {
            pa[v] = parents(masks[v]);
        }
        return pa;
    }

    @Override
    public int variableCount() {
        return n;
    }

    /** Number of distinct DAGs among the draws. */
    public int distinctCount() {
        return unique.length;
    }

    /** The distinct DAG of draw k of chain c (an index below {@link #distinctCount()}). */
    public int distinctOf(int c, int k) {
        return id[c][k];
    }

    /** The parent lists of distinct DAG {@code u} (shared: read only). */
    public int[][] distinct(int u) {
        return unique[u];
    }

    /**
     * Per distinct DAG, the summed weight of its draws (their count when unweighted): what a
     * frequency over the draws gives each distinct DAG.
     */
    public double[] distinctWeights() {
        double[] w = new double[unique.length];
        for (int c = 0; c < id.length; c++) {
            for (int k = 0; k < id[c].length; k++) {
                w[id[c][k]] += weights == null ? 1.0 : weights[c][k];
            }
        }
        return w;
    }

    @Override
    public Estimate estimate(DagDraws.Feature f) {
        if (f instanceof Pattern p) {
            Estimate e = cache.get(p);
            if (e == null) {
                e = DagDraws.estimate((c, k) -> p.holds(id[c][k]), dags.length, dags[0].length, 1, weights);
                cache.put(p, e);
            }
            return e;
        }
        return DagDraws.estimate(f, dags.length, dags[0].length, 1, weights);
    }

    /** A test on one distinct DAG. */
    private interface OnDistinct {
        boolean test(int u);
    }

    /** The feature that holds on the distinct DAGs where {@code t} does. */
    private Pattern pattern(OnDistinct t) {
        long[] holds = new long[(unique.length + 63) >>> 6];
        for (int u = 0; u < unique.length; u++) {
            if (t.test(u)) {
                holds[u >>> 6] |= 1L << u;
            }
        }
        return new Pattern(holds);
    }

    /** A feature as the set of distinct DAGs where it holds; equal sets are equal features. */
    private final class Pattern implements DagDraws.Feature {
        private final long[] holds;
        private final int hash;

        Pattern(long[] holds) {
            this.holds = holds;
            this.hash = Arrays.hashCode(holds);
        }

        boolean holds(int u) {
            return (holds[u >>> 6] >>> u & 1L) != 0;
        }

        @Override
        public boolean test(int chain, int k) {
            return holds(id[chain][k]);
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof Pattern p && Arrays.equals(holds, p.holds);
        }

        @Override
        public int hashCode() {
            return hash;
        }
    }

    /** A DAG's parent lists as a hash key (content equality). */
    private record DagKey(int[][] parents, int hash) {
        DagKey(int[][] parents) {
            this(parents, Arrays.deepHashCode(parents));
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof DagKey k && hash == k.hash && Arrays.deepEquals(parents, k.parents);
        }

        @Override
        public int hashCode() {
            return hash;
        }
    }

    private long[] bits(int[][] lists) {
        long[] out = new long[n * words];
        for (int v = 0; v < n; v++) {
            for (int p : lists[v]) {
                out[v * words + (p >>> 6)] |= 1L << p;
            }
        }
        return out;
    }

    /** Whether bit {@code a} of node {@code b}'s row is set in {@code rows}. */
    private boolean bit(long[] rows, int b, int a) {
        return (rows[b * words + (a >>> 6)] >>> a & 1L) != 0;
    }

    private long[][] compelledBits() {
        if (compelledBits == null) {
            compelledBits = new long[unique.length][];
            for (int u = 0; u < unique.length; u++) {
                compelledBits[u] = bits(WideEssentialGraph.compelled(unique[u]));
            }
        }
        return compelledBits;
    }

    @Override
    public DagDraws.Feature edge(int a, int b) {
        return pattern(u -> bit(parentBits[u], b, a));
    }

    @Override
    public DagDraws.Feature adjacent(int a, int b) {
        return pattern(u -> bit(parentBits[u], b, a) || bit(parentBits[u], a, b));
    }

    @Override
    public DagDraws.Feature compelled(int a, int b) {
        long[][] cb = compelledBits();
        return pattern(u -> bit(cb[u], b, a));
    }

    @Override
    public DagDraws.Feature reversible(int a, int b) {
        long[][] cb = compelledBits();
        return pattern(u -> (bit(parentBits[u], b, a) || bit(parentBits[u], a, b)) && !bit(cb[u], b, a) && !bit(cb[u], a, b));
    }

    @Override
    public DagDraws.Feature ancestor(int a, int b) {
        if (reachBits == null) {
            reachBits = new long[unique.length][];
            for (int u = 0; u < unique.length; u++) {
                long[][] anc = ancestors(unique[u]);
                long[] rows = new long[n * words];
                for (int v = 0; v < n; v++) {
                    System.arraycopy(anc[v], 0, rows, v * words, words);
                }
                reachBits[u] = rows;
            }
        }
        return pattern(u -> bit(reachBits[u], b, a));
    }

    @Override
    public DagDraws.Feature blanket(int a, int b) {
        return pattern(u -> {
            long[] g = parentBits[u];
            if (bit(g, b, a) || bit(g, a, b)) {
                return true;
            }
            for (int v = 0; v < n; v++) {
                if (bit(g, v, a) && bit(g, v, b)) {
                    return true;
                }
            }
            return false;
        });
    }

    /**
     * Per node the bitset of its ancestors: nodes taken parents first (Kahn's order), each node's
     * set the union of its parents and their sets.
     */
    static long[][] ancestors(int[][] pa) {
        int n = pa.length;
        int words = (n + 63) >>> 6;
        long[][] anc = new long[n][words];
        int[] missing = new int[n];
        int[][] children = children(pa);
        int[] queue = new int[n];
        int head = 0;
        int tail = 0;
        for (int v = 0; v < n; v++) {
            missing[v] = pa[v].length;
            if (missing[v] == 0) {
                queue[tail++] = v;
            }
        }
        while (head < tail) {
            int v = queue[head++];
            for (int p : pa[v]) {
                WideEssentialGraph.set(anc[v], p);
                for (int w = 0; w < words; w++) {
                    anc[v][w] |= anc[p][w];
                }
            }
            for (int ch : children[v]) {
                if (--missing[ch] == 0) {
                    queue[tail++] = ch;
                }
            }
        }
        if (tail != n) {
            throw new IllegalArgumentException("not a DAG: a directed cycle among the parent lists");
        }
        return anc;
    }

    private static int[][] children(int[][] pa) {
        int n = pa.length;
        int[] count = new int[n];
        for (int[] ps : pa) {
            for (int p : ps) {
                count[p]++;
            }
        }
        int[][] out = new int[n][];
        for (int v = 0; v < n; v++) {
            out[v] = new int[count[v]];
        }
        int[] fill = new int[n];
        for (int v = 0; v < n; v++) {
            for (int p : pa[v]) {
                out[p][fill[p]++] = v;
            }
        }
        return out;
    }
}
