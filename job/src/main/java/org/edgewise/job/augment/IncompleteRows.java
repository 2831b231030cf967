package org.edgewise.job.augment;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicInteger;
import org.edgewise.driver.average.augment.DrawnNetwork;
import org.edgewise.job.count.CoverBatch;
import org.edgewise.job.input.Block;

/**
 * The incomplete rows of a table, held on the Spark driver for the rounds of data augmentation
 * ({@code --missing average}), in a canonical order: by missing pattern (the set of a row's missing
 * variables), then by the row's cells. Row i of that order redraws its missing cells from its own
 * random stream, derived from the round's seed and i alone — so the draws, and the counts, do not
 * depend on how the input was partitioned or in which order its rows arrived.
 *
 * <p>Rows of one pattern are kept in chunks of at most {@link #CHUNK} column-major rows. A variable
 * set that holds none of a pattern's missing variables counts the same cells in every round: those
 * are counted once ({@link #fixedCounts}); each round counts only the sets that hold a missing
 * variable of the row ({@link #round}), for every chain in the same pass over the rows.
 *
 * <p>Memory: the rows, n bytes each (the missing cells included), and per worker thread and chain one
 * int per count cell while counting a round; the merged counts, one long per cell and chain
 * ({@link #bytes}).
 */
public final class IncompleteRows {
    /** Rows per chunk: a chunk's columns stay in cache while the kernel loops over them. */
    public static final int CHUNK = 4096;

    private final int n;
    private final long rows;
    private final List<Chunk> chunks;
    private CoverBatch[] touchedFor;
    private Map<Long, CoverBatch.Selection[]> touched;

    /** Rows of one pattern: {@code first} is the canonical index of the chunk's first row. */
    private record Chunk(long mask, int[] missing, int rows, byte[][] cols, long first) {
    }

    private IncompleteRows(int n, long rows, List<Chunk> chunks) {
        this.n = n;
        this.rows = rows;
        this.chunks = chunks;
    }

    /**
     * Bytes the rows of {@code rows} × {@code n} cells take here, with {@code cells} count cells
     * counted by {@code threads} workers for {@code chains} chains.
     */
    public static long bytes(long rows, int n, long cells, int chains, int threads) {
        return rows * n + 2L * rows * 16 + cells * chains * (4L * threads + 8) + cells * 8;
    }

    /**
     * The incomplete rows of {@code blocks} (every row of them has a {@link Block#MISSING} cell), in
     * canonical order; a line of a table of counts stands for as many rows as its weight, each redrawn
     * on its own (so the rows are those of the expanded table, in the same order).
     */
    public static IncompleteRows of(List<Block> blocks, int n) {
        long total = 0;
        for (Block b : blocks) {
            total += MissingCells.units(b);
        }
        if (total > Integer.MAX_VALUE / Math.max(1, n)) {
            throw new IllegalArgumentException(total + " incomplete rows of " + n + " cells do not fit one array");
        }
        int m = (int) total;
        byte[] flat = new byte[m * n];
        long[] mask = new long[m];
        int i = 0;
        for (Block b : blocks) {
            byte[][] cols = b.cols();
            for (int t = 0; t < b.rows(); t++) {
                long mk = 0;
                for (int v = 0; v < n; v++) {
                    byte c = cols[v][t];
                    flat[i * n + v] = c;
                    if ((c & 0xFF) == Block.MISSING) {
                        mk |= 1L << v;
                    }
                }
                if (mk == 0) {
                    throw new IllegalArgumentException("a complete row among the incomplete ones");
                }
                mask[i] = mk;
                long w = b.weights() == null ? 1 : b.weights()[t];
                for (long k = 1; k < w; k++) {
                    System.arraycopy(flat, i * n, flat, (i + 1) * n, n);
                    mask[i + 1] = mk;
                    i++;
                }
                i++;
            }
        }
        Integer[] order = new Integer[m];
        for (int k = 0; k < m; k++) {
            order[k] = k;
        }
        Arrays.sort(order, (a, b) -> {
            int c = Long.compare(mask[a], mask[b]);
            return c != 0 ? c : Arrays.compareUnsigned(flat, a * n, a * n + n, flat, b * n, b * n + n);
        });
        List<Chunk> chunks = new ArrayList<>();
        int k = 0;
        while (k < m) {
            long mk = mask[order[k]];
            int end = k;
            while (end < m && end - k < CHUNK && mask[order[end]] == mk) {
                end++;
            }
            int len = end - k;
            byte[][] cols = new byte[n][len];
            for (int t = 0; t < len; t++) {
                int row = order[k + t];
                for (int v = 0; v < n; v++) {
                    cols[v][t] = flat[row * n + v];
                }
            }
            chunks.add(new Chunk(mk, bits(mk), len, cols, k));
            k = end;
        }
        return new IncompleteRows(n, m, chunks);
    }

