package org.edgewise.job.plan;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.edgewise.driver.UserError;
import org.junit.jupiter.api.Test;

/**
 * Sizes are planned before anything large is allocated: the family count is a sum of binomial
 * coefficients checked against the plan itself (exact enumeration) and against closed forms;
 * impossible plans and budgets are refused at once, with the figure and what to change. No Spark.
 */
class PlanSizeTest {
    static final List<String> NAMES = List.of("a", "b", "c", "d", "e", "f", "g");

    @Test
    void theCountMatchesThePlanItBounds() {
        int[] arity = {2, 3, 2, 2, 3, 2, 2};
        for (int d = 0; d <= 6; d++) {
            Constraints c = Constraints.resolve(NAMES, List.of(), List.of(new org.edgewise.driver.store.EdgeRule("a", "b")),
                    List.of(List.of("a", "b"), List.of("c", "d", "e", "f", "g")), Math.max(d, 1));
            int dd = d;
            if (d == 0) {
                continue; // a required edge needs d ≥ 1
            }
            FamilyPlan plan = FamilyPlan.families(arity, c.candidates(), c.required(), dd);
            assertEquals(plan.familyCount(), FamilyPlan.familyCount(c.candidates(), c.required(), dd), 0, "d = " + d);
        }
        // closed form without constraints: n · Σ_{k≤d} C(n−1, k); n = 30, d = 10 (binomial sums, exact in double)
        int n = 30;
        int[][] all = new int[n][];
        for (int i = 0; i < n; i++) {
            int me = i;
            all[i] = java.util.stream.IntStream.range(0, n).filter(v -> v != me).toArray();
        }
        double sum = 0;
        for (int k = 0; k <= 10; k++) {
            sum += binomial(29, k);
        }
        assertEquals(30 * sum, FamilyPlan.familyCount(all, new int[n][0], 10), 0);
        // every subset of the 29 others: 30 · 2^29
        assertEquals(30.0 * (1 << 29), FamilyPlan.familyCount(all, new int[n][0], 29), 0);
    }

    static double binomial(int n, int k) {
        double b = 1;
        for (int i = 0; i < k; i++) {
            b = b * (n - i) / (i + 1);
        }
        return Math.rint(b);
    }

    @Test
    void aPlanTooLargeIsRefusedWithTheFigure() {
        long gib = 1L << 30;
        // the case: 30 columns, --max-parents 10
        double families = FamilyPlan.familyCount(all(30), new int[30][0], 10);
        UserError e = assertThrows(UserError.class, () -> FamilyPlan.checkFamilyCount(families, 30, 10, 4 * gib));
        assertEquals("cannot plan the tally: 30 variables with --max-parents 10 give " + String.format(java.util.Locale.ROOT,
                "%,.0f", families) + " families, at least " + FamilyPlan.bytes(families * 160) + " on the driver, more"
                + " than half its memory (4 GB); lower --max-parents or use --candidates K", e.getMessage());
        FamilyPlan.checkFamilyCount(FamilyPlan.familyCount(all(30), new int[30][0], 3), 30, 3, 4 * gib);
    }

    @Test
    void aBudgetLargerThanTheHeapIsRefused() {
        UserError e = assertThrows(UserError.class,
                () -> FamilyPlan.checkBudget(100L << 30, 4L << 30, "this JVM"));
        assertEquals("--memory-budget 100 GB is more than the memory of this JVM (4 GB); give at most that, or give this"
                + " JVM more memory", e.getMessage());
    }

    static int[][] all(int n) {
        int[][] a = new int[n][];
        for (int i = 0; i < n; i++) {
            int me = i;
            a[i] = java.util.stream.IntStream.range(0, n).filter(v -> v != me).toArray();
        }
        return a;
    }
}
