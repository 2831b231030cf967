package org.edgewise.job.input;

import java.io.Serializable;
import java.util.Iterator;
import java.util.NoSuchElementException;
import org.apache.spark.sql.catalyst.InternalRow;

/**
 * Up to {@link Block#ROWS} input rows after the one read of the input, before the global states
 * are known: categorical columns as block-local byte codes (the block's own {@link ColumnStats}
 * holds the code of each value), discretised columns as doubles. {@link Encoding#encode} turns it
 * into a {@link Block} once the statistics of all blocks are merged — so the input is parsed once.
 *
 * <p>Memory: one byte per categorical cell, eight per discretised cell, eight per line for the
 * weight of a table of counts, plus at most
 * {@code cap} strings per column for the local dictionary.
 */
public final class RawBlock implements Serializable {
    private static final long serialVersionUID = 1L;

    final int rows;
    final byte[][] codes;
    final double[][] values;
    /** Rows each line stands for (a table of counts), all ≥ 1; null when every line is one row. */
    final long[] weights;
    final ColumnStats stats;

    RawBlock(int rows, byte[][] codes, double[][] values, long[] weights, ColumnStats stats) {
        this.rows = rows;
        this.codes = codes;
        this.values = values;
        this.weights = weights;
        this.stats = stats;
    }

    public ColumnStats stats() {
        return stats;
    }

    /** Reads a partition's rows into raw blocks, lazily; {@code template} gives the settings. */
    public static Iterator<RawBlock> read(Iterator<InternalRow> rows, ColumnStats template) {
        int n = template.fields.length;
        return new Iterator<>() {
            boolean started;

            @Override
            public boolean hasNext() {
                // always at least one block per partition, so that counts of rows read add up
                return rows.hasNext() || !started;
            }

            @Override
            public RawBlock next() {
                if (!hasNext()) {
                    throw new NoSuchElementException();
                }
                started = true;
                ColumnStats st = template.empty();
                byte[][] codes = new byte[n][];
                double[][] values = new double[n][];
                for (int v = 0; v < n; v++) {
                    if (template.binned[v]) {
                        values[v] = new double[Block.ROWS];
                    } else {
                        codes[v] = new byte[Block.ROWS];
                    }
                }
                long[] weights = template.weightField >= 0 ? new long[Block.ROWS] : null;
                int t = 0;
                while (t < Block.ROWS && rows.hasNext()) {
                    if (st.add(rows.next(), codes, values, weights, t)) {
                        t++;
                    }
                }
                for (int v = 0; v < n; v++) {
                    if (codes[v] != null && t < Block.ROWS) {
                        codes[v] = java.util.Arrays.copyOf(codes[v], t);
                    }
                    if (values[v] != null && t < Block.ROWS) {
                        values[v] = java.util.Arrays.copyOf(values[v], t);
                    }
                }
                if (weights != null && t < Block.ROWS) {
                    weights = java.util.Arrays.copyOf(weights, t);
                }
                return new RawBlock(t, codes, values, weights, st);
            }
        };
    }
}