    private static int[] bits(long mask) {
        int[] out = new int[Long.bitCount(mask)];
        int i = 0;
        for (int v = 0; v < 64; v++) {
            if ((mask >>> v & 1) != 0) {
                out[i++] = v;
            }
        }
        return out;
    }

    public long rows() {
        return rows;
    }

    /**
     * Per batch, the counts of the sets that hold none of a row's missing variables, over every
     * incomplete row: the same in every round.
     */
    public long[][] fixedCounts(CoverBatch[] batches) {
        Map<Long, CoverBatch.Selection[]> untouched = selections(batches, false);
        long[][] out = new long[batches.length][];
        int[] pre = new int[CHUNK];
        for (int b = 0; b < batches.length; b++) {
            int[] counts = new int[batches[b].cells()];
            for (Chunk c : chunks) {
                batches[b].count(c.cols(), c.rows(), counts, pre, untouched.get(c.mask())[b]);
            }
            out[b] = widen(counts);
        }
        return out;
    }

    /**
     * One round of every chain in one pass over the rows: chain c redraws every missing cell under
     * {@code networks[c]} (row i from the stream of {@code seeds[c]} and i,
     * {@link DrawnNetwork#complete}) and counts the sets that hold a missing variable of the row.
     *
     * @return per chain and batch, the counts of those sets (zero in every other set's cells)
     */
    public long[][][] round(CoverBatch[] batches, DrawnNetwork[] networks, long[] seeds, int threads) {
        int chains = networks.length;
        Map<Long, CoverBatch.Selection[]> touched = touched(batches);
        AtomicInteger next = new AtomicInteger();
        ExecutorService pool = Executors.newFixedThreadPool(threads, r -> {
            Thread t = new Thread(r, "edgewise-augment");
            t.setDaemon(true);
            return t;
        });
        try {
            List<Future<int[][][]>> parts = new ArrayList<>();
            for (int w = 0; w < threads; w++) {
                parts.add(pool.submit(() -> work(batches, networks, seeds, touched, next)));
            }
            long[][][] out = new long[chains][batches.length][];
            for (int c = 0; c < chains; c++) {
                for (int b = 0; b < batches.length; b++) {
                    out[c][b] = new long[batches[b].cells()];
                }
            }
            for (Future<int[][][]> f : parts) {
                int[][][] part = f.get();
                for (int c = 0; c < chains; c++) {
                    for (int b = 0; b < batches.length; b++) {
                        long[] o = out[c][b];
                        int[] p = part[c][b];
                        for (int x = 0; x < o.length; x++) {
                            o[x] += p[x];
                        }
                    }
                }
            }
            return out;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while redrawing missing cells", e);
        } catch (ExecutionException e) {
            if (e.getCause() instanceof RuntimeException re) {
                throw re;
            }
            throw new IllegalStateException(e.getCause());
        } finally {
            pool.shutdownNow();
        }
    }

