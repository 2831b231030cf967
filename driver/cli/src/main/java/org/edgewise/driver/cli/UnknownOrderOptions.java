package org.edgewise.driver.cli;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.Checks;
import org.edgewise.driver.Tiers;
import org.edgewise.driver.UserError;
import org.edgewise.driver.analysis.Averaging;
import org.edgewise.driver.score.DagPrior;
import picocli.CommandLine.Option;

/** Options of the unknown-order methods ({@code edges --method exact|mcmc}, {@code predict --method …}). */
public final class UnknownOrderOptions {
    @Option(names = "--tiers", paramLabel = "\"a,b;c\"", description = "tiers of variables, earliest first, separated by ';' (a repeated "
            + "option appends tiers): variables of an earlier tier precede those of a later one in every order; variables in no tier "
            + "are free (default: the store's tiers)")
    public List<String> tiers = new ArrayList<>();

    @Option(names = "--seed", paramLabel = "N", defaultValue = "1", description = "seed of every random draw (default ${DEFAULT-VALUE}); the same seed gives the same result") public long seed;

    @Option(names = "--chains", paramLabel = "M", defaultValue = "4", description = "mcmc: number of chains, each from its own random order (default ${DEFAULT-VALUE})") public int chains;

    @Option(names = "--steps", paramLabel = "N", description = "mcmc: run exactly N steps per chain after the warm-up "
            + "(default: run until converged: R-hat < 1.01, bulk effective sample size >= 400 and MCSE <= 0.01 for every edge, "
            + "or --max-time)")
    public Long steps;

    @Option(names = "--burn-in", paramLabel = "N", description = "mcmc with --steps: warm-up, the steps per chain discarded "
            + "first (default: a quarter of --steps; running until converged discards the first half of each chain as warm-up)")
    public Long burnIn;

    @Option(names = "--draws", paramLabel = "N", defaultValue = "1000", description = "mcmc: draws stored per chain (thinning = steps / draws; default ${DEFAULT-VALUE})") public int draws;

    @Option(names = "--rhat-target", paramLabel = "R", description = "mcmc: run until every quantity has R-hat below R (default 1.01) and "
            + "a bulk effective sample size >= 400; with --steps, the first check comes after --steps")
    public Double rhatTarget;

    @Option(names = "--until-rhat", hidden = true, paramLabel = "R", description = "renamed --rhat-target")
    String untilRhat;

    @Option(names = CliNames.MCSE_TARGET, paramLabel = "T", description = "mcmc: also require every edge and feature posterior "
            + "to have a Monte Carlo standard error <= T (default 0.01, so that two seeds agree within about 0.05; between "
            + "0.005 and 0.5; 0.5 asks for nothing beyond the effective sample size)")
    public Double mcseTarget;

    @Option(names = "--max-steps", paramLabel = "N", description = "mcmc until converged: cap on steps per chain (default: none)")
    public Long maxSteps;

    @Option(names = "--max-time", paramLabel = "SECONDS", description = "mcmc until converged: time budget of the sampling "
            + "(default 300); a run stopped by it says so and is not reproducible step for step")
    public Double maxTime;

    @Option(names = "--features", paramLabel = "ancestors,markov-blanket,essential-graph", split = ",", description = "also estimate ancestor relations a ~> b, Markov-blanket membership and essential-graph features (adjacent, compelled a -> b, reversible) from DAGs drawn from the posterior") public List<String> features = new ArrayList<>();

    @Option(names = "--dag-samples", paramLabel = "K", defaultValue = "10000", description = "DAGs drawn from the posterior for --features: "
            + "exact: drawn exactly (default ${DEFAULT-VALUE}: Monte Carlo standard error <= 0.005); mcmc under the order-modular prior: "
            + "spread over the stored orders (partition MCMC uses the DAGs its chains drew)") public int dagSamples;

    @Option(names = {"--samples", "--order-samples"}, hidden = true, paramLabel = "K", description = "renamed --dag-samples")
    String oldSamples;

