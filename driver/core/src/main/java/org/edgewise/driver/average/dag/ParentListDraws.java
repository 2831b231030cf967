package org.edgewise.driver.average.dag;

import java.util.Arrays;
import org.edgewise.driver.average.convergence.Estimate;

/**
 * Features of drawn DAGs given as parent lists (per DAG, per node its parents, ascending): the
 * path for any number of variables, where {@link DagDraws}' one-int bitmasks stop at 31. One stored
 * draw per DAG ({@code group} 1), chains in draw order, optional weights; every estimate is
 * {@link DagDraws#estimate(DagDraws.Feature, int, int, int, double[][])}'s, so both representations
 * give the same figures on the same DAGs.
 * Memory: the DAGs as given (shared, not copied); when asked, per DAG its compelled parents
 * ({@link WideEssentialGraph}: at most its parents) and its ancestor sets (n × ⌈n/64⌉ longs:
 * 40 variables 320 bytes, 200 variables 6.4 KB).
 */
public final class ParentListDraws implements DrawnDags {
    private final int n;
    private final int[][][][] dags;
    private final double[][] weights;
    private int[][][][] compelled;
    private long[][][][] reach;

    /**
     * @param dags    per chain, per draw, per node its parents ascending
     * @param weights per chain and draw, or null for equal weights
     */
    public ParentListDraws(int n, int[][][][] dags, double[][] weights) {
        this.n = n;
        this.dags = dags;
        this.weights = weights;
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

    @Override
    public Estimate estimate(DagDraws.Feature f) {
        return DagDraws.estimate(f, dags.length, dags[0].length, 1, weights);
    }

    private static boolean has(int[] parents, int a) {
        return Arrays.binarySearch(parents, a) >= 0;
    }

    @Override
    public DagDraws.Feature edge(int a, int b) {
        return (c, k) -> has(dags[c][k][b], a);
    }

    @Override
    public DagDraws.Feature adjacent(int a, int b) {
        return (c, k) -> has(dags[c][k][b], a) || has(dags[c][k][a], b);
    }

    private int[][] compelledOf(int c, int k) {
        if (compelled == null) {
            compelled = new int[dags.length][][][];
            for (int i = 0; i < dags.length; i++) {
                compelled[i] = new int[dags[i].length][][];
                for (int j = 0; j < dags[i].length; j++) {
                    compelled[i][j] = WideEssentialGraph.compelled(dags[i][j]);
                }
            }
        }
        return compelled[c][k];
    }

    @Override
    public DagDraws.Feature compelled(int a, int b) {
        compelledOf(0, 0);
        return (c, k) -> has(compelledOf(c, k)[b], a);
    }

    @Override
    public DagDraws.Feature reversible(int a, int b) {
        compelledOf(0, 0);
        return (c, k) -> (has(dags[c][k][b], a) || has(dags[c][k][a], b))
                && !has(compelledOf(c, k)[b], a) && !has(compelledOf(c, k)[a], b);
    }

    @Override
    public DagDraws.Feature ancestor(int a, int b) {
        if (reach == null) {
            reach = new long[dags.length][][][];
            for (int c = 0; c < dags.length; c++) {
                reach[c] = new long[dags[c].length][][];
                for (int k = 0; k < dags[c].length; k++) {
                    reach[c][k] = ancestors(dags[c][k]);
                }
            }
        }
        return (c, k) -> WideEssentialGraph.get(reach[c][k][b], a);
    }

    @Override
    public DagDraws.Feature blanket(int a, int b) {
        return (c, k) -> {
            int[][] g = dags[c][k];
            if (has(g[b], a) || has(g[a], b)) {
                return true;
            }
            for (int v = 0; v < n; v++) {
                if (has(g[v], a) && has(g[v], b)) {
                    return true;
                }
            }
            return false;
        };
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
