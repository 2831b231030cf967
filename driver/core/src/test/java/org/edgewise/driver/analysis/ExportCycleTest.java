package org.edgewise.driver.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.UserError;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;

/**
 * The cycle a consensus graph is refused with ({@link ExportAnalysis#cycle}), on graphs drawn by hand
 * (parents per variable): every arrow named is an edge of the graph, and the cycle closes on its first
 * variable; an acyclic graph has none. And the refusal of a table whose family the store does not count.
 */
class ExportCycleTest {
    static final ScoreStore STORE = InMemoryTally.tally(HeldOutData.variables(2, 2, 2, 2, 2),
            HeldOutData.table(1L, 20, 2, 2, 2, 2, 2), 1, FamilyScore.withDefaults());

    @Test
    void aCycleIsNamedArrowByArrow() {
        // v0 -> v1 -> v2 -> v0, and v3 -> v1, v4 alone
        int[][] parents = {{2}, {0, 3}, {1}, {}, {}};
        String c = ExportAnalysis.cycle(parents, STORE);
        assertEquals("v0 -> v1 -> v2 -> v0", c);
    }

    /**
     * A table needs the counts of its family; the store (d = 1 here) holds none for a child with two
     * parents: refused word for word, naming the family and the store's bound.
     */
    @Test
    void aFamilyTheStoreDoesNotCountIsRefusedByName() {
        assertEquals(0, ExportAnalysis.family(STORE, 2, new int[] {0}).parents()[0]);
        UserError e = assertThrows(UserError.class, () -> ExportAnalysis.family(STORE, 2, new int[] {0, 1}));
        assertEquals("the table of v2 given {v0, v1} needs the counts of that family, which the store does not hold (it counts "
                + "parent sets of size at most 1, among each variable's candidates); tally with a larger maximum parent-set "
                + "size, or export the highest-posterior DAG", e.getMessage());
    }

    @Test
    void aTwoCycleAndAnAcyclicGraph() {
        assertEquals("v3 -> v4 -> v3", ExportAnalysis.cycle(new int[][] {{}, {}, {}, {4}, {3}}, STORE));
        assertNull(ExportAnalysis.cycle(new int[][] {{}, {0}, {0, 1}, {2}, {1, 3}}, STORE));
    }
}