    /** A worker: chunks taken in turn from {@code next}, counted into its own int cells (no row is counted twice). */
    private int[][][] work(CoverBatch[] batches, DrawnNetwork[] networks, long[] seeds,
                           Map<Long, CoverBatch.Selection[]> touched, AtomicInteger next) {
        int chains = networks.length;
        int[][][] counts = new int[chains][batches.length][];
        for (int c = 0; c < chains; c++) {
            for (int b = 0; b < batches.length; b++) {
                counts[c][b] = new int[batches[b].cells()];
            }
        }
        int[] pre = new int[CHUNK];
        int[] x = new int[n];
        byte[][] filled = new byte[n][];
        byte[][] scratch = new byte[n][CHUNK];
        for (int k; (k = next.getAndIncrement()) < chunks.size(); ) {
            Chunk ch = chunks.get(k);
            CoverBatch.Selection[] sel = touched.get(ch.mask());
            for (int c = 0; c < chains; c++) {
                complete(ch, networks[c], seeds[c], x, filled, scratch);
                for (int b = 0; b < batches.length; b++) {
                    batches[b].count(filled, ch.rows(), counts[c][b], pre, sel[b]);
                }
            }
        }
        return counts;
    }

    /**
     * Chunk {@code ch} with its missing cells redrawn under {@code net} into {@code filled} (its
     * observed columns shared, its missing ones written into {@code scratch}).
     */
    private void complete(Chunk ch, DrawnNetwork net, long seed, int[] x, byte[][] filled, byte[][] scratch) {
        byte[][] cols = ch.cols();
        int[] miss = ch.missing();
        for (int v = 0; v < n; v++) {
            filled[v] = cols[v];
        }
        for (int v : miss) {
            filled[v] = scratch[v];
        }
        for (int t = 0; t < ch.rows(); t++) {
            for (int v = 0; v < n; v++) {
                x[v] = cols[v][t] & 0xFF;
            }
            for (int v : miss) {
                x[v] = 0;
            }
            net.complete(x, miss, stream(seed, ch.first() + t));
            for (int v : miss) {
                scratch[v][t] = (byte) x[v];
            }
        }
    }

    /** The random stream of row {@code index} in a round seeded {@code seed}. */
    static SplittableRandom stream(long seed, long index) {
        return new SplittableRandom(mix(seed ^ mix(index + 0x632BE59BD9B4E019L)));
    }

    /** Stafford's variant 13 of the MurmurHash3 finaliser (the mix of SplittableRandom). */
    private static long mix(long z) {
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }

    /**
     * The completed rows of a round for one chain, row-major in canonical order (for tests: the same
     * draws {@link #round} counts).
     */
    public int[][] completed(DrawnNetwork net, long seed) {
        int[][] out = new int[(int) rows][];
        int[] x = new int[n];
        byte[][] filled = new byte[n][];
        byte[][] scratch = new byte[n][CHUNK];
        for (Chunk ch : chunks) {
            complete(ch, net, seed, x, filled, scratch);
            for (int t = 0; t < ch.rows(); t++) {
                int[] row = new int[n];
                for (int v = 0; v < n; v++) {
                    row[v] = filled[v][t] & 0xFF;
                }
                out[(int) (ch.first() + t)] = row;
            }
        }
        return out;
    }

    /** The sets each pattern touches, chosen once for the batches of every round. */
    private synchronized Map<Long, CoverBatch.Selection[]> touched(CoverBatch[] batches) {
        if (touchedFor != batches) {
            touched = selections(batches, true);
            touchedFor = batches;
        }
        return touched;
    }

    private Map<Long, CoverBatch.Selection[]> selections(CoverBatch[] batches, boolean meets) {
        Map<Long, CoverBatch.Selection[]> out = new HashMap<>();
        for (Chunk c : chunks) {
            out.computeIfAbsent(c.mask(), mk -> {
                CoverBatch.Selection[] s = new CoverBatch.Selection[batches.length];
                for (int b = 0; b < batches.length; b++) {
                    s[b] = batches[b].select(mk, meets);
                }
                return s;
            });
        }
        return out;
    }

    private static long[] widen(int[] counts) {
        long[] out = new long[counts.length];
        for (int i = 0; i < counts.length; i++) {
            out[i] = counts[i];
        }
        return out;
    }
}
