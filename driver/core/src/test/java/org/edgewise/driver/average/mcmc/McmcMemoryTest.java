package org.edgewise.driver.average.mcmc;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.TestStores;
import org.edgewise.driver.average.convergence.ConvergenceTargets;
import org.edgewise.driver.average.partition.PartitionChain;

/** The memory an MCMC run plans before sampling, against recounts and by hand. */
class McmcMemoryTest {

    @Test
    void tableBytesAreWhatTheBuiltTablesHold() {
        // recount: the tables actually built, 8 bytes per double
        LocalScores ls = TestStores.scores(TestStores.windowed(30, 3, 2, 300, 5));
        McmcSettings s = McmcSettings.defaults(1);
        McmcMemory plan = McmcMemory.plan(ls, s, 1);
        ChildTables built = new ChildTables(ls, s.tableBudget());
        long bytes = 0;
        int tabulated = 0;
        for (int i = 0; i < 30; i++) {
            if (built.table(i) != null) {
                bytes += 8L * built.table(i).length;
                tabulated++;
                assertEquals(1 << ls.candidates(i).length, built.table(i).length);
            }
        }
        assertEquals(bytes, plan.tableBytes());
        assertEquals(30, tabulated);
        assertEquals(tabulated, plan.tabulated());
        // a budget for half of them: fewest candidates first, the rest summed directly with a cache per chain
        McmcMemory half = McmcMemory.plan(ls, s.withTableBudget(bytes / 2), 3);
        assertTrue(half.tabulated() < 30 && half.tableBytes() <= bytes / 2, half.toString());
        assertEquals(30 - half.tabulated(), half.direct());
        assertEquals(McmcMemory.STATE_BYTES_PER_VARIABLE * 30L + half.direct() * McmcMemory.CACHE_BYTES, half.chainBytes());
        assertEquals(3, half.rungs());
    }

    @Test
    void drawStoreAndStateBytesByHand() {
        // 5 variables, every other variable a candidate: 4·5 = 20 candidate edges; a fixed run storing 100 draws.
        // Per draw 4·20 (edge floats) + 8·5 (state) + 96 (headers, step, score) = 216 bytes; 2·100 draws at most
        // → 43,200 bytes per chain; state 84·5 = 420 bytes per chain; tables 5 × 8·2^4 = 640 bytes.
        LocalScores ls = TestStores.scores(TestStores.random(5, 2, 2, 100, 3));
        McmcSettings s = McmcSettings.defaults(1).withChains(4, 100);
        McmcMemory plan = McmcMemory.plan(ls, s, 2);
        assertEquals(640, plan.tableBytes());
        assertEquals(43_200, plan.drawBytes());
        assertEquals(420, plan.chainBytes());
        assertEquals(4 * 5 * 5, plan.sharedBytes()); // the candidate index, 4n² bytes
        assertEquals(640 + 100 + 4 * (2 * 420 + 43_200), plan.totalBytes());
        // with features: + 2·5² bits = 50 bits → one 8-byte word per draw
        assertEquals(2 * 100 * (216 + 8), McmcMemory.plan(ls, s.withFeatures(true), 2).drawBytes());
        // until converged: the draws the MCSE target needs are kept, max(draws, 1,000, ⌈1/(chains·0.01²)⌉) = 2,500 per
        // chain for 4 chains (ConvergenceTargets.drawsPerChain), stored up to twice that
        assertEquals(2 * 2500 * 216, McmcMemory.plan(ls, s.untilConverged(1_000_000, 10), 2).drawBytes());
    }

    @Test
    void partitionChainsAddTheirDagAndSetIndex() {
        // 5 variables, each with the other 4 as candidates and d = 2: 1 + 4 + 6 = 11 allowed sets → a set index of
        // 32 slots (the power of two with load ≤ 1/2) of 12 bytes = 384 bytes per child, 1,920 in all; children
        // bitsets 5 × 8 bytes = 40; partition state and scratch (4·4 + 9·8 + 14·4 + 1 + 3·4) · 5 = 785 bytes; the index of
        // who has whom as a candidate, 4 bytes × 20 candidate edges = 80: 2,825 per chain
        LocalScores ls = TestStores.scores(TestStores.random(5, 2, 2, 100, 3));
        assertEquals(2_825, PartitionChain.extraBytes(ls));
        McmcSettings s = McmcSettings.defaults(1).withChains(4, 100);
        assertEquals(McmcMemory.plan(ls, s, 1).totalBytes() + 4 * 2_825, McmcMemory.plan(ls, s, 1, 2_825).totalBytes());
    }

    @Test
    void refusalNamesThePlanAndTheHeap() {
        McmcMemory plan = new McmcMemory(8L << 20, 200, 0, 1L << 20, 0, 32L << 20, 4, 1);
        assertEquals(140L << 20, plan.totalBytes());
        plan.check(140L << 20, 512L << 20); // fits exactly: no refusal
        McmcMemory.TooLittleHeap e = assertThrows(McmcMemory.TooLittleHeap.class, () -> plan.check(100L << 20, 512L << 20));
        assertEquals("the MCMC run needs about 140.0 MiB (per-child tables 8.0 MiB for 200 of 200 children, draw stores "
                + "128.0 MiB, chain state 4.0 MiB) but the heap has 100.0 MiB free of 512.0 MiB; give the JVM more heap "
                + "(-Xmx), or store fewer draws or run fewer chains", e.getMessage());
    }
}
