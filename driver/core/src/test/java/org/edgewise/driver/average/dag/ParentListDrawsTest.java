package org.edgewise.driver.average.dag;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.average.convergence.Estimate;
import org.junit.jupiter.api.Test;

/**
 * The parent-list path for any number of variables ({@link ParentListDraws}, {@link WideEssentialGraph})
 * against the bitmask path it extends ({@link DagDraws}, {@link EssentialGraph}; the latter checked against
 * brute-force equivalence classes in {@link EssentialGraphTest}), and beyond one 64-bit word by relabelling:
 * a DAG's essential graph and ancestor relation do not depend on the names of its nodes.
 */
class ParentListDrawsTest {
    static int[][] lists(int[] masks) {
        int[][] out = new int[masks.length][];
        for (int v = 0; v < masks.length; v++) {
            int m = masks[v];
            out[v] = java.util.stream.IntStream.range(0, masks.length).filter(u -> (m >> u & 1) != 0).toArray();
        }
        return out;
    }

    /** Source: every DAG on n ≤ 5 nodes (OEIS A003024 counts, DagEnumerationTest): the same compelled edges. */
    @Test
    void wideEssentialGraphEqualsTheBitmaskOneOnEveryDagUpToFiveNodes() {
        int checked = 0;
        for (int n = 1; n <= 5; n++) {
            for (int[] pa : DagEnumeration.allDags(n)) {
                assertArrayEquals(lists(EssentialGraph.compelled(pa)), WideEssentialGraph.compelled(lists(pa)));
                checked++;
            }
        }
        assertEquals(1 + 3 + 25 + 543 + 29281, checked);
    }

    /** A random DAG on 12 nodes placed among 150 variables (three words): compelled edges and ancestors map along. */
    @Test
    void beyondOneWordByRelabelling() {
        SplittableRandom rng = new SplittableRandom(35);
        int big = 150;
        for (int round = 0; round < 200; round++) {
            int n = 12;
            int[] pa = randomDag(n, 0.3, rng);
            int[] place = new int[n]; // strictly increasing positions spread over the words
            for (int i = 0, at = rng.nextInt(5); i < n; i++, at += 1 + rng.nextInt(12)) {
                place[i] = at;
            }
            int[][] wide = new int[big][0];
            for (int v = 0; v < n; v++) {
                int[] l = lists(pa)[v];
                wide[place[v]] = java.util.Arrays.stream(l).map(u -> place[u]).toArray();
            }
            int[][] small = lists(EssentialGraph.compelled(pa));
            int[][] got = WideEssentialGraph.compelled(wide);
            int[] anc = DagDraws.ancestors(pa);
            long[][] wideAnc = ParentListDraws.ancestors(wide);
            for (int v = 0; v < n; v++) {
                assertArrayEquals(java.util.Arrays.stream(small[v]).map(u -> place[u]).toArray(), got[place[v]]);
                for (int u = 0; u < n; u++) {
                    assertEquals((anc[v] >> u & 1) != 0, WideEssentialGraph.get(wideAnc[place[v]], place[u]));
                }
            }
        }
    }

    /** The same DAGs in both representations (two chains, weighted): every feature's estimate is identical. */
    @Test
    void bothRepresentationsGiveTheSameEstimates() {
        SplittableRandom rng = new SplittableRandom(19);
        int n = 9;
        int chains = 2;
        int per = 60;
        List<List<int[]>> masks = new ArrayList<>();
        int[][][][] lists = new int[chains][per][][];
        double[][] w = new double[chains][per];
        for (int c = 0; c < chains; c++) {
            List<int[]> chain = new ArrayList<>();
            for (int k = 0; k < per; k++) {
                int[] pa = randomDag(n, 0.25, rng);
                chain.add(pa);
                lists[c][k] = lists(pa);
                w[c][k] = 0.5 + rng.nextDouble();
            }
            masks.add(chain);
        }
        DagDraws a = new DagDraws(n, masks, 1, w);
        ParentListDraws b = new ParentListDraws(n, lists, w);
        for (int x = 0; x < n; x++) {
            for (int y = 0; y < n; y++) {
                if (x == y) {
                    continue;
                }
                same(a.estimate(a.edge(x, y)), b.estimate(b.edge(x, y)));
                same(a.estimate(a.adjacent(x, y)), b.estimate(b.adjacent(x, y)));
                same(a.estimate(a.compelled(x, y)), b.estimate(b.compelled(x, y)));
                same(a.estimate(a.reversible(x, y)), b.estimate(b.reversible(x, y)));
                same(a.estimate(a.ancestor(x, y)), b.estimate(b.ancestor(x, y)));
                same(a.estimate(a.blanket(x, y)), b.estimate(b.blanket(x, y)));
            }
        }
    }

