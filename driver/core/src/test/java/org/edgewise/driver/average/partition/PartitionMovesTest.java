package org.edgewise.driver.average.partition;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.TestStores;
import org.edgewise.driver.average.mcmc.ChainSet;
import org.edgewise.driver.average.mcmc.DrawStore;
import org.edgewise.driver.average.exact.StructureSumTest;

/**
 * Each kind of move of {@link PartitionChain}, alone and in the default mix, leaves the
 * structure-modular posterior P(G | D) invariant: the visit frequencies of the chain's DAG against
 * the exact posterior of every DAG on four nodes, enumerated ({@link DagEnumeration}, itself checked
 * against the number of labelled DAGs, OEIS A003024), as a total variation distance; and the state
 * stays consistent (the partition is the DAG's layering; the running log π(Λ) equals a recomputation).
 * The tolerance 0.05 on the total variation is common practice for a check of this size: about
 * 10⁴ effective draws over a few hundred DAGs.
 */
class PartitionMovesTest {
    private static final PartitionChain.Mix EDGES = new PartitionChain.Mix(1, 0, 0, 0, 0);
    private static final PartitionChain.Mix PARENTS = new PartitionChain.Mix(0, 1, 0, 0, 0);
    private static final PartitionChain.Mix REVERSAL = new PartitionChain.Mix(0, 0.5, 0.5, 0, 0);
    private static final PartitionChain.Mix BLOCKS = new PartitionChain.Mix(0, 0, 0, 1, 0);
    private static final PartitionChain.Mix PARTITIONS = new PartitionChain.Mix(0, 0, 0, 0, 0.5);

    static PartitionChain chain(LocalScores ls, OrderConstraints oc, PartitionChain.Mix mix, long seed) {
        int n = ls.variableCount();
        int[] offset = ChainSet.edgeOffsets(ls);
        return new PartitionChain(ls, new ChildTables(ls, 1L << 26), oc, offset, false, new SplittableRandom(seed),
                new DrawStore(offset[n], 10, 1, 0), mix);
    }

    /** The DAG's parent bitmasks packed n bits per node. */
    private static long key(int[] pa, int n) {
        long k = 0;
        for (int v = 0; v < n; v++) {
            k |= (long) pa[v] << (n * v);
        }
        return k;
    }

    /** Total variation between the chain's DAG visits and the exact structure-modular posterior. */
    static double totalVariation(LocalScores ls, OrderConstraints oc, PartitionChain.Mix mix, long steps, long seed) {
        return totalVariation(ls, oc, mix, steps, seed, DagMoves.STRONG_SHARE);
    }

    /** As above, with {@code strongShare} of the block moves on v and its strongest candidates. */
    static double totalVariation(LocalScores ls, OrderConstraints oc, PartitionChain.Mix mix, long steps, long seed,
                                 double strongShare) {
        int n = ls.variableCount();
        double[][] lw = DagEnumeration.logWeights(ls);
        Map<Long, Double> exact = new HashMap<>();
        double[] all = DagEnumeration.allDags(n).stream().filter(g -> StructureSumTest.admitted(g, oc, n))
                .mapToDouble(g -> {
                    double w = 0;
                    for (int i = 0; i < n; i++) {
                        w += lw[i][g[i]];
                    }
                    exact.put(key(g, n), w);
                    return w;
                }).toArray();
        double z = LogSum.of(all);
        PartitionChain c = chain(ls, oc, mix, seed);
        c.strongBlockShare(strongShare);
        Map<Long, Integer> visits = new HashMap<>();
        for (long t = 0; t < steps; t++) {
            c.step();
            int[] sets = c.dagSets();
            int[] pa = new int[n];
            for (int i = 0; i < n; i++) {
                pa[i] = DagEnumeration.mask(ls, i, sets[i]);
            }
            visits.merge(key(pa, n), 1, Integer::sum);
        }
        double tv = 0;
        for (Map.Entry<Long, Double> e : exact.entrySet()) {
            tv += Math.abs(Math.exp(e.getValue() - z) - visits.getOrDefault(e.getKey(), 0) / (double) steps);
        }
        for (Long k : visits.keySet()) {
            assertTrue(exact.containsKey(k), "the chain visited a DAG that is not admitted: " + Long.toHexString(k));
        }
        return tv / 2;
    }

    @Test
    void eachMoveAloneLeavesThePosteriorInvariant() {
        LocalScores ls = TestStores.scores(TestStores.random(4, 2, 3, 60, 11));
        OrderConstraints none = OrderConstraints.none(4);
        for (PartitionChain.Mix mix : List.of(EDGES, PARENTS, REVERSAL, BLOCKS, PARTITIONS, PartitionChain.Mix.DEFAULT)) {
            double tv = totalVariation(ls, none, mix, 400_000, 3);
            assertTrue(tv < 0.05, mix + ": total variation " + tv);
        }
    }

