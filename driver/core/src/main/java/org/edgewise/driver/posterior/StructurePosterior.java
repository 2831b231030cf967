package org.edgewise.driver.posterior;

import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.dag.DagDraws;
import org.edgewise.driver.average.dag.DrawnDags;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.effect.EffectOrders;
import org.edgewise.driver.effect.WeightedDags;
import org.edgewise.driver.query.CaseProbability;
import org.edgewise.driver.query.OrderMixture;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.mcmc.McmcResult;

/**
 * The posterior over structures that every query of one request averages over, chosen once
 * ({@link #of}, the one place that decides which engine runs) and asked by every query: edge and
 * parent-set posteriors, features, a weighted set of orders or DAGs for predictions and effects,
 * and the diagnostics of sampled ones. One implementation per source of structures:
 * <ul>
 *   <li>{@link GivenOrder}: every DAG consistent with a given order, in closed form (Buntine 1991;
 *       Friedman &amp; Koller 2003); both DAG priors coincide;</li>
 *   <li>{@link ExactOrders}: every order, exact dynamic programming under the order-modular prior
 *       (Koivisto &amp; Sood 2004; Koivisto 2006);</li>
 *   <li>{@link ExactDags}: every DAG, exact under the structure-modular prior (Tian &amp; He 2009);</li>
 *   <li>{@link OrderChains}: order MCMC, order-modular (Friedman &amp; Koller 2003);</li>
 *   <li>{@link PartitionChains}: partition MCMC, structure-modular (Kuipers &amp; Moffa 2017).</li>
 * </ul>
 * Sampled sources run their chains once, when first asked; exact ones compute each sum once.
 */
public sealed interface StructurePosterior permits GivenOrder, UnknownOrders, SavedSample {

    /**
     * The posterior for a request: given {@code order} (variable indices, first to last) when it is
     * not null, else over unknown orders as {@code settings} say — the one switch over method × DAG prior.
     */
    static StructurePosterior of(LocalScores ls, int[] order, UnknownOrderSettings settings, ProgressListener progress) {
        return of(ls, null, order, settings, progress);
    }

    /**
     * The posterior for a request that may name a saved sample: {@code saved} (read and checked
     * against the store, {@link SampleFile#read}) when it is not null — its DAGs, nothing sampled
     * again; {@code settings} then only say which features to estimate — else as {@link #of(LocalScores,
     * int[], UnknownOrderSettings, ProgressListener)}.
     */
    static StructurePosterior of(LocalScores ls, SampleFile.Loaded saved, int[] order, UnknownOrderSettings settings,
                                 ProgressListener progress) {
        if (saved != null) {
            return new SavedSample(ls, saved, settings);
        }
        if (order != null) {
            return new GivenOrder(ls, order);
        }
        boolean structureModular = settings.dagPrior() == DagPrior.STRUCTURE_MODULAR;
        return switch (settings.method()) {
            case EXACT -> structureModular ? new ExactDags(ls, settings, progress) : new ExactOrders(ls, settings, progress);
            case MCMC -> structureModular ? new PartitionChains(ls, settings, progress) : new OrderChains(ls, settings, progress);
        };
    }

    /**
     * What computing this posterior will cost, when it is worth saying before it starts (an exact
     * sum estimated at more than a few seconds that will run), else null.
     */
    default String cost() {
        return null;
    }

    /** The local scores (store, scoring options) the posterior is built on. */
    LocalScores scores();

    /** What the posterior is and how it was obtained, in the words results use. */
    Labels labels();

    /** Tiers in force (names, earliest first), or null when none. */
    List<List<String>> tiers();

    /** Edge posteriors P(a → b | D) for every ordered pair, exact or sampled, and the evidence when known. */
    EdgeEstimates edges();

    /** Per child, the posterior of each of its parent sets (aligned with {@link LocalScores#masks}). */
    double[][] setPosterior();

    /** The given order (variable indices, first to last), or null over unknown orders. */
    default int[] order() {
        return null;
    }

    /** The single best network's parent-set index per child, when the source defines one (given an order), else null. */
    default int[] bestSets() {
        return null;
    }

    /** The chains behind a sampled posterior (diagnostics, traces), or null when it is exact. */
    default McmcResult chains() {
        return null;
    }

    /** Ancestor and Markov-blanket posteriors as the settings ask for them, or null when none are asked. */
    default Features features() {
        return null;
    }

    /** DAGs drawn from the posterior for essential-graph features, or null when not asked. */
    default DrawnDags essentialDraws() {
        return null;
    }

    /** The model-averaged probability of cases, with the order under which the single best network is taken. */
    Cases cases(double tailMass, long maxHiddenStates);

    /** What effects of interventions are averaged over: weighted orders, or weighted DAGs. */
    EffectSource effectSource();