    /**
     * Chains that revisit DAGs (every draw one of 7 DAGs): the estimates computed once per distinct DAG and per
     * distinct feature pattern equal the per-draw ones of the bitmask path (source: the same frequencies and chain
     * diagnostics over the same draws, {@link DagDraws}, whose essential graphs {@link EssentialGraphTest} checks
     * against brute-force equivalence classes); the distinct DAGs and their summed weights are what the draws hold.
     */
    @Test
    void revisitedDagsAreComputedOnceAndEstimateAsEveryDraw() {
        SplittableRandom rng = new SplittableRandom(23);
        int n = 8;
        int[][] pool = new int[7][];
        for (int i = 0; i < pool.length; i++) {
            pool[i] = randomDag(n, 0.35, rng);
        }
        int chains = 3;
        int per = 80;
        List<List<int[]>> masks = new ArrayList<>();
        int[][][][] lists = new int[chains][per][][];
        double[][] w = new double[chains][per];
        double[] poolWeight = new double[pool.length];
        java.util.Set<Integer> used = new java.util.TreeSet<>();
        for (int c = 0; c < chains; c++) {
            List<int[]> chain = new ArrayList<>();
            int at = rng.nextInt(pool.length);
            for (int k = 0; k < per; k++) {
                if (rng.nextDouble() < 0.2) {
                    at = rng.nextInt(pool.length); // sticky: chains dwell on a DAG, as MCMC does
                }
                chain.add(pool[at]);
                lists[c][k] = lists(pool[at]);
                w[c][k] = 0.5 + rng.nextDouble();
                poolWeight[at] += w[c][k];
                used.add(at);
            }
            masks.add(chain);
        }
        DagDraws a = new DagDraws(n, masks, 1, w);
        ParentListDraws b = new ParentListDraws(n, lists, w);
        assertEquals(used.size(), b.distinctCount());
        double[] dw = b.distinctWeights();
        for (int u = 0; u < b.distinctCount(); u++) {
            int[][] g = b.distinct(u);
            int found = -1;
            for (int i = 0; i < pool.length; i++) {
                if (java.util.Arrays.deepEquals(lists(pool[i]), g)) {
                    found = i;
                }
            }
            assertEquals(poolWeight[found], dw[u], 1e-9);
        }
        for (int x = 0; x < n; x++) {
            for (int y = 0; y < n; y++) {
                if (x == y) {
                    continue;
                }
                same(a.estimate(a.edge(x, y)), b.estimate(b.edge(x, y)));
                same(a.estimate(a.adjacent(x, y)), b.estimate(b.adjacent(x, y)));
                same(a.estimate(a.compelled(x, y)), b.estimate(b.compelled(x, y)));
                same(a.estimate(a.reversible(x, y)), b.estimate(b.reversible(x, y)));
                same(a.estimate(a.ancestor(x, y)), b.estimate(b.ancestor(x, y)));
                same(a.estimate(a.blanket(x, y)), b.estimate(b.blanket(x, y)));
                for (int c = 0; c < chains; c++) {
                    for (int k = 0; k < per; k += 7) {
                        assertEquals(a.compelled(x, y).test(c, k), b.compelled(x, y).test(c, k));
                    }
                }
            }
        }
    }

    static void same(Estimate x, Estimate y) {
        assertEquals(x, y);
    }

    /** A random DAG: a random order, each earlier node a parent with probability {@code p}. */
    static int[] randomDag(int n, double p, SplittableRandom rng) {
        int[] order = java.util.stream.IntStream.range(0, n).toArray();
        for (int i = n - 1; i > 0; i--) {
            int j = rng.nextInt(i + 1);
            int t = order[i];
            order[i] = order[j];
            order[j] = t;
        }
        int[] pa = new int[n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < i; j++) {
                if (rng.nextDouble() < p) {
                    pa[order[i]] |= 1 << order[j];
                }
            }
        }
        return pa;
    }
}