    @Test
    void unequalCandidateSetsKeepTheHastingsRatioRight() {
        // windowed candidates: the end variables have fewer, so the reversal's K_i / K_j is not 1
        LocalScores ls = TestStores.scores(TestStores.scaled(TestStores.windowed(5, 1, 2, 300, 29), 0.02));
        for (PartitionChain.Mix mix : List.of(EDGES, REVERSAL, BLOCKS, PartitionChain.Mix.DEFAULT)) {
            double tv = totalVariation(ls, OrderConstraints.none(5), mix, 400_000, 9);
            assertTrue(tv < 0.05, mix + " with windowed candidates: total variation " + tv);
        }
    }

    @Test
    void movesRespectForbiddenRequiredEdgesAndTiers() {
        ScoreStore s = TestStores.random(4, 2, 3, 60, 19);
        String[] v = s.variables().stream().map(x -> x.name()).toArray(String[]::new);
        LocalScores fr = TestStores.scores(s, List.of(new EdgeRule(v[1], v[2]), new EdgeRule(v[2], v[1])),
                List.of(new EdgeRule(v[0], v[3])));
        OrderConstraints tiers = OrderConstraints.of(fr, TestStores.tiers(s, new int[] {0, 3}, new int[] {1, 2}));
        for (PartitionChain.Mix mix : List.of(EDGES, PARENTS, REVERSAL, BLOCKS, PartitionChain.Mix.DEFAULT)) {
            double tv = totalVariation(fr, tiers, mix, 400_000, 5);
            assertTrue(tv < 0.05, mix + " under forbid + require + tiers: total variation " + tv);
        }
    }

    @Test
    void thePartitionIsAlwaysTheLayeringOfTheDag() {
        LocalScores ls = TestStores.scores(TestStores.windowed(12, 3, 3, 300, 23));
        PartitionChain c = chain(ls, OrderConstraints.none(12), PartitionChain.Mix.DEFAULT, 7);
        for (int t = 0; t < 50_000; t++) {
            c.step();
            if (t % 997 == 0) {
                int[] sets = c.dagSets();
                int[] pa = new int[12];
                for (int i = 0; i < 12; i++) {
                    pa[i] = DagEnumeration.mask(ls, i, sets[i]);
                }
                assertArrayEquals(PartitionMcmcTest.layering(pa, 12), c.elements(), "step " + t);
                assertEquals(c.logScoreOf(c.elements()), c.logScore(), 1e-8 * Math.abs(c.logScore()), "step " + t);
            }
        }
    }

    /**
     * Following a DAG move by relayering and rescoring only what moved, and the block move's DAG
     * draw taking each exp once, are changes of speed alone: against the former step (full
     * relayering and rescoring of all n nodes — the brute force — and each exp taken twice), the same
     * seed gives the same DAG and partition after every step, and the same log π(Λ) up to the order
     * of a sum; on a 12-variable windowed store (deep layerings, many moves that shift a layer) and
     * a 60-variable one (many nodes the incremental follow skips).
     */
    @Test
    void followingOnlyWhatMovedChangesNoDraw() {
        for (int n : new int[] {12, 60}) {
            LocalScores ls = TestStores.scores(TestStores.windowed(n, 3, 3, 300, 23 + n));
            PartitionChain fast = chain(ls, OrderConstraints.none(n), PartitionChain.Mix.DEFAULT, 11);
            PartitionChain full = chain(ls, OrderConstraints.none(n), PartitionChain.Mix.DEFAULT, 11);
            full.former();
            for (int t = 0; t < 30_000; t++) {
                fast.step();
                full.step();
                assertArrayEquals(full.dagSets(), fast.dagSets(), "n = " + n + ", step " + t);
                assertArrayEquals(full.elements(), fast.elements(), "n = " + n + ", step " + t);
                assertEquals(full.logScore(), fast.logScore(), 1e-9 * Math.abs(full.logScore()), "n = " + n + ", step " + t);
            }
            assertEquals(fast.logScoreOf(fast.elements()), fast.logScore(), 1e-8 * Math.abs(fast.logScore()), "n = " + n);
        }
    }

    /**
     * The block move with its block always v and its three strongest candidates (five variables, each
     * with the other four as candidates, so the strongest three are a choice), alone and in the
     * default mix with both kinds of block, against the exact posterior of every DAG on 5 nodes
     * (brute-force enumeration, 29,281 DAGs; OEIS A003024); and with the uniform blocks only (share 0,
     * the former move) for comparison.
     */
    @Test
    void blocksOnTheStrongestCandidatesLeaveThePosteriorInvariant() {
        LocalScores ls = TestStores.scores(TestStores.random(5, 2, 2, 300, 13));
        OrderConstraints none = OrderConstraints.none(5);
        for (double share : new double[] {1, 0.5, 0}) {
            for (PartitionChain.Mix mix : List.of(BLOCKS, PartitionChain.Mix.DEFAULT)) {
                double tv = totalVariation(ls, none, mix, 400_000, 17, share);
                assertTrue(tv < 0.05, mix + ", strongest-candidate blocks " + share + ": total variation " + tv);
            }
        }
    }
}