    @Option(names = "--dag-prior", paramLabel = "structure-modular|order-modular", defaultValue = "structure-modular", description = "prior over DAGs: structure-modular (default; every DAG with in-degree <= d weighted by its parent-set priors alone, uniform with --prior uniform) or order-modular (each DAG also weighted by its number of consistent orders); given an order both coincide") public String dagPrior;

    /**
     * What to average over for {@code method} ({@code order}, {@code exact} or {@code mcmc}) with the
     * given {@code order} text, the options checked first so that the messages name them
     * ({@code --chains must be at least 1, got 0}).
     */
    public Averaging averaging(String method, String order) {
        if (untilRhat != null) {
            throw new UserError("--until-rhat is now --rhat-target (beside --mcse-target): give --rhat-target " + untilRhat);
        }
        if (oldSamples != null) {
            throw new UserError("--samples and --order-samples are now --dag-samples (they count DAGs drawn for --features): "
                    + "give --dag-samples " + oldSamples);
        }
        Averaging.Method m = Averaging.Method.valueOf(method.toUpperCase(Locale.ROOT));
        if (m == Averaging.Method.MCMC) {
            Checks.atLeast(chains, 1, "--chains");
            if (steps != null) {
                Checks.atLeast(steps, 1, "--steps");
            }
            if (burnIn != null) {
                Checks.notNegative(burnIn, "--burn-in");
            }
            if (rhatTarget != null && !(rhatTarget > 1)) {
                throw new UserError("--rhat-target must be above 1 (e.g. 1.01), got " + rhatTarget);
            }
            boolean until = steps == null || rhatTarget != null;
            if (until && burnIn != null) {
                throw new UserError("--burn-in applies to a fixed run (--steps without --rhat-target); "
                        + "running until converged discards the first half of each chain");
            }
            if (!until && maxSteps != null) {
                throw new UserError("--max-steps applies when running until converged (no --steps, or --rhat-target)");
            }
            if (!until && maxTime != null) {
                throw new UserError("--max-time applies when running until converged (no --steps, or --rhat-target)");
            }
            if (mcseTarget != null) {
                Checks.between(mcseTarget, Averaging.MIN_MCSE_TARGET, Averaging.MAX_MCSE_TARGET, CliNames.MCSE_TARGET);
            }
            if (maxTime != null && !(maxTime > 0)) {
                throw new UserError("--max-time must be above 0 seconds, got " + maxTime);
            }
        }
        boolean anc = ancestors();
        boolean mb = markovBlanket();
        boolean eg = essentialGraph();
        Checks.atMost(dagSamples, Checks.MAX_DAG_SAMPLES, "--dag-samples", "each DAG drawn is kept in memory");
        if (anc || mb || eg) {
            Checks.atLeast(dagSamples, 1, "--dag-samples");
        }
        return new Averaging(m, order, prior(), tierLists(), seed, chains, steps, burnIn, draws, rhatTarget, mcseTarget, maxSteps,
                maxTime, anc, mb, eg, dagSamples);
    }

    /** The tiers as lists of names. */
    public List<List<String>> tierLists() {
        return Tiers.parse(tiers, "--tiers");
    }

    /** The DAG prior asked for. */
    public DagPrior prior() {
        return DagPrior.parse(dagPrior, "--dag-prior");
    }

    public boolean essentialGraph() {
        return wants("essential-graph");
    }

    public boolean ancestors() {
        return wants("ancestors");
    }

    public boolean markovBlanket() {
        return wants("markov-blanket");
    }

    private boolean wants(String what) {
        for (String f : features) {
            String x = f.trim().toLowerCase(Locale.ROOT);
            if (!x.equals("ancestors") && !x.equals("markov-blanket") && !x.equals("essential-graph")) {
                throw new UserError("--features: unknown feature '" + f + "' (valid: ancestors, markov-blanket, essential-graph)");
            }
        }
        return features.stream().anyMatch(f -> f.trim().equalsIgnoreCase(what));
    }
}
