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
    static final long DEFAULT_SEED = 1;
    static final int DEFAULT_CHAINS = 4;
    static final int DEFAULT_DRAWS = 1000;
    static final int DEFAULT_DAG_SAMPLES = 10_000;

    @Option(names = "--tiers", paramLabel = "\"a,b;c\"", description = "tiers of variables, earliest first, separated by ';' (a repeated "
            + "option appends tiers): variables of an earlier tier precede those of a later one in every order; variables in no tier "
            + "are free (default: the store's tiers)")
    public List<String> tiers = new ArrayList<>();

    @Option(names = "--seed", paramLabel = "N", description = "seed of every random draw (default " + DEFAULT_SEED + "); the same seed gives the same result") public Long seed;

    @Option(names = "--chains", paramLabel = "M", description = "mcmc: number of chains, each from its own random order (default " + DEFAULT_CHAINS + ")") public Integer chains;

    @Option(names = "--steps", paramLabel = "N", description = "mcmc: run exactly N steps per chain after the warm-up "
            + "(default: run until converged: R-hat < 1.01, bulk effective sample size >= 400 and MCSE <= 0.01 for every edge, "
            + "or --max-time)")
    public Long steps;

    @Option(names = "--burn-in", paramLabel = "N", description = "mcmc with --steps: warm-up, the steps per chain discarded "
            + "first (default: a quarter of --steps; running until converged discards the first half of each chain as warm-up)")
    public Long burnIn;

    @Option(names = "--draws", paramLabel = "N", description = "mcmc: draws stored per chain (thinning = steps / draws; default " + DEFAULT_DRAWS + "; running until converged keeps "
            + "at least max(1000, 1/(chains x T^2)), T the MCSE target)") public Integer draws;

    @Option(names = "--rhat-target", paramLabel = "R", description = "mcmc: run until every quantity has R-hat below R (default 1.01) and "
            + "a bulk effective sample size >= 400; with --steps, the first check comes after --steps")
    public Double rhatTarget;

    @Option(names = "--until-rhat", hidden = true, paramLabel = "R", description = "renamed --rhat-target")
    String untilRhat;

    @Option(names = CliNames.MCSE_TARGET, paramLabel = "T", description = "mcmc: also require every edge and feature posterior "
            + "to have a Monte Carlo standard error <= T (default 0.01, so that two seeds agree within about 0.05; between "
            + "0.005 and 0.5; 0.5 asks for nothing beyond the effective sample size)")
    public Double mcseTarget;

    @Option(names = "--max-steps", paramLabel = "N", description = "mcmc until converged: cap on steps per chain, at least the first check "
            + "(after --steps, or " + Averaging.FIRST_CHECK + " steps; default: none)")
    public Long maxSteps;

    @Option(names = "--max-time", paramLabel = "SECONDS", description = "mcmc until converged: time budget of the sampling "
            + "(default 300); a run stopped by it says so and is not reproducible step for step")
    public Double maxTime;

    @Option(names = UnknownOrderEdges.ALLOW_UNCONVERGED, description = "mcmc: exit 0 when the run ends unconverged (default: "
            + "the result is written, the warning printed and the exit status is 3)")
    public boolean allowUnconverged;

    @Option(names = "--features", paramLabel = "ancestors,markov-blanket,essential-graph", split = ",", description = "also estimate ancestor relations a ~> b, Markov-blanket membership and essential-graph features (adjacent, compelled a -> b, reversible) from DAGs drawn from the posterior") public List<String> features = new ArrayList<>();

    @Option(names = "--dag-samples", paramLabel = "K", description = "DAGs drawn from the posterior for --features: "
            + "exact: drawn exactly (default " + DEFAULT_DAG_SAMPLES + ": Monte Carlo standard error <= 0.005); mcmc under the order-modular prior: "
            + "spread over the stored orders (partition MCMC uses the DAGs its chains drew)") public Integer dagSamples;

    @Option(names = {"--samples", "--order-samples"}, hidden = true, paramLabel = "K", description = "renamed --dag-samples")
    String oldSamples;

    @Option(names = "--dag-prior", paramLabel = "structure-modular|order-modular|both", description = "prior over DAGs: structure-modular (default; every DAG with in-degree <= d weighted by its parent-set priors alone, uniform with --prior uniform) or order-modular (each DAG also weighted by its number of consistent orders); given an order both coincide. edges also takes both: the structure-modular result with the order-modular posteriors beside it, and every headline edge or compelled direction that crosses 0.5 between the two marked as fragile") public String dagPrior;

    /** Set by a command that can average under both DAG priors ({@code edges}): {@code --dag-prior both} is then accepted. */
    boolean bothAllowed;

    /**
     * What to average over for {@code method} ({@code order}, {@code exact} or {@code mcmc}) with the
     * given {@code order} text, the options checked first so that the messages name them
     * ({@code --chains must be at least 1, got 0}). An option that cannot act on this request is
     * refused, not dropped: the sampling options outside {@code --method mcmc}, {@code --dag-prior}
     * given an order, {@code --dag-samples} without {@code --features}, and {@code --seed} where
     * nothing is drawn at random ({@code draws}: the command itself draws, as {@code effect} does).
     */
    public Averaging averaging(String method, String order, boolean draws) {
        if (untilRhat != null) {
            throw new UserError("--until-rhat is now --rhat-target (beside --mcse-target): give --rhat-target " + untilRhat);
        }
        if (oldSamples != null) {
            throw new UserError("--samples and --order-samples are now --dag-samples (they count DAGs drawn for --features): "
                    + "give --dag-samples " + oldSamples);
        }
        Averaging.Method m = Averaging.Method.valueOf(method.toUpperCase(Locale.ROOT));
        String situation = m == Averaging.Method.ORDER ? "with --order" : "with --method exact";
        if (m != Averaging.Method.MCMC) {
            String why = m == Averaging.Method.ORDER
                    ? "it sets the sampling of --method mcmc; given an order every DAG is summed exactly"
                    : "it sets the sampling of --method mcmc; the exact sum samples nothing";
            refuseSampling(situation, why);
            Checks.notApplicable(allowUnconverged, UnknownOrderEdges.ALLOW_UNCONVERGED, situation,
                    "only a run sampled by --method mcmc can end unconverged");
        }
        Checks.notApplicable(m == Averaging.Method.ORDER && dagPrior != null, "--dag-prior", situation,
                "given an order both DAG priors coincide");
        int nChains = chains == null ? DEFAULT_CHAINS : chains;
        if (m == Averaging.Method.MCMC) {
            Checks.atLeast(nChains, 1, "--chains");
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
            long first = steps == null ? Averaging.FIRST_CHECK : steps;
            if (until && maxSteps != null && maxSteps < first) {
                // the cap never cuts a run before its first check: a smaller one would be raised silently
                throw new UserError("--max-steps " + maxSteps + " is below the first convergence check, after " + first
                        + " steps per chain" + (steps == null ? ": give at least " + first + (maxSteps < 1 ? "" : ", or --steps " + maxSteps + " for a fixed run")
                        : " (--steps): give at least " + first + ", or fewer --steps"));
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
        Checks.notApplicable(dagSamples != null && !(anc || mb || eg), "--dag-samples", "without --features",
                "it counts the DAGs drawn to estimate the features");
        Checks.notApplicable(seed != null && m != Averaging.Method.MCMC && !(anc || mb || eg) && !draws, "--seed",
                m == Averaging.Method.ORDER ? situation : situation + " without --features",
                "nothing is drawn at random, the sums are exact");
        int nDagSamples = dagSamples == null ? DEFAULT_DAG_SAMPLES : dagSamples;
        if (dagSamples != null) {
            Checks.atMost(dagSamples, Checks.MAX_DAG_SAMPLES, "--dag-samples", "each DAG drawn is kept in memory");
        }
        if (anc || mb || eg) {
            Checks.atLeast(nDagSamples, 1, "--dag-samples");
        }
        return new Averaging(m, order, prior(), tierLists(), seed == null ? DEFAULT_SEED : seed, nChains, steps, burnIn,
                this.draws == null ? DEFAULT_DRAWS : this.draws, rhatTarget, mcseTarget, maxSteps, maxTime, anc, mb, eg,
                nDagSamples, null);
    }

    /**
     * A request answered from the saved sample {@code sample}: every option that would set how the
     * structures are drawn is refused (the sample's DAGs were drawn once, under its own method, DAG
     * prior, tiers and settings); {@code --features} still act over the saved DAGs, and {@code --seed}
     * where the command itself draws ({@code draws}).
     */
    public Averaging fromSample(java.nio.file.Path sample, boolean draws) {
        String situation = "with --sample";
        String why = "the saved DAGs were drawn once, with the settings the sample records; draw another sample to change them";
        Checks.notApplicable(!tiers.isEmpty(), "--tiers", situation, why);
        Checks.notApplicable(dagPrior != null, "--dag-prior", situation, why);
        refuseSampling(situation, why);
        Checks.notApplicable(dagSamples != null, "--dag-samples", situation, "the features are estimated over the saved DAGs");
        Checks.notApplicable(seed != null && !draws, "--seed", situation, "nothing is drawn at random: the saved DAGs are read as they are");
        return new Averaging(Averaging.Method.EXACT, null, null, List.of(), seed == null ? DEFAULT_SEED : seed, DEFAULT_CHAINS,
                null, null, DEFAULT_DRAWS, null, null, null, null, ancestors(), markovBlanket(), essentialGraph(),
                DEFAULT_DAG_SAMPLES, sample);
    }

    /** Refuses, {@code situation}, every option that sets the sampling of --method mcmc, saying {@code why}. */
    private void refuseSampling(String situation, String why) {
        Checks.notApplicable(chains != null, "--chains", situation, why);
        Checks.notApplicable(steps != null, "--steps", situation, why);
        Checks.notApplicable(burnIn != null, "--burn-in", situation, why);
        Checks.notApplicable(this.draws != null, "--draws", situation, why);
        Checks.notApplicable(rhatTarget != null, "--rhat-target", situation, why);
        Checks.notApplicable(mcseTarget != null, CliNames.MCSE_TARGET, situation, why);
        Checks.notApplicable(maxSteps != null, "--max-steps", situation, why);
        Checks.notApplicable(maxTime != null, "--max-time", situation, why);
    }

    /** The tiers as lists of names. */
    public List<List<String>> tierLists() {
        return Tiers.parse(tiers, "--tiers");
    }

    /** Whether {@code --dag-prior both} was given. */
    public boolean bothPriors() {
        return dagPrior != null && dagPrior.trim().equalsIgnoreCase("both");
    }

    /** The DAG prior asked for (structure-modular, the first of the two, for {@code both}). */
    public DagPrior prior() {
        if (bothPriors()) {
            if (!bothAllowed) {
                throw new UserError("--dag-prior both applies to edges only (it compares the edge posteriors under the two "
                        + "priors): give structure-modular or order-modular");
            }
            return DagPrior.STRUCTURE_MODULAR;
        }
        return DagPrior.parse(dagPrior == null ? "structure-modular" : dagPrior, "--dag-prior");
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
