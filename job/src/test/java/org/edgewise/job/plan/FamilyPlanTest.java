package org.edgewise.job.plan;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.edgewise.driver.store.ParentSets;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.InMemoryTally;
import org.junit.jupiter.api.Test;

/** The plan against exact enumeration: families, cover sets, batches. No Spark. */
class FamilyPlanTest {
    static final List<String> NAMES = List.of("a", "b", "c", "d", "e", "f");

    static int[][] allOthers(int n) {
        return Constraints.resolve(NAMES.subList(0, n), List.of(), List.of(), List.of(), 3).candidates();
    }

    @Test
    void unprunedFamiliesFollowTheStoreOrderAndCoversAreTheLargestSubsets() {
        int n = 6;
        int d = 2;
        int[] arity = {2, 3, 2, 4, 2, 3};
        FamilyPlan plan = FamilyPlan.families(arity, allOthers(n), new int[n][0], d);
        // store order, as the independent InMemoryTally enumerates it: by child, size, lexicographic
        int f = 0;
        for (int child = 0; child < n; child++) {
            int finalChild = child;
            int[] others = java.util.stream.IntStream.range(0, n).filter(v -> v != finalChild).toArray();
            for (int size = 0; size <= d; size++) {
                for (int[] u : ParentSets.subsets(others, size)) {
                    assertEquals(child, plan.child(f));
                    assertArrayEquals(u, plan.parents(f), "family " + f);
                    f++;
                }
            }
        }
        assertEquals(f, plan.familyCount());
        // exactly the C(6,3) = 20 three-subsets
        assertEquals(20, plan.coverCount());
        Set<String> covers = new HashSet<>();
        for (int s = 0; s < plan.coverCount(); s++) {
            assertEquals(d + 1, plan.cover(s).length);
            covers.add(Arrays.toString(plan.cover(s)));
        }
        for (int[] s : ParentSets.subsets(new int[] {0, 1, 2, 3, 4, 5}, 3)) {
            assertTrue(covers.contains(Arrays.toString(s)), Arrays.toString(s));
        }
        for (int g = 0; g < plan.familyCount(); g++) {
            int[] cover = plan.cover(plan.coverOf(g));
            assertTrue(Arrays.binarySearch(cover, plan.child(g)) >= 0);
            for (int p : plan.parents(g)) {
                assertTrue(Arrays.binarySearch(cover, p) >= 0);
            }
        }
        // cells: Π arities of each cover
        long cells = 0;
        for (int[] s : ParentSets.subsets(new int[] {0, 1, 2, 3, 4, 5}, 3)) {
            cells += (long) arity[s[0]] * arity[s[1]] * arity[s[2]];
        }
        assertEquals(cells, plan.totalCells());
    }

    @Test
    void requiredParentsAreInEveryFamilyOfTheirChild() {
        Constraints c = Constraints.resolve(NAMES, List.of(new org.edgewise.driver.store.EdgeRule("a", "c")),
                List.of(new org.edgewise.driver.store.EdgeRule("b", "c")), List.of(), 2);
        FamilyPlan plan = FamilyPlan.families(new int[] {2, 2, 2, 2, 2, 2}, c.candidates(), c.required(), 2);
        int ofC = 0;
        for (int f = 0; f < plan.familyCount(); f++) {
            if (plan.child(f) == 2) {
                ofC++;
                assertTrue(Arrays.binarySearch(plan.parents(f), 1) >= 0);
                assertTrue(Arrays.binarySearch(plan.parents(f), 0) < 0);
            }
        }
        // c: {b} plus {b, x} for x in {d, e, f}
        assertEquals(4, ofC);
    }

    @Test
    void batchesFitTheBudgetAndAnOversizedSetIsRefused() {
        int[] arity = {4, 4, 4, 4};
        FamilyPlan plan = FamilyPlan.families(arity, allOthers(4), new int[4][0], 1);
        // six pairs of 16 cells; 12 bytes per cell -> a 400-byte budget holds two pairs per batch
        List<int[]> batches = plan.batches(400, NAMES);
        assertEquals(3, batches.size());
        for (int[] b : batches) {
            long cells = 0;
            for (int s : b) {
                cells += plan.coverCells(s);
            }
            assertTrue(cells * FamilyPlan.BYTES_PER_CELL <= 400);
        }
        UserError e = assertThrows(UserError.class, () -> plan.batches(100, NAMES));
        assertEquals("cannot fit the tally: the variable set {a(4), b(4)} needs 16 count cells (192 B) in one task, "
                + "more than --memory-budget 100 B; lower --max-parents, use --candidates K, exclude or discretise "
                + "wide variables, or raise --memory-budget", e.getMessage());
    }

    @Test
    void candidatePruningKeepsRequiredAndBestGains() {
        int[][] cand = {{1, 2, 3}, {0, 2, 3}, {0, 1, 3}, {0, 1, 2}};
        int[][] req = {{3}, {}, {}, {}};
        double[][] gain = {
            {0, 5, 4, -1},
            {1, 0, 1, 0.5},
            {0, 0, 0, 0},
            {-3, -2, -1, 0},
        };
        int[][] kept = Candidates.prune(cand, req, gain, 2);
        assertArrayEquals(new int[] {1, 3}, kept[0]); // required 3 kept, then the best gain (b)
        assertArrayEquals(new int[] {0, 2}, kept[1]); // tie between a and c at 1: both kept
        assertArrayEquals(new int[] {0, 1}, kept[2]); // all ties: lowest indices first
        assertArrayEquals(new int[] {1, 2}, kept[3]); // negative gains still ranked
    }
}
