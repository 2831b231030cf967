package org.edgewise.driver.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;

/**
 * The cycle a consensus graph is refused with ({@link ExportAnalysis#cycle}), on graphs drawn by hand
 * (parents per variable): every arrow named is an edge of the graph, and the cycle closes on its first
 * variable; an acyclic graph has none.
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

    @Test
    void aTwoCycleAndAnAcyclicGraph() {
        assertEquals("v3 -> v4 -> v3", ExportAnalysis.cycle(new int[][] {{}, {}, {}, {4}, {3}}, STORE));
        assertNull(ExportAnalysis.cycle(new int[][] {{}, {0}, {0, 1}, {2}, {1, 3}}, STORE));
    }
}
