package org.edgewise.driver.average.augment;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.exact.ExactDagSampler;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.average.dag.ParentListDraws;

/**
 * Data augmentation over missing values (Tanner &amp; Wong 1987), missing at random assumed: each
 * chain alternates
 * <ol>
 *   <li>the completed table's counts (the caller's {@link Recount}: every missing cell redrawn under
 *       the current network, {@link DrawnNetwork#complete}, then the table counted again), and</li>
 *   <li>DAGs drawn exactly from P(G | completed table) under the order-modular prior
 *       ({@link ExactDagSampler}; Koivisto &amp; Sood 2004), and one network — the first of them with
 *       its parameters drawn from the Dirichlet posterior ({@link DrawnNetwork#draw}) — under which
 *       the next round redraws the missing cells.</li>
 * </ol>
 * The pairs (completion, DAG) form a Gibbs sampler whose DAG margin is P(G | observed cells); the
 * DAGs of the rounds after burn-in, every draw of every round, are the posterior sample. The first
 * completion draws every missing cell from its variable's observed marginal
 * ({@link DrawnNetwork#marginals}).
 *
 * <p>Memory per round: the completed table's families and the exact sampler's tables (2^(n−1)
 * doubles per variable), hence at most {@link #MAX_VARIABLES} variables; the kept DAGs, n ints each.
 */
public final class Augmentation {
    /** Most variables: the exact DAG sampler of each round needs n·2^(n−1) doubles (84 MB at 20). */
    public static final int MAX_VARIABLES = 20;

    private Augmentation() {
    }

    /**
     * The counts and scores of every chain's completed table in one round: chain c's missing cells
     * redrawn under {@code networks[c]} with the seed {@code seeds[c]} (so that one pass over the rows
     * can serve every chain).
     */
    public interface Recount {
        Completed[] recount(int round, DrawnNetwork[] networks, long[] seeds);
    }

    /** One chain's completed table for a network and seed: a {@link Recount} done chain by chain ({@link #chainByChain}). */
    public interface ChainRecount {
        Completed recount(int chain, int round, DrawnNetwork network, long seed);
    }

    /** The {@link Recount} that recounts each chain in turn. */
    public static Recount chainByChain(ChainRecount r) {
        return (round, networks, seeds) -> {
            Completed[] out = new Completed[networks.length];
            for (int c = 0; c < networks.length; c++) {
                out[c] = r.recount(c, round, networks[c], seeds[c]);
            }
            return out;
        };
    }

    /** Sees each round end: its index (0-based) and the seconds it took over every chain. */
    public interface RoundListener {
        void round(int round, double seconds);
    }

    /** Families grouped by child, as a store holds them, with their log scores. */
    public record Completed(List<FamilyCounts> families, double[] logScores) {
    }

    /**
     * @param rounds        rounds per chain
     * @param burnIn        the first rounds whose DAGs are not kept
     * @param chains        independent chains (R̂ over them)
     * @param drawsPerRound DAGs drawn from each kept round's completed table
     * @param seed          the seed every draw derives from
     */
    public record Settings(int rounds, int burnIn, int chains, int drawsPerRound, long seed) {
        /** Chains kept apart for R̂ (Gelman &amp; Rubin 1992: several; two is the least). */
        public static final int CHAINS = 2;
        /** DAGs drawn per kept round: exact draws given the round's table, cheap beside the Spark pass. */
        public static final int DRAWS_PER_ROUND = 50;

        /** {@code rounds} rounds, the first half burn-in (common practice, Gelman et al., Bayesian Data Analysis). */
        public static Settings of(int rounds, long seed) {
            return new Settings(rounds, rounds / 2, CHAINS, DRAWS_PER_ROUND, seed);
        }

        public int keptRounds() {
            return rounds - burnIn;
        }
    }

    /**
     * @param kept         per chain, the DAGs drawn after burn-in in draw order, each as the parent
     *                     bitmask of every variable
     * @param last         chain 1's completed table after its last round (manifest of the caller)
     * @param roundSeconds seconds per round (every chain)
     */
    public record Outcome(List<List<int[]>> kept, ScoreStore last, double[] roundSeconds, Settings settings) {
    }

    /**
     * Runs the chains, round by round.
     *
     * @param manifest the manifest of the completed tables (variables, d, constraints, score and ESS)
     * @param start    the network of the first completion
     */
    public static Outcome run(Manifest manifest, FamilyScore score, DrawnNetwork start, Settings s, Recount recount,
                              RoundListener listener) {
        int chains = s.chains();
        SplittableRandom[] rng = new SplittableRandom[chains];
        SplittableRandom root = new SplittableRandom(s.seed());
        DrawnNetwork[] net = new DrawnNetwork[chains];
        List<List<int[]>> kept = new ArrayList<>();
        for (int c = 0; c < chains; c++) {
            rng[c] = root.split();
            net[c] = start;
            kept.add(new ArrayList<>());
        }
        double[] seconds = new double[s.rounds()];
        ScoreStore last = null;
        for (int t = 0; t < s.rounds(); t++) {
            long t0 = System.nanoTime();
            long[] seeds = new long[chains];
            for (int c = 0; c < chains; c++) {
                seeds[c] = rng[c].nextLong();
            }
            Completed[] done = recount.recount(t, net.clone(), seeds);
            int round = t;
            // the chains' draws are independent given their tables: in parallel, each from its own stream
            ScoreStore[] stores = new ScoreStore[chains];
            java.util.stream.IntStream.range(0, chains).parallel().forEach(c -> {
                ScoreStore store = new ScoreStore(manifest, done[c].families(), done[c].logScores());
                List<int[]> dags = dags(store, manifest, round >= s.burnIn() ? s.drawsPerRound() : 1, rng[c].nextLong());
                if (round >= s.burnIn()) {
                    kept.get(c).addAll(dags);
                }
                net[c] = DrawnNetwork.draw(store, score, ParentListDraws.parentLists(dags.get(0)), rng[c]);
                stores[c] = store;
            });
            last = stores[0];
            seconds[t] = (System.nanoTime() - t0) / 1e9;
            listener.round(t, seconds[t]);
        }
        return new Outcome(kept, last, seconds, s);
    }

    /** {@code count} exact order-modular DAG draws from the completed table's posterior. */
    static List<int[]> dags(ScoreStore store, Manifest manifest, int count, long seed) {
        LocalScores ls = LocalScores.build(store, ScoringOptions.asStored());
        OrderConstraints oc = OrderConstraints.of(ls, manifest.tiers());
        return ExactDagSampler.of(ls, oc).draw(DagPrior.ORDER_MODULAR, count, seed, Double.NaN);
    }
}
