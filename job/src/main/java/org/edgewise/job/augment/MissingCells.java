package org.edgewise.job.augment;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.average.augment.DrawnNetwork;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.job.input.Block;

/**
 * The partition-local steps of data augmentation on encoded blocks (cells {@link Block#MISSING}
 * where missing): splitting complete from incomplete rows, the observed marginals, the largest joint
 * of one row's missing cells, and the redraw of every missing cell under a {@link DrawnNetwork}.
 * Also the sum of two tables' family counts (complete rows counted once, plus each round's
 * completed rows).
 */
public final class MissingCells {
    private MissingCells() {
    }

    /** The rows of {@code b} that are complete ({@code complete}) or have a missing cell. */
    public static Block select(Block b, boolean complete) {
        byte[][] cols = b.cols();
        int n = cols.length;
        int[] keep = new int[b.rows()];
        int k = 0;
        for (int t = 0; t < b.rows(); t++) {
            boolean missing = false;
            for (int v = 0; v < n && !missing; v++) {
                missing = (cols[v][t] & 0xFF) == Block.MISSING;
            }
            if (missing != complete) {
                keep[k++] = t;
            }
        }
        byte[][] out = new byte[n][k];
        for (int v = 0; v < n; v++) {
            for (int i = 0; i < k; i++) {
                out[v][i] = cols[v][keep[i]];
            }
        }
        long[] w = null;
        if (b.weights() != null) {
            w = new long[k];
            for (int i = 0; i < k; i++) {
                w[i] = b.weights()[keep[i]];
            }
        }
        return new Block(k, out, w);
    }

    /** Rows {@code b} stands for: its weights' sum, or its rows when unweighted. */
    public static long units(Block b) {
        if (b.weights() == null) {
            return b.rows();
        }
        long u = 0;
        for (int t = 0; t < b.rows(); t++) {
            u += b.weights()[t];
        }
        return u;
    }

    /** Per variable (256 slots each, flat), the count of each state among its observed cells (weighted rows by their weight). */
    public static long[] observed(Block b) {
        byte[][] cols = b.cols();
        long[] h = new long[cols.length * 256];
        long[] w = b.weights();
        for (int v = 0; v < cols.length; v++) {
            for (int t = 0; t < b.rows(); t++) {
                h[v * 256 + (cols[v][t] & 0xFF)] += w == null ? 1 : w[t];
            }
            h[v * 256 + Block.MISSING] = 0;
        }
        return h;
    }

    public static long[] sum(long[] a, long[] b) {
        long[] s = a.clone();
        for (int i = 0; i < s.length; i++) {
            s[i] += b[i];
        }
        return s;
    }

    /**
     * The largest joint of one row's missing cells in {@code b}: {size, then the row's missing
     * variables} ({size 1} when no row has one).
     */
    public static long[] largestJoint(Block b, int[] arity) {
        byte[][] cols = b.cols();
        long[] best = {1};
        int[] miss = new int[cols.length];
        for (int t = 0; t < b.rows(); t++) {
            int m = 0;
            for (int v = 0; v < cols.length; v++) {
                if ((cols[v][t] & 0xFF) == Block.MISSING) {
                    miss[m++] = v;
                }
            }
            long size = DrawnNetwork.jointSize(arity, Arrays.copyOf(miss, m));
            if (size > best[0]) {
                best = new long[m + 1];
                best[0] = size;
                for (int i = 0; i < m; i++) {
                    best[i + 1] = miss[i];
                }
            }
        }
        return best;
    }

    public static long[] larger(long[] a, long[] b) {
        return b[0] > a[0] ? b : a;
    }

    /** A copy of {@code b} whose missing cells are drawn from their conditional under {@code net}. */
    public static Block complete(Block b, DrawnNetwork net, SplittableRandom rng) {
        byte[][] in = b.cols();
        int n = in.length;
        byte[][] cols = new byte[n][];
        for (int v = 0; v < n; v++) {
            cols[v] = in[v].clone();
        }
        int[] x = new int[n];
        int[] miss = new int[n];
        for (int t = 0; t < b.rows(); t++) {
            int m = 0;
            for (int v = 0; v < n; v++) {
                int s = cols[v][t] & 0xFF;
                if (s == Block.MISSING) {
                    miss[m++] = v;
                    x[v] = 0;
                } else {
                    x[v] = s;
                }
            }
            int[] mm = Arrays.copyOf(miss, m);
            net.complete(x, mm, rng);
            for (int v : mm) {
                cols[v][t] = (byte) x[v];
            }
        }
        return new Block(b.rows(), cols, b.weights());
    }

    /** The counts of two tables of the same family (configurations merged in increasing order). */
    public static FamilyCounts add(FamilyCounts a, FamilyCounts b, int r) {
        List<Long> configs = new ArrayList<>();
        long[] counts = new long[(a.configs().length + b.configs().length) * r];
        int i = 0;
        int j = 0;
        int m = 0;
        while (i < a.configs().length || j < b.configs().length) {
            long ca = i < a.configs().length ? a.configs()[i] : Long.MAX_VALUE;
            long cb = j < b.configs().length ? b.configs()[j] : Long.MAX_VALUE;
            long c = Math.min(ca, cb);
            for (int k = 0; k < r; k++) {
                counts[m * r + k] = (ca == c ? a.counts()[i * r + k] : 0) + (cb == c ? b.counts()[j * r + k] : 0);
            }
            if (ca == c) {
                i++;
            }
            if (cb == c) {
                j++;
            }
            configs.add(c);
            m++;
        }
        return new FamilyCounts(a.child(), a.parents(), configs.stream().mapToLong(Long::longValue).toArray(),
                Arrays.copyOf(counts, m * r));
    }
}
