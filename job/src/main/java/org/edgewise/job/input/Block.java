package org.edgewise.job.input;

import java.io.Serializable;

/**
 * Up to {@link #ROWS} encoded rows, column-major: {@code cols[v][t]} is the state index of
 * variable v in row t, as an unsigned byte (so at most 256 states). Column-major so that a
 * counting kernel streams over only the columns of the variable set it counts.
 *
 * <p>A block of a table of counts also holds each row's weight w ≥ 1 (the number of rows the
 * line stands for); the counting kernels add w where they would add 1.
 *
 * <p>Memory: one byte per cell, {@code rows × variables} bytes plus an array header per column,
 * and eight bytes per row for the weights of a table of counts.
 */
public final class Block implements Serializable {
    private static final long serialVersionUID = 1L;
    /** Rows per block: a block's columns stay in L2 cache while a kernel loops over them. */
    public static final int ROWS = 8192;
    /**
     * The cell value of a missing cell under {@code --missing average} (255: states are 0…254, as
     * at most 255 are allowed); such blocks are completed before any kernel counts them.
     */
    public static final int MISSING = 255;

    private final int rows;
    private final byte[][] cols;
    private final long[] weights;

    public Block(int rows, byte[][] cols) {
        this(rows, cols, null);
    }

    /** @param weights rows each row stands for (each ≥ 1), or null for one each */
    public Block(int rows, byte[][] cols, long[] weights) {
        this.rows = rows;
        this.cols = cols;
        this.weights = weights;
    }

    /** The weights (shared, read-only), or null when every row is one row. */
    public long[] weights() {
        return weights;
    }

    public int rows() {
        return rows;
    }

    /** The columns; shared, not copied — read-only. */
    public byte[][] cols() {
        return cols;
    }

    /**
     * Fingerprint contribution {rows, Σ h, ⊕ h} with h a 64-bit mix of each encoded row; summing
     * and xor-ing make it independent of row order and partitioning.
     *
     * <p>A row of weight w stands for w equal rows, so it adds what those w rows would: w to the
     * row count, w·h to the sum (mod 2^64, as w additions of h would wrap) and h to the xor once
     * when w is odd (h ⊕ h = 0). The fingerprint of a table of counts is therefore exactly that of
     * its expansion to one row per unit, with no expansion.
     */
    public long[] fingerprint() {
        long units = 0;
        long sum = 0;
        long xor = 0;
        for (int t = 0; t < rows; t++) {
            long h = 0x9E3779B97F4A7C15L;
            for (byte[] c : cols) {
                h = (h ^ (c[t] & 0xFF)) * 0x100000001B3L;
            }
            h = mix(h);
            long w = weights == null ? 1 : weights[t];
            units += w;
            sum += w * h;
            xor ^= (w & 1) != 0 ? h : 0;
        }
        return new long[] {units, sum, xor};
    }

    /** The splitmix64 finaliser (Steele, Lea &amp; Flood 2014). */
    static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }
}
