package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.average.convergence.ConvergenceTargets;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.store.ScoreStore;

/**
 * What a request averages over — the source of its {@link org.edgewise.driver.posterior.StructurePosterior}:
 * a given order, or unknown orders summed exactly or sampled, under a DAG prior, with the sampling
 * settings (see {@link UnknownOrderSettings} for each field's meaning and default).
 *
 * @param method     {@link Method#ORDER} (with {@code order}), {@link Method#EXACT} or {@link Method#MCMC}
 * @param order      the given order's text ("a,b,c", first to last), or null
 * @param dagPrior   the DAG prior over unknown orders (null: structure-modular)
 * @param tiers      tiers of variable names, earliest first (empty: the store's)
 * @param dagSamples DAGs drawn for features (ancestors, Markov blanket, essential graph)
 * @param sample     a saved posterior sample to answer from (nothing is sampled again; its method, DAG prior,
 *                   scoring and tiers are the sample's), or null
 */
public record Averaging(Method method, String order, DagPrior dagPrior, List<List<String>> tiers, long seed, int chains,
                        Long steps, Long burnIn, int draws, Double rhatTarget, Double mcseTarget, Long maxSteps,
                        Double maxSeconds, boolean ancestors, boolean markovBlanket, boolean essentialGraph,
                        int dagSamples, Path sample) {
    /** Smallest Monte Carlo standard error target a run may ask for. */
    public static final double MIN_MCSE_TARGET = ConvergenceTargets.MIN_MCSE;
    /** Largest Monte Carlo standard error target (asks for nothing beyond the effective sample size). */
    public static final double MAX_MCSE_TARGET = ConvergenceTargets.MAX_MCSE;

    /** Steps per chain before the first convergence check of a run until converged when no steps are given. */
    public static final long FIRST_CHECK = UnknownOrderSettings.FIRST_CHECK;

    /** The sources of structures a request can ask for. */
    public enum Method {
        /** Every DAG consistent with a given order. */
        ORDER,
        /** Unknown orders, summed exactly. */
        EXACT,
        /** Unknown orders, sampled by MCMC. */
        MCMC
    }

    /** The settings over unknown orders, listing {@code topParents} parent sets per variable; null given an order. */
    public UnknownOrderSettings settings(int topParents) {
        if (sample != null) {
            // a saved sample: only the features to estimate over its DAGs count
            return new UnknownOrderSettings(UnknownOrderSettings.Method.EXACT, List.of(), seed, chains, null, null, draws,
                    null, null, null, ancestors, markovBlanket, dagSamples, topParents, dagPrior, essentialGraph, null);
        }
        if (method == Method.ORDER) {
            return null;
        }
        return new UnknownOrderSettings(method == Method.EXACT ? UnknownOrderSettings.Method.EXACT : UnknownOrderSettings.Method.MCMC,
                tiers, seed, chains, steps, burnIn, draws, rhatTarget, maxSteps, maxSeconds, ancestors, markovBlanket,
                dagSamples, topParents, dagPrior, essentialGraph, mcseTarget);
    }

    /** The saved sample of this request read and checked against {@code store} (read from {@code storePath}), or null. */
    SampleFile.Loaded saved(ScoreStore store, Path storePath) {
        return sample == null ? null : SampleFile.read(sample, store.manifest(), storePath);
    }

    /** The same request answered from the saved sample at {@code dir}. */
    Averaging withSample(Path dir) {
        return new Averaging(method, order, dagPrior, tiers, seed, chains, steps, burnIn, draws, rhatTarget, mcseTarget,
                maxSteps, maxSeconds, ancestors, markovBlanket, essentialGraph, dagSamples, dir);
    }

    /** The same request under the DAG prior {@code p}. */
    public Averaging withDagPrior(DagPrior p) {
        return new Averaging(method, order, p, tiers, seed, chains, steps, burnIn, draws, rhatTarget, mcseTarget,
                maxSteps, maxSeconds, ancestors, markovBlanket, essentialGraph, dagSamples, sample);
    }

    /** Whether DAG-drawn features are asked for. */
    public boolean anyFeature() {
        return ancestors || markovBlanket || essentialGraph;
    }
}
