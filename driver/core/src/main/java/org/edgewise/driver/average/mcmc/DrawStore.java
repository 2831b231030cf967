package org.edgewise.driver.average.mcmc;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * The stored draws of one chain, thinned so that at most {@code 2·cap} are kept however long the
 * chain runs: a draw is stored at every step s &gt; {@code recordFrom} with
 * (s − recordFrom) mod thin = 0; when 2·cap draws are held, every other one is dropped
 * (those at odd multiples of thin) and thin doubles — the kept draws stay evenly spaced, and a
 * long run costs the diagnostics no more than a short one.
 *
 * <p>Each draw holds the chain's per-draw quantities (for order MCMC the Rao-Blackwellised edge
 * posteriors given the order, as floats: 4 bytes per quantity per draw), its log score, and an
 * opaque state (the order, feature bits) the sampler uses for its own estimates. Memory:
 * 2·cap·(4·width + 8 + state) bytes per chain. Confined to its chain's thread while it runs.
 *
 * <p>It also keeps the chain's starting point ({@link #start}): the per-draw quantities and state of
 * the state the chain began from, before any move — what tells the verdict on which side of each
 * quantity the chain started ({@code MultiChainDiagnostics}).
 */
public final class DrawStore {
    /** What a sampler stores per draw besides its quantities: a linear extension of the state and, with features, the feature bits. */
    public interface Drawn {
        int[] order();

        long[] features();
    }

    private final int width;
    private float[] startRow;
    private Drawn startState;
    private final int cap;
    private final long recordFrom;
    private long thin;
    private long[] step = new long[16];
    private float[][] row = new float[16][];
    private double[] score = new double[16];
    private final List<Object> state = new ArrayList<>();
    private int size;

    /**
     * @param width      quantities per draw
     * @param cap        draws kept are between cap and 2·cap once 2·cap have been taken
     * @param thin       first thinning interval (steps between stored draws)
     * @param recordFrom steps up to this one are not stored
     */
    public DrawStore(int width, int cap, long thin, long recordFrom) {
        this.width = width;
        this.cap = Math.max(2, cap);
        this.thin = Math.max(1, thin);
        this.recordFrom = recordFrom;
    }

    /** Keeps the chain's starting point: its per-draw quantities and state before any move. */
    public void start(float[] quantities, Drawn st) {
        if (quantities.length != width) {
            throw new IllegalArgumentException("start of width " + quantities.length + ", store of " + width);
        }
        startRow = quantities;
        startState = st;
    }

    /** Quantity {@code q} at the chain's start; NaN when the sampler recorded no start. */
    public double startQuantity(int q) {
        return startRow == null ? Double.NaN : startRow[q];
    }

    /** The chain's starting state, or null when the sampler recorded none. */
    public Drawn startState() {
        return startState;
    }

    /** Whether the draw after step {@code s} is to be stored. */
    public boolean due(long s) {
        return s > recordFrom && (s - recordFrom) % thin == 0;
    }

    /** Stores the draw after step {@code s} (caller checked {@link #due}). */
    public void add(long s, float[] quantities, double logScore, Object st) {
        if (quantities.length != width) {
            throw new IllegalArgumentException("draw of width " + quantities.length + ", store of " + width);
        }
        if (size == step.length) {
            step = Arrays.copyOf(step, 2 * size);
            row = Arrays.copyOf(row, 2 * size);
            score = Arrays.copyOf(score, 2 * size);
        }
        step[size] = s;
        row[size] = quantities;
        score[size] = logScore;
        state.add(st);
        size++;
        if (size >= 2 * cap) {
            compact();
        }
    }

    private void compact() {
        long twice = 2 * thin;
        int k = 0;
        for (int j = 0; j < size; j++) {
            if ((step[j] - recordFrom) % twice == 0) {
                step[k] = step[j];
                row[k] = row[j];
                score[k] = score[j];
                state.set(k, state.get(j));
                k++;
            }
        }
        for (int j = size - 1; j >= k; j--) {
            row[j] = null;
            state.remove(j);
        }
        size = k;
        thin = twice;
    }

    public int size() {
        return size;
    }

    public int width() {
        return width;
    }

    /** The current thinning interval. */
    public long thin() {
        return thin;
    }

    /** Index of the first stored draw taken after step {@code s}. */
    public int firstAfter(long s) {
        int k = 0;
        while (k < size && step[k] <= s) {
            k++;
        }
        return k;
    }

    public long step(int k) {
        return step[k];
    }

    public float quantity(int k, int q) {
        return row[k][q];
    }

    public double logScore(int k) {
        return score[k];
    }

    public Object state(int k) {
        return state.get(k);
    }
}
