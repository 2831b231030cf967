package org.edgewise.driver.average;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.IntFunction;
import org.edgewise.driver.average.dag.EssentialGraphTest;

/**
 * The tests' enumeration of every DAG on a few nodes (parent bitmasks), the reference the exact
 * sums, samplers and chains are checked against. {@link DagEnumerationTest} checks it against the
 * number of labelled DAGs (Robinson 1973; OEIS A003024) and the count of (order, DAG) pairs.
 */
public final class DagEnumeration {
    private DagEnumeration() {
    }

    /** Every DAG on n nodes as parent bitmasks, by choosing a parent set per node and keeping the acyclic ones. */
    public static List<int[]> allDags(int n) {
        return allDags(n, n);
    }

    /** The DAGs on n nodes with in-degree at most d, in the order of {@link #allDags(int)}. */
    public static List<int[]> allDags(int n, int d) {
        List<int[]> out = new ArrayList<>();
        fill(n, d, 0, new int[n], out);
        return out;
    }

    private static void fill(int n, int d, int v, int[] pa, List<int[]> out) {
        if (v == n) {
            if (acyclic(pa, n)) {
                out.add(pa.clone());
            }
            return;
        }
        for (int m = 0; m < 1 << n; m++) {
            if ((m >> v & 1) == 0 && Integer.bitCount(m) <= d) {
                pa[v] = m;
                fill(n, d, v + 1, pa, out);
            }
        }
    }

    /** Kahn: repeatedly remove a node whose parents are all removed. */
    public static boolean acyclic(int[] pa, int n) {
        int removed = 0;
        boolean progress = true;
        while (progress) {
            progress = false;
            for (int v = 0; v < n; v++) {
                if ((removed >> v & 1) == 0 && (pa[v] & ~removed) == 0) {
                    removed |= 1 << v;
                    progress = true;
                }
            }
        }
        return removed == (1 << n) - 1;
    }

    /** Number of orders (permutations) in which every node follows its parents (DP over subsets). */
    public static long linearExtensions(int[] pa, int n) {
        long[] count = new long[1 << n];
        count[0] = 1;
        for (int s = 0; s < 1 << n; s++) {
            if (count[s] == 0) {
                continue;
            }
            for (int v = 0; v < n; v++) {
                if ((s >> v & 1) == 0 && (pa[v] & ~s) == 0) {
                    count[s | 1 << v] += count[s];
                }
            }
        }
        return count[(1 << n) - 1];
    }

    /** log β_i(U) = the stored weight of child i's parent set with bitmask U; −∞ for sets not allowed. */
    public static double[][] logWeights(LocalScores ls) {
        return byMask(ls, ls::weights);
    }

    /** log ρ_i(U), the structure prior of child i's parent set with bitmask U; −∞ for sets not allowed. */
    public static double[][] logPriors(LocalScores ls) {
        return byMask(ls, ls::logPriors);
    }

    /** Per child and parent bitmask U, the index of U among the child's allowed sets (0 where not allowed). */
    public static int[][] setIndex(LocalScores ls) {
        int n = ls.variableCount();
        int[][] index = new int[n][1 << n];
        for (int i = 0; i < n; i++) {
            for (int k = 0; k < ls.setCount(i); k++) {
                index[i][mask(ls, i, k)] = k;
            }
        }
        return index;
    }

    private static double[][] byMask(LocalScores ls, IntFunction<double[]> perSet) {
        int n = ls.variableCount();
        double[][] out = new double[n][1 << n];
        for (int i = 0; i < n; i++) {
            Arrays.fill(out[i], Double.NEGATIVE_INFINITY);
            double[] v = perSet.apply(i);
            for (int k = 0; k < ls.setCount(i); k++) {
                out[i][mask(ls, i, k)] = v[k];
            }
        }
        return out;
    }

    /** The bitmask of child i's k-th allowed parent set. */
    public static int mask(LocalScores ls, int i, int k) {
        int g = 0;
        for (int p : ls.parents(i, k)) {
            g |= 1 << p;
        }
        return g;
    }

    /** The Markov equivalence class key of a DAG ({@link EssentialGraphTest#classKey}). */
    public static String classKey(int[] pa, int n) {
        return EssentialGraphTest.classKey(pa, n);
    }
}
