package org.edgewise.driver.average;

import java.util.List;
import java.util.Locale;
import org.edgewise.driver.Checks;
import org.edgewise.driver.UserError;

/**
 * What an average over unknown orders is asked for.
 *
 * @param method        {@link Method#EXACT} (dynamic programming over subsets) or {@link Method#MCMC}
 * @param tiers         tiers of variable names, earliest first; null or empty: the store's tiers
 * @param seed          seed of every random draw
 * @param chains        MCMC: number of chains
 * @param steps         MCMC: steps per chain after burn-in
 * @param burnIn        MCMC: steps per chain discarded first; null: a quarter of {@code steps}
 * @param draws         MCMC: draws stored per chain (thinning = steps / draws)
 * @param untilRhat     MCMC: keep running until the largest split-R̂ is below it; null: no target
 * @param maxSteps      MCMC with {@code untilRhat}: cap on steps per chain; null: 20 × {@code steps}
 * @param ancestors     also estimate ancestor relations a ⇝ b
 * @param markovBlanket also estimate Markov-blanket membership
 * @param orderSamples  exact: orders drawn from the exact order posterior for features (and for
 *                      prediction when there are too many orders to enumerate)
 * @param topParents    most probable parent sets listed per variable in the result
 * @param dagPrior      the prior over DAGs (null: {@link DagPrior#STRUCTURE_MODULAR}, the default)
 * @param essentialGraph also estimate essential-graph features (DAGs drawn from the posterior,
 *                      {@code orderSamples} of them for the exact method)
 */
public record UnknownOrderSettings(Method method, List<List<String>> tiers, long seed, int chains, long steps,
                                   Long burnIn, int draws, Double untilRhat, Long maxSteps, boolean ancestors,
                                   boolean markovBlanket, int orderSamples, int topParents, DagPrior dagPrior,
                                   boolean essentialGraph) {
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
            Checks.atLeast(steps, 1, "the steps per chain");
            if (burnIn != null) {
                Checks.notNegative(burnIn, "the burn-in");
            }
            if (untilRhat != null && !(untilRhat > 1)) {
                throw new UserError("the split-R-hat target must be above 1 (e.g. 1.01), got " + untilRhat);
            }
        }
        if (method == Method.EXACT && (ancestors || markovBlanket || essentialGraph)) {
            Checks.atLeast(orderSamples, 1, "the number of order samples");
        }
        Checks.zeroOrMore(topParents, "the number of top parent sets");
    }

    /** Whether features beyond single edges are estimated. */
    public boolean features() {
        return ancestors || markovBlanket;
    }

    /** Whether DAGs are drawn for features (ancestors, Markov blanket, essential graph). */
    public boolean drawsDags() {
        return ancestors || markovBlanket || essentialGraph;
    }

    /** The burn-in used: as given, else a quarter of the steps. */
    public long burnInSteps() {
        return burnIn == null ? steps / 4 : burnIn;
    }

    /**
     * The order-MCMC settings: the per-child tables may take a quarter of the JVM's maximum heap
     * (at least 64 MiB).
     */
    public OrderMcmc.Settings mcmc(boolean withFeatures) {
        return new OrderMcmc.Settings(chains, steps, burnInSteps(), seed, draws,
                untilRhat == null ? Double.NaN : untilRhat, maxSteps == null ? 20 * steps : maxSteps,
                withFeatures, Math.max(64L << 20, Runtime.getRuntime().maxMemory() / 4));
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