    /**
     * DAGs drawn from this posterior to be saved (issue 19), with what drew them: chains keep their
     * draws in order (one DAG per stored draw); exact sources and a given order draw {@code count}
     * independent DAGs with {@code seed} (or as many weighted ones as the source weighs).
     */
    Sampled sampleDags(int count, long seed);

    /**
     * @param dags    the DAGs, chain by chain
     * @param sampler what drew them, for people
     */
    record Sampled(DagSample dags, String sampler) {
    }

    /**
     * @param method  {@code order} (given), {@code exact} or {@code mcmc}
     * @param dagPrior the DAG prior over unknown orders; null given an order (both coincide)
     * @param sampler what drew the structures ({@code order MCMC}, {@code partition MCMC}), or null when exact
     */
    record Labels(String method, DagPrior dagPrior, String sampler) {
        /** The DAG prior as results write it, or {@code whenGiven} given an order. */
        public String dagPriorLabel(String whenGiven) {
            return dagPrior == null ? whenGiven : dagPrior.label();
        }
    }

    /**
     * @param posterior             mean posterior per ordered pair [from][to] (exact, or the sampled mean)
     * @param sampled               per pair the Monte Carlo estimate (null entry: not a candidate, exactly 0),
     *                              or null when exact
     * @param draws                 stored draws over all chains (K of the rule of three), 0 when exact
     * @param logEvidence           log P(D) summed over the source's structures, or null when sampled
     * @param logEvidenceNormalized given an order, the evidence with the prior renormalised per order; else null
     */
    record EdgeEstimates(double[][] posterior, Estimate[][] sampled, long draws, Double logEvidence,
                         Double logEvidenceNormalized) {
    }

    /**
     * Ancestor posteriors P(a ⇝ b) and Markov-blanket posteriors P(a — b) (a &lt; b) per pair [a][b],
     * each with the Monte Carlo standard error to report (non-finite: none).
     */
    record Features(double[][] ancestor, double[][] ancestorMcse, double[][] blanket, double[][] blanketMcse) {
    }

    /**
     * @param averaged      the model-averaged case probability
     * @param bestOrder     an order under which the single best network is taken
     * @param over          what the average runs over, for people (e.g. "mcmc: 1000 sampled partitions, 53 distinct")
     * @param averagedOver  what the average runs over, for machines: {@code every DAG consistent with the order},
     *                      {@code all orders}, {@code all DAGs}, {@code sampled orders}, {@code sampled partitions}
     * @param samples       the number of sampled orders or partitions (repeats counted), or null when exact
     * @param averagedLabel how a line for people introduces the averaged probability ("averaged over …:")
     * @param bestLabel     how it introduces the single best network's probability ("under the single best network:")
     * @param exactRatio    whether a case's probability is computed as the exact ratio Z(D + case) / Z(D)
     * @param best          the single network to compare with, when the source names one itself (a saved
     *                      sample: its most frequent DAG); null: the best network under {@code bestOrder}
     */
    record Cases(CaseProbability averaged, int[] bestOrder, String over, String averagedOver, Integer samples,
                 String averagedLabel, String bestLabel, boolean exactRatio, CaseProbability best) {
        public Cases(CaseProbability averaged, int[] bestOrder, String over, String averagedOver, Integer samples,
                     String averagedLabel, String bestLabel, boolean exactRatio) {
            this(averaged, bestOrder, over, averagedOver, samples, averagedLabel, bestLabel, exactRatio, null);
        }

        /** A mixture over sampled or enumerated orders (or partitions, {@code unit}), under {@code prior}. */
        static Cases mixture(OrderMixture mix, String over, DagPrior prior, String unit) {
            return new Cases(mix, mix.bestOrder(), over, (mix.sampled() ? "sampled " : "all ") + unit,
                    mix.sampled() ? mix.draws() : null,
                    "averaged over " + unit + " (" + over + "; " + prior.label() + " DAG prior) and their networks:",
                    "under the best network of the highest-" + (unit.equals("partitions") ? "weight" : "evidence") + " "
                            + unit.substring(0, unit.length() - 1) + " among them:", false);
        }
    }

    /** What effects are averaged over. */
    sealed interface EffectSource {
        /** For people: what was averaged over, and whether it was sampled. */
        String over();

        /** Whether the chains converged (null when not sampled by chains). */
        Boolean converged();

        /** The largest split-R̂ of the chains (null when not sampled by chains). */
        Double maxRhat();
    }

    /** Orders, each averaged over its DAGs in closed form. */
    record OverOrders(EffectOrders orders, String over, Boolean converged, Double maxRhat) implements EffectSource {
    }

    /** A weighted list of DAGs. */
    record OverDags(WeightedDags dags, String over, Boolean converged, Double maxRhat) implements EffectSource {
    }
}
