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
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.dag.DagDraws;
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

    /**
     * Sees each round end: its index (0-based), the seconds it took over every chain, and the check of
     * the rounds that would be kept if the run stopped there (null before any).
     */
    public interface RoundListener {
        void round(int round, double seconds, Check check);
    }

    /**
     * The largest split-R̂ and smallest bulk ESS over the edge indicators of the kept DAGs, over the
     * rounds {@code fromRound}..{@code toRound} (1-based, inclusive), and the verdict: R̂ &lt; 1.01 and
     * bulk ESS ≥ 400 for every edge indicator that varies (Vehtari et al. 2021).
     */
    public record Check(double maxRhat, double minEss, boolean converged, int fromRound, int toRound) {
    }

    /** Split-R̂ and bulk ESS of every edge indicator over the chains' DAGs (parent bitmasks, draw order). */
    public static Check check(List<List<int[]>> kept, int n, int fromRound, int toRound) {
        int chains = kept.size();
        int per = kept.get(0).size();
        double maxRhat = Double.NaN;
        double minEss = Double.POSITIVE_INFINITY;
        boolean converged = true;
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a == b) {
                    continue;
                }
                int bit = 1 << a;
                int to = b;
                Estimate e = DagDraws.estimate((c, k) -> (kept.get(c).get(k)[to] & bit) != 0, chains, per, 1, null);
                if (!Double.isNaN(e.rhat())) {
                    maxRhat = Double.isNaN(maxRhat) ? e.rhat() : Math.max(maxRhat, e.rhat());
                }
                if (!Double.isNaN(e.ess())) {
                    minEss = Math.min(minEss, e.ess());
                }
                // R̂ < 1.01 and bulk ESS ≥ 400 (Vehtari et al. 2021), or too steady to matter
                converged &= switch (e.state()) {
                    case CONSTANT, SETTLED, NEGLIGIBLE -> true;
                    case STUCK, TRAP -> false;
                    case VARIES -> e.rhat() < ChainDiagnostics.RHAT_TARGET && e.ess() >= ChainDiagnostics.ESS_TARGET;
                };
            }
        }
        return new Check(maxRhat, Double.isInfinite(minEss) ? 0 : minEss, converged, fromRound, toRound);
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
    public record Settings(int rounds, int burnIn, int chains, int drawsPerRound, long seed, boolean untilConverged) {
        /** Rounds at least, when running until converged (the first check). */
        public static final int MIN_ROUNDS = 10;
        /** Rounds at most, when running until converged. */
        public static final int MAX_ROUNDS = 100;

        /** A fixed number of rounds. */
        public Settings(int rounds, int burnIn, int chains, int drawsPerRound, long seed) {
            this(rounds, burnIn, chains, drawsPerRound, seed, false);
        }

        /** Chains kept apart for R̂ (Gelman &amp; Rubin 1992: several; two is the least). */
        public static final int CHAINS = 2;
        /** DAGs drawn per kept round: exact draws given the round's table, cheap beside the Spark pass. */
        public static final int DRAWS_PER_ROUND = 50;

        /** {@code rounds} rounds, the first half burn-in (common practice, Gelman et al., Bayesian Data Analysis). */
        public static Settings of(int rounds, long seed) {
            return new Settings(rounds, rounds / 2, CHAINS, DRAWS_PER_ROUND, seed);
        }

        /**
         * Until converged: after each round from {@link #MIN_ROUNDS} on, the second half of the rounds so far
         * is checked ({@link #check}); the run stops once it has converged, or after {@link #MAX_ROUNDS}.
         * {@code rounds} and {@code burnIn} are then the cap and its half; the outcome's settings the rounds run.
         */
        public static Settings untilConverged(long seed) {
            return new Settings(MAX_ROUNDS, MAX_ROUNDS / 2, CHAINS, DRAWS_PER_ROUND, seed, true);
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
        int n = manifest.variableCount();
        SplittableRandom[] rng = new SplittableRandom[chains];
        SplittableRandom root = new SplittableRandom(s.seed());
        DrawnNetwork[] net = new DrawnNetwork[chains];
        // per chain and round, the DAGs drawn (burn-in rounds of a fixed run draw one, not kept)
        List<List<List<int[]>>> drawn = new ArrayList<>();
        for (int c = 0; c < chains; c++) {
            rng[c] = root.split();
            net[c] = start;
            drawn.add(new ArrayList<>());
        }
        double[] seconds = new double[s.rounds()];
        ScoreStore last = null;
        int done = 0;
        for (int t = 0; t < s.rounds(); t++) {
            long t0 = System.nanoTime();
            long[] seeds = new long[chains];
            for (int c = 0; c < chains; c++) {
                seeds[c] = rng[c].nextLong();
            }
            Completed[] tables = recount.recount(t, net.clone(), seeds);
            int round = t;
            boolean keepable = s.untilConverged() || t >= s.burnIn();
            // the chains' draws are independent given their tables: in parallel, each from its own stream
            ScoreStore[] stores = new ScoreStore[chains];
            java.util.stream.IntStream.range(0, chains).parallel().forEach(c -> {
                ScoreStore store = new ScoreStore(manifest, tables[c].families(), tables[c].logScores());
                List<int[]> dags = dags(store, manifest, keepable ? s.drawsPerRound() : 1, rng[c].nextLong());
                drawn.get(c).add(dags);
                net[c] = DrawnNetwork.draw(store, score, ParentListDraws.parentLists(dags.get(0)), rng[c]);
                stores[c] = store;
            });
            last = stores[0];
            seconds[t] = (System.nanoTime() - t0) / 1e9;
            done = t + 1;
            int burn = s.untilConverged() ? done / 2 : s.burnIn();
            Check check = done > burn ? check(kept(drawn, burn, done), n, burn + 1, done) : null;
            listener.round(t, seconds[t], check);
            if (s.untilConverged() && done >= Settings.MIN_ROUNDS && check != null && check.converged()) {
                break;
            }
        }
        int burn = s.untilConverged() ? done / 2 : s.burnIn();
        Settings ran = new Settings(done, burn, chains, s.drawsPerRound(), s.seed(), s.untilConverged());
        return new Outcome(kept(drawn, burn, done), last, java.util.Arrays.copyOf(seconds, done), ran);
    }

    /** Per chain, the DAGs of rounds burn..done−1 (0-based) in draw order. */
    private static List<List<int[]>> kept(List<List<List<int[]>>> drawn, int burn, int done) {
        List<List<int[]>> out = new ArrayList<>();
        for (List<List<int[]>> chain : drawn) {
            List<int[]> k = new ArrayList<>();
            for (int t = burn; t < done; t++) {
                k.addAll(chain.get(t));
            }
            out.add(k);
        }
        return out;
    }

    /** {@code count} exact order-modular DAG draws from the completed table's posterior. */
    static List<int[]> dags(ScoreStore store, Manifest manifest, int count, long seed) {
        LocalScores ls = LocalScores.build(store, ScoringOptions.asStored());
        OrderConstraints oc = OrderConstraints.of(ls, manifest.tiers());
        return ExactDagSampler.of(ls, oc).draw(DagPrior.ORDER_MODULAR, count, seed, Double.NaN);
    }
}
