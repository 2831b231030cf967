package org.edgewise.job.count;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.edgewise.driver.store.ParentSets;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.Variable;
import org.edgewise.job.input.Block;
import org.junit.jupiter.api.Test;

/** The counting kernel and the marginalisation against a naive per-row recount (exact). No Spark. */
class CoverBatchTest {
    @Test
    void kernelAndMarginalsEqualANaiveRecount() {
        Random rnd = new Random(3L); // fixed seed: common practice
        int n = 5;
        int[] arity = {2, 3, 4, 2, 5};
        int rows = Block.ROWS + 1234; // two blocks, the second partial
        int[][] table = new int[rows][n];
        for (int[] r : table) {
            for (int v = 0; v < n; v++) {
                r[v] = rnd.nextInt(arity[v]);
            }
        }
        List<Block> blocks = new ArrayList<>();
        for (int start = 0; start < rows; start += Block.ROWS) {
            int m = Math.min(Block.ROWS, rows - start);
            byte[][] cols = new byte[n][m];
            for (int t = 0; t < m; t++) {
                for (int v = 0; v < n; v++) {
                    cols[v][t] = (byte) table[start + t][v];
                }
            }
            blocks.add(new Block(m, cols));
        }
        // sets sharing prefixes, a singleton and a full set
        int[][] sets = {{0}, {0, 1, 2}, {0, 1, 3}, {0, 1, 4}, {1, 3}, {2, 4}, {0, 1, 2, 3, 4}};
        CoverBatch batch = new CoverBatch(sets, arity);
        long[] dense = batch.countPartition(blocks.iterator());
        List<Variable> vars = new ArrayList<>();
        for (int v = 0; v < n; v++) {
            List<String> states = new ArrayList<>();
            for (int k = 0; k < arity[v]; k++) {
                states.add("s" + k);
            }
            vars.add(new Variable("v" + v, states));
        }
        for (int s = 0; s < sets.length; s++) {
            int[] set = sets[s];
            // every family inside the set: each member as child, every subset of the others as parents
            for (int child : set) {
                int[] others = java.util.Arrays.stream(set).filter(v -> v != child).toArray();
                for (int size = 0; size <= others.length; size++) {
                    for (int[] parents : ParentSets.subsets(others, size)) {
                        FamilyCounts mine = Marginal.family(dense, batch.offset(s), set, arity, child, parents);
                        FamilyCounts ref = InMemoryTally.count(vars, table, child, parents);
                        assertArrayEquals(ref.configs(), mine.configs());
                        assertArrayEquals(ref.counts(), mine.counts());
                        assertEquals(rows, mine.total());
                    }
                }
            }
        }
        // partition sums: two partitions summed equal one
        long[] a = batch.countPartition(blocks.subList(0, 1).iterator());
        long[] b = batch.countPartition(blocks.subList(1, 2).iterator());
        assertArrayEquals(dense, CoverBatch.sum(a, b));
    }

    @Test
    void blockFingerprintIgnoresRowOrder() {
        byte[][] one = {{0, 1, 2}, {1, 1, 0}};
        byte[][] swapped = {{2, 1, 0}, {0, 1, 1}};
        long[] f1 = new Block(3, one).fingerprint();
        long[] f2 = new Block(3, swapped).fingerprint();
        assertArrayEquals(f1, f2);
        byte[][] changed = {{0, 1, 2}, {1, 0, 0}};
        assertEquals(false, java.util.Arrays.equals(f1, new Block(3, changed).fingerprint()));
    }
}
