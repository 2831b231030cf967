package org.edgewise.job.input;

import java.io.Serializable;

/**
 * Up to {@link #ROWS} encoded rows, column-major: {@code cols[v][t]} is the state index of
 * variable v in row t, as an unsigned byte (so at most 256 states). Column-major so that a
 * counting kernel streams over only the columns of the variable set it counts.
 *
 * <p>Memory: one byte per cell, {@code rows × variables} bytes plus an array header per column.
 */
public final class Block implements Serializable {
    private static final long serialVersionUID = 1L;
    /** Rows per block: a block's columns stay in L2 cache while a kernel loops over them. */
    public static final int ROWS = 8192;

    private final int rows;
    private final byte[][] cols;

    public Block(int rows, byte[][] cols) {
        this.rows = rows;
        this.cols = cols;
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
     */
    public long[] fingerprint() {
        long sum = 0;
        long xor = 0;
        for (int t = 0; t < rows; t++) {
            long h = 0x9E3779B97F4A7C15L;
            for (byte[] c : cols) {
                h = (h ^ (c[t] & 0xFF)) * 0x100000001B3L;
            }
            h = mix(h);
            sum += h;
            xor ^= h;
        }
        return new long[] {rows, sum, xor};
    }

    /** The splitmix64 finaliser (Steele, Lea &amp; Flood 2014). */
    static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }
}
