package org.edgewise.driver.network;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.util.SplittableRandom;
import java.util.function.LongConsumer;
import org.edgewise.driver.CsvFields;

/**
 * Forward (ancestral) sampling of a {@link Network} (Henrion 1988, "probabilistic logic
 * sampling"): visit the variables in a topological order and draw each from its CPT row given
 * the parents already drawn. Draws use one {@link SplittableRandom} seeded by the caller, so a
 * seed fixes the sample. A state is drawn by inversion: the first k with u &lt; Σ_{k'≤k} p_k'.
 *
 * <p>Memory: the cumulative CPTs (8 bytes per CPT cell) and one int per variable for the
 * current row; rows are streamed, never held.
 */
public final class ForwardSampler {
    private final Network net;
    private final double[][] cumulative;

    public ForwardSampler(Network net) {
        this.net = net;
        int n = net.size();
        cumulative = new double[n][];
        for (int i = 0; i < n; i++) {
            int r = net.arity(i);
            double[] c = net.cpt()[i].clone();
            for (int j = 0; j < c.length / r; j++) {
                double s = 0;
                for (int k = 0; k < r; k++) {
                    s += c[j * r + k];
                    c[j * r + k] = s;
                }
                c[j * r + r - 1] = Double.POSITIVE_INFINITY; // rounding never leaves u unassigned
            }
            cumulative[i] = c;
        }
    }

    /** Draws one row into {@code state} (indexed by variable). */
    public void draw(SplittableRandom rng, int[] state) {
        for (int v : net.topoOrder()) {
            int r = net.arity(v);
            int base = net.configuration(v, state) * r;
            double u = rng.nextDouble();
            double[] c = cumulative[v];
            int k = 0;
            while (u >= c[base + k]) {
                k++;
            }
            state[v] = k;
        }
    }

    /** {@code rows} rows drawn with {@code seed}: {@code out[t][v]} = state index of variable v in row t. */
    public int[][] sample(int rows, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        int[][] out = new int[rows][net.size()];
        for (int[] row : out) {
            draw(rng, row);
        }
        return out;
    }

    /**
     * Writes a header and {@code rows} sampled rows as CSV (state labels, columns in file order,
     * RFC 4180 quoting) to {@code out}. {@code progress} receives the number of rows written
     * since its last call, every 65,536 rows and at the end.
     */
    public void writeCsv(long rows, long seed, OutputStream out, LongConsumer progress) throws IOException {
        int n = net.size();
        byte[][][] labels = new byte[n][][];
        StringBuilder header = new StringBuilder();
        for (int i = 0; i < n; i++) {
            labels[i] = new byte[net.arity(i)][];
            for (int k = 0; k < net.arity(i); k++) {
                labels[i][k] = CsvFields.quote(net.states().get(i).get(k)).getBytes(StandardCharsets.UTF_8);
            }
            header.append(i == 0 ? "" : ",").append(CsvFields.quote(net.names().get(i)));
        }
        out.write(header.append('\n').toString().getBytes(StandardCharsets.UTF_8));
        SplittableRandom rng = new SplittableRandom(seed);
        int[] state = new int[n];
        byte[] buf = new byte[1 << 16];
        int len = 0;
        long pending = 0;
        for (long row = 0; row < rows; row++) {
            draw(rng, state);
            for (int i = 0; i < n; i++) {
                byte[] l = labels[i][state[i]];
                if (len + l.length + 1 > buf.length) {
                    out.write(buf, 0, len);
                    len = 0;
                    if (l.length + 1 > buf.length) {
                        buf = new byte[2 * (l.length + 1)];
                    }
                }
                System.arraycopy(l, 0, buf, len, l.length);
                len += l.length;
                buf[len++] = (byte) (i == n - 1 ? '\n' : ',');
            }
            if (++pending == 65_536) {
                progress.accept(pending);
                pending = 0;
            }
        }
        out.write(buf, 0, len);
        progress.accept(pending);
    }
}
