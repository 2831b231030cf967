package org.edgewise.driver.average;

import org.edgewise.driver.score.DagPrior;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.Checks;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.average.convergence.ConvergenceTargets;
import org.edgewise.driver.average.mcmc.McmcSettings;

/**
 * What an average over unknown orders is asked for.
 *
 * @param method        {@link Method#EXACT} (dynamic programming over subsets) or {@link Method#MCMC}
 * @param tiers         tiers of variable names, earliest first; null or empty: the store's tiers
 * @param seed          seed of every random draw
 * @param chains        MCMC: number of chains
 * @param steps         MCMC: steps per chain after burn-in (a fixed run); null: run until converged
 *                      (with {@code untilRhat}: the steps before the first check)
 * @param burnIn        MCMC fixed run: steps per chain discarded first; null: a quarter of {@code steps}
 * @param draws         MCMC: draws stored per chain (fixed run: thinning = steps / draws)
 * @param untilRhat     MCMC: run until every quantity has R̂ below it, bulk-ESS ≥ 400 and (edge and
 *                      feature posteriors) MCSE ≤ {@code mcseTarget}; null: 1.01
 *                      when {@code steps} is null, else a fixed run
 * @param maxSteps      MCMC until converged: cap on steps per chain; null: none
 * @param maxSeconds    MCMC until converged: time budget of the sampling; null: {@value #DEFAULT_MAX_SECONDS} s
 * @param ancestors     also estimate ancestor relations a ⇝ b
 * @param markovBlanket also estimate Markov-blanket membership
 * @param orderSamples  exact: orders drawn from the exact order posterior for features (and for
 *                      prediction when there are too many orders to enumerate)
 * @param topParents    most probable parent sets listed per variable in the result
 * @param dagPrior      the prior over DAGs (null: {@link DagPrior#STRUCTURE_MODULAR}, the default)
 * @param essentialGraph also estimate essential-graph features (DAGs drawn from the posterior,
 *                      {@code orderSamples} of them for the exact method)
 * @param mcseTarget    MCMC: the Monte Carlo standard error an edge or feature posterior must reach
 *                      to count as converged; null: {@value ConvergenceTargets#DEFAULT_MCSE}
 *                      ({@link ConvergenceTargets} argues the number)
 */
public record UnknownOrderSettings(Method method, List<List<String>> tiers, long seed, int chains, Long steps,
                                   Long burnIn, int draws, Double untilRhat, Long maxSteps, Double maxSeconds,
                                   boolean ancestors, boolean markovBlanket, int orderSamples, int topParents,
                                   DagPrior dagPrior, boolean essentialGraph, Double mcseTarget) {
    /** Default time budget of a run until converged, seconds. */
    public static final double DEFAULT_MAX_SECONDS = 300;
    /** Steps per chain before the first convergence check when none are given. */
    public static final long FIRST_CHECK = 20_000;

    /** The averaging methods over unknown orders. */
    public enum Method {
        /** Exact sum over all orders by dynamic programming (Koivisto &amp; Sood 2004). */
        EXACT,
        /** Order MCMC (Friedman &amp; Koller 2003). */
        MCMC;

        /** Lower-case name as written in results. */
        public String label() {
            return name().toLowerCase(Locale.ROOT);
        }
    }

    public UnknownOrderSettings {
        tiers = tiers == null ? List.of() : List.copyOf(tiers);
        dagPrior = dagPrior == null ? DagPrior.STRUCTURE_MODULAR : dagPrior;
        if (method == Method.MCMC) {
            Checks.atLeast(chains, 1, "the number of chains");
            if (steps != null) {
                Checks.atLeast(steps, 1, "the steps per chain");
            }
            if (burnIn != null) {
                Checks.notNegative(burnIn, "the burn-in");
            }
            if (untilRhat != null && !(untilRhat > 1)) {
                throw new UserError("the split-R-hat target must be above 1 (e.g. 1.01), got " + untilRhat);
            }
            if (mcseTarget != null) {
                ConvergenceTargets.mcse(mcseTarget, "the Monte Carlo standard error target");
            }
            long first = steps == null ? FIRST_CHECK : steps;
            if ((steps == null || untilRhat != null) && maxSteps != null && maxSteps < first) {
                // a cap below the first check would be raised to it silently (the run never stops earlier)
                throw new UserError("the step cap " + maxSteps + " is below the first convergence check, after " + first
                        + " steps per chain: give at least " + first);
            }
        }
        if (method == Method.EXACT && (ancestors || markovBlanket || essentialGraph)) {
            Checks.atLeast(orderSamples, 1, "the number of order samples");
        }
        Checks.zeroOrMore(topParents, "the number of top parent sets");
    }

    /** The settings without an MCSE target of their own (the default, {@value ConvergenceTargets#DEFAULT_MCSE}). */
    public UnknownOrderSettings(Method method, List<List<String>> tiers, long seed, int chains, Long steps,
                                Long burnIn, int draws, Double untilRhat, Long maxSteps, Double maxSeconds,
                                boolean ancestors, boolean markovBlanket, int orderSamples, int topParents,
                                DagPrior dagPrior, boolean essentialGraph) {
        this(method, tiers, seed, chains, steps, burnIn, draws, untilRhat, maxSteps, maxSeconds, ancestors, markovBlanket,
                orderSamples, topParents, dagPrior, essentialGraph, null);
    }

    /** Whether features beyond single edges are estimated. */
    public boolean features() {
        return ancestors || markovBlanket;
    }

    /** Whether DAGs are drawn for features (ancestors, Markov blanket, essential graph). */
    public boolean drawsDags() {
        return ancestors || markovBlanket || essentialGraph;
    }

    /** Whether MCMC runs until converged (no fixed {@code steps}, or an R̂ target given). */
    public boolean untilConverged() {
        return steps == null || untilRhat != null;
    }

    /** The R̂ target of a run until converged. */
    public double rhatTarget() {
        return untilRhat == null ? ChainDiagnostics.RHAT_TARGET : untilRhat;
    }

    /** The targets of the convergence verdict (R̂, bulk-ESS, MCSE). */
    public ConvergenceTargets targets() {
        return ConvergenceTargets.withRhat(rhatTarget()).withMcse(mcseTarget == null ? ConvergenceTargets.DEFAULT_MCSE : mcseTarget);
    }

    /** The burn-in of a fixed run: as given, else a quarter of the steps. */
    public long burnInSteps() {
        return burnIn != null ? burnIn : steps == null ? 0 : steps / 4;
    }

    /**
     * The order-MCMC settings: the per-child tables may take a quarter of the JVM's maximum heap
     * (at least 64 MiB).
     */
    public McmcSettings mcmc(boolean withFeatures) {
        long first = steps == null ? FIRST_CHECK : steps;
        // chains, steps, burn-in and both targets are checked above: only the draws can be refused here
        return McmcSettings.defaults(seed).withSteps(first, burnInSteps()).withChains(chains, draws)
                .withTargets(targets())
                .withStopping(untilConverged(), maxSteps == null ? Long.MAX_VALUE / 4 : maxSteps,
                        maxSeconds == null ? DEFAULT_MAX_SECONDS : maxSeconds)
                .withFeatures(withFeatures).withTableBudget(Math.max(64L << 20, Runtime.getRuntime().maxMemory() / 4));
    }

    /** The order constraints: these tiers when given, else the store's. */
    public OrderConstraints constraints(LocalScores ls) {
        List<List<String>> t = tiers;
        if (t.isEmpty() && ls.store().manifest().tiers() != null) {
            t = ls.store().manifest().tiers();
        }
        return OrderConstraints.of(ls, t);
    }
}
