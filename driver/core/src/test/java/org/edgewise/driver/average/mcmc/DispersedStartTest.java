package org.edgewise.driver.average.mcmc;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.TestStores;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.givenorder.OrderSum;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;

/**
 * The dispersed starts: the two chains of a pair start on both sides of every pair of variables
 * (checked pair by pair: one order puts a before b, the other b before a, wherever the constraints
 * allow), and the first pair's order is hill-climbed (its log evidence, by the closed form given an
 * order, {@link OrderSum}, at least that of the random order it climbed from).
 */
class DispersedStartTest {

    private static int[] positions(int[] order) {
        int[] pos = new int[order.length];
        for (int p = 0; p < order.length; p++) {
            pos[order[p]] = p;
        }
        return pos;
    }

    @Test
    void aPairStartsOnBothSidesOfEveryPairOfVariables() {
        OrderConstraints none = OrderConstraints.none(9);
        DispersedStart[] s = DispersedStart.plan(4, new SplittableRandom(3));
        assertEquals(s[0].pairSeed(), s[1].pairSeed());
        for (int pair = 0; pair < 2; pair++) {
            int[] a = positions(s[2 * pair].order(none, null));
            int[] b = positions(s[2 * pair + 1].order(none, null));
            for (int u = 0; u < 9; u++) {
                for (int v = 0; v < 9; v++) {
                    if (u != v) {
                        assertTrue((a[u] < a[v]) != (b[u] < b[v]), "pair " + pair + ": " + u + ", " + v);
                    }
                }
            }
        }
    }

    @Test
    void underTiersTheMirrorKeepsTheTiersAndReversesWithinThem() {
        ScoreStore st = TestStores.random(6, 2, 2, 100, 5);
        LocalScores ls = TestStores.scores(st);
        OrderConstraints oc = OrderConstraints.of(ls, TestStores.tiers(st, new int[] {0, 1, 2}, new int[] {3, 4, 5}));
        for (long seed = 1; seed <= 20; seed++) {
            DispersedStart[] s = DispersedStart.plan(2, new SplittableRandom(seed));
            int[] first = s[0].order(oc, null);
            int[] mirror = s[1].order(oc, null);
            assertTrue(oc.allows(first) && oc.allows(mirror));
            int[] a = positions(first);
            int[] b = positions(mirror);
            for (int u = 0; u < 6; u++) {
                for (int v = 0; v < 6; v++) {
                    if (u != v && (u < 3) == (v < 3)) {
                        assertTrue((a[u] < a[v]) != (b[u] < b[v]), "within a tier: " + u + ", " + v);
                    }
                }
            }
        }
    }

    @Test
    void theFirstPairClimbsAndBothOfItsChainsClimbToTheSameOrder() {
        ScoreStore st = TestStores.random(10, 2, 2, 400, 8);
        LocalScores ls = TestStores.scores(st);
        OrderConstraints none = OrderConstraints.none(10);
        ChildTables tables = new ChildTables(ls, 1L << 26);
        DispersedStart.Climb climb = OrderMcmc.climb(ls, tables, none, ChainSet.candidatePositions(ls), ChainSet.edgeOffsets(ls));
        DispersedStart[] s = DispersedStart.plan(4, new SplittableRandom(1));
        int[] random = s[0].order(none, null);
        int[] climbed = s[0].order(none, climb);
        assertTrue(OrderSum.evaluate(ls, climbed).logEvidence() >= OrderSum.evaluate(ls, random).logEvidence());
        int[] mirror = s[1].order(none, climb);
        int[] reversed = new int[10];
        for (int p = 0; p < 10; p++) {
            reversed[p] = climbed[9 - p];
        }
        assertArrayEquals(reversed, mirror);
        assertTrue(s[0].climbed() && s[1].climbed() && !s[2].climbed() && !s[3].climbed());
        assertArrayEquals(s[2].order(none, null), s[2].order(none, climb), "only the first pair climbs");
    }
}
