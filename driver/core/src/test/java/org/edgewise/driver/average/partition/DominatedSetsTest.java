package org.edgewise.driver.average.partition;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.average.DominatedSets;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.TestStores;
import org.edgewise.driver.average.exact.StructureSum;
import org.edgewise.driver.average.mcmc.McmcSettings;
import org.junit.jupiter.api.Test;

/**
 * {@link DominatedSets}: the kept sets against a brute-force check of the definition (every pair of
 * a set and a proper subset), the stated bound ε = e^−margin · Σ_i #sets_i on the posterior mass of
 * the DAGs that use a left-out set against exact enumeration of every DAG on five nodes (29,281 of
 * them; {@link DagEnumeration}, checked against OEIS A003024), and the sampler run on the kept sets —
 * every move alone and in the default mix — against the exact posterior of every DAG on the kept
 * sets (total variation &lt; 0.05, the tolerance of {@link PartitionMovesTest}: common practice for
 * about 10⁴ effective draws over a few hundred DAGs).
 */
class DominatedSetsTest {
    /** Many rows on five ternary variables: sharp scores, so even margin 40 leaves sets out. */
    private static LocalScores sharp() {
        return TestStores.scores(TestStores.random(5, 3, 3, 5_000, 61));
    }

    @Test
    void keptSetsAreExactlyThoseNoSubsetDominates() {
        LocalScores ls = sharp();
        for (double margin : new double[] {0.5, 3, 40}) {
            int[][] keep = DominatedSets.keep(ls, margin);
            for (int i = 0; i < 5; i++) {
                long[] m = ls.masks(i);
                double[] w = ls.weights(i);
                java.util.Set<Integer> kept = new java.util.HashSet<>();
                for (int s = 0; s < m.length; s++) {
                    if (keep[i] == null || java.util.Arrays.binarySearch(keep[i], s) >= 0) {
                        kept.add(s);
                    }
                }
                for (int s = 0; s < m.length; s++) {
                    boolean dominated = false;
                    for (int t = 0; t < m.length; t++) {
                        dominated |= t != s && (m[t] & ~m[s]) == 0 && w[t] >= w[s] + margin;
                    }
                    assertEquals(!dominated, kept.contains(s), "margin " + margin + ", child " + i + ", set " + s);
                }
            }
        }
    }

    @Test
    void leftOutMassIsWithinTheStatedBound() {
        LocalScores ls = sharp();
        double[][] lw = DagEnumeration.logWeights(ls);
        List<int[]> dags = DagEnumeration.allDags(5, 3);
        for (double margin : new double[] {0.5, 1, 3, 6}) {
            int[][] keep = DominatedSets.keep(ls, margin);
            double[][] keptW = DagEnumeration.logWeights(ls.restrictedTo(keep));
            double[] all = new double[dags.size()];
            double[] out = new double[dags.size()];
            int leftOut = 0;
            for (int g = 0; g < dags.size(); g++) {
                double w = 0;
                boolean kept = true;
                for (int i = 0; i < 5; i++) {
                    w += lw[i][dags.get(g)[i]];
                    kept &= keptW[i][dags.get(g)[i]] > Double.NEGATIVE_INFINITY;
                }
                all[g] = w;
                out[g] = kept ? Double.NEGATIVE_INFINITY : w;
                leftOut += kept ? 0 : 1;
            }
            double mass = Math.exp(LogSum.of(out) - LogSum.of(all));
            double bound = DominatedSets.massBound(ls, keep, margin);
            assertTrue(leftOut > 0, "margin " + margin + " leaves nothing out: the check would be empty");
            assertTrue(mass <= bound, "margin " + margin + ": left-out mass " + mass + " above the bound " + bound);
        }
        // margin 40 on 5,000 rows leaves sets out (so the sampler's default runs on fewer sets)
        int[][] keep = DominatedSets.keep(ls, DominatedSets.MARGIN);
        boolean any = false;
        for (int[] row : keep) {
            any |= row != null;
        }
        assertTrue(any);
        // nothing dominated (margin +∞): the tables are the very same object
        assertSame(ls, ls.restrictedTo(DominatedSets.keep(ls, Double.POSITIVE_INFINITY)));
    }

    @Test
    void eachMoveOnTheKeptSetsReproducesTheirExactPosterior() {
        // 100 rows on binary variables: a posterior each move alone crosses in 400,000 steps, and margin 1.5
        // leaves 59 of the 75 sets out (at 300 rows the parent-set move alone mixes too slowly to check:
        // total variation 0.07 on every set, 0.42 on the kept ones, whose left-out sets were its bridges)
        LocalScores ls = TestStores.scores(TestStores.random(5, 2, 3, 100, 61));
        LocalScores kept = ls.restrictedTo(DominatedSets.keep(ls, 1.5));
        assertTrue(kept != ls, "nothing left out: the check would not exercise the kept sets");
        OrderConstraints none = OrderConstraints.none(5);
        PartitionChain.Mix[] mixes = {new PartitionChain.Mix(1, 0, 0, 0, 0), new PartitionChain.Mix(0, 1, 0, 0, 0),
                new PartitionChain.Mix(0, 0.5, 0.5, 0, 0), new PartitionChain.Mix(0, 0, 0, 1, 0),
                new PartitionChain.Mix(0.5, 0, 0, 0, 0.5), PartitionChain.Mix.DEFAULT};
        for (PartitionChain.Mix mix : mixes) {
            double tv = PartitionMovesTest.totalVariation(kept, none, mix, 400_000, 13);
            assertTrue(tv < 0.05, mix + " on the kept sets: total variation " + tv);
        }
    }

    @Test
    void theSamplerOnKeptSetsAgreesWithTheExactSumOverEverySet() {
        // 8 ternary variables, 1,000 rows: margin 40 leaves sets out, the exact sum uses every set
        LocalScores ls = TestStores.scores(TestStores.random(8, 3, 2, 1_000, 71));
        int[][] keep = DominatedSets.keep(ls, DominatedSets.MARGIN);
        int left = 0;
        for (int i = 0; i < 8; i++) {
            left += keep[i] == null ? 0 : ls.setCount(i) - keep[i].length;
        }
        assertTrue(left > 0, "nothing left out: the check would not exercise the pruning");
        PartitionMcmcTest.assertAgreesWithExact(ls, OrderConstraints.none(8), 4, "kept sets");
        // parent-set posteriors come back indexed by every set, left-out ones at 0, each child's summing to 1
        PartitionMcmc.Result r = PartitionMcmc.run(ls, OrderConstraints.none(8), McmcSettings.defaults(2).withSteps(20_000, 5_000), null);
        double[][] exact = StructureSum.run(ls, OrderConstraints.none(8)).setPosterior();
        for (int i = 0; i < 8; i++) {
            assertEquals(ls.setCount(i), r.setPosterior()[i].length);
            double sum = 0;
            for (int s = 0; s < ls.setCount(i); s++) {
                sum += r.setPosterior()[i][s];
                if (keep[i] != null && java.util.Arrays.binarySearch(keep[i], s) < 0) {
                    assertEquals(0.0, r.setPosterior()[i][s]);
                    assertTrue(exact[i][s] < 1e-12, "a left-out set with exact posterior " + exact[i][s]);
                }
            }
            assertEquals(1.0, sum, 1e-9);
        }
        for (List<int[]> chain : r.dags()) {
            for (int[] sets : chain) {
                for (int i = 0; i < 8; i++) {
                    assertNotNull(ls.parents(i, sets[i]));
                    assertTrue(keep[i] == null || java.util.Arrays.binarySearch(keep[i], sets[i]) >= 0);
                }
            }
        }
    }
}
