package org.edgewise.job.count;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.edgewise.job.input.Block;
import org.junit.jupiter.api.Test;

/**
 * The weighted kernel against the plain one on the expansion (the independent method: each row
 * repeated w times): the same dense counts and the same fingerprint. No Spark.
 */
class WeightedKernelTest {
    @Test
    void weightedBlocksCountAndFingerprintAsTheirExpansion() {
        Random rnd = new Random(5L); // fixed seed: common practice
        int n = 4;
        int[] arity = {2, 3, 4, 5};
        int lines = Block.ROWS + 77; // two weighted blocks, the second partial
        int[][] table = new int[lines][n];
        long[] w = new long[lines];
        List<int[]> expanded = new ArrayList<>();
        for (int t = 0; t < lines; t++) {
            for (int v = 0; v < n; v++) {
                table[t][v] = rnd.nextInt(arity[v]);
            }
            w[t] = 1 + rnd.nextInt(6); // even and odd weights: the xor part of the fingerprint sees both
            for (long k = 0; k < w[t]; k++) {
                expanded.add(table[t]);
            }
        }
        List<Block> weighted = blocks(table.length, t -> table[t], w);
        List<Block> plain = blocks(expanded.size(), expanded::get, null);
        int[][] sets = {{0}, {0, 1, 2}, {0, 1, 3}, {1, 3}, {2, 3}, {0, 1, 2, 3}};
        CoverBatch batch = new CoverBatch(sets, arity);
        assertArrayEquals(batch.countPartition(plain.iterator()), batch.countPartition(weighted.iterator()));
        assertArrayEquals(fingerprint(plain), fingerprint(weighted));
    }

    private static List<Block> blocks(int rows, java.util.function.IntFunction<int[]> row, long[] weights) {
        List<Block> out = new ArrayList<>();
        for (int start = 0; start < rows; start += Block.ROWS) {
            int m = Math.min(Block.ROWS, rows - start);
            byte[][] cols = new byte[4][m];
            for (int t = 0; t < m; t++) {
                for (int v = 0; v < 4; v++) {
                    cols[v][t] = (byte) row.apply(start + t)[v];
                }
            }
            out.add(new Block(m, cols, weights == null ? null : java.util.Arrays.copyOfRange(weights, start, start + m)));
        }
        return out;
    }

    /** The job's reduce of the blocks' fingerprints: {rows, Σ, ⊕}. */
    private static long[] fingerprint(List<Block> blocks) {
        long[] f = {0, 0, 0};
        for (Block b : blocks) {
            long[] x = b.fingerprint();
            f[0] += x[0];
            f[1] += x[1];
            f[2] ^= x[2];
        }
        return f;
    }
}
