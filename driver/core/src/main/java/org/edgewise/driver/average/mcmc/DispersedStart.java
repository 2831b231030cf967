package org.edgewise.driver.average.mcmc;

import java.util.SplittableRandom;
import org.edgewise.driver.average.OrderConstraints;

/**
 * Where chain {@code chain} of a run starts: chains come in pairs, the first of a pair from an allowed
 * order — hill-climbed for the first pair, random for the others — the second from the order as far
 * from it as the constraints allow — its reverse
 * when nothing constrains the order. So for every pair of variables (a, b) one chain of each pair
 * starts with a before b and the other with b before a: every edge's posterior given the start order
 * is possible in one chain of the pair and impossible in the other, and the chains start on both
 * sides of every edge (what the verdict's settled rule asks, {@code MultiChainDiagnostics}). Over-
 * dispersed starting points are Gelman &amp; Rubin's (1992, sec. 2) condition for the between-chain
 * comparison to reveal a chain that has not left its start's neighbourhood; an odd last chain starts
 * from a random order of its own.
 *
 * @param chain    the chain's index in the run
 * @param pairSeed the seed both chains of the pair draw their shared random order from
 */
public record DispersedStart(int chain, long pairSeed) {
    /** The starts of {@code chains} chains, the pair seeds drawn from {@code rng}. */
    public static DispersedStart[] plan(int chains, SplittableRandom rng) {
        DispersedStart[] out = new DispersedStart[chains];
        long seed = 0;
        for (int c = 0; c < chains; c++) {
            if (c % 2 == 0) {
                seed = rng.nextLong();
            }
            out[c] = new DispersedStart(c, seed);
        }
        return out;
    }

    /** Whether this chain starts from the mirror of its pair's random order. */
    public boolean mirrored() {
        return chain % 2 == 1;
    }

    /** Whether this chain's pair starts from a hill-climbed order (the first pair) rather than a random one. */
    public boolean climbed() {
        return chain < 2;
    }

    /**
     * This chain's starting order under {@code oc}: the pair's random order — for the first pair
     * improved by {@code climb} (a hill-climb to a local mode of the order posterior, given the
     * random order and a seed both chains of the pair share, so both climb to the same order) — or
     * its mirror ({@link #farthest}). The climbed chain starts where the strong edges are present;
     * its mirror where they are impossible.
     */
    public int[] order(OrderConstraints oc, Climb climb) {
        int[] base = oc.randomOrder(new SplittableRandom(pairSeed));
        if (climbed() && climb != null) {
            base = climb.from(base, pairSeed ^ 0x632BE59BD9B4E019L);
        }
        return mirrored() ? farthest(base, oc) : base;
    }

    /** A hill-climb of the order posterior from an order (deterministic given the seed). */
    public interface Climb {
        int[] from(int[] order, long seed);
    }

    /**
     * The allowed order that places last what {@code base} places first as far as {@code oc} lets:
     * a topological placement that always takes, among the variables whose required predecessors are
     * placed, the one latest in {@code base} — exactly the reverse of {@code base} without constraints,
     * and within each tier the reverse of {@code base}'s order in that tier.
     */
    static int[] farthest(int[] base, OrderConstraints oc) {
        int n = base.length;
        boolean[] placed = new boolean[n];
        int[] out = new int[n];
        for (int p = 0; p < n; p++) {
            int pick = -1;
            for (int k = n - 1; k >= 0 && pick < 0; k--) {
                int v = base[k];
                if (!placed[v] && oc.readyAfter(v, placed)) {
                    pick = v;
                }
            }
            out[p] = pick;
            placed[pick] = true;
        }
        return out;
    }
}
