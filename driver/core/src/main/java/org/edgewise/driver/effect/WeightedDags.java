package org.edgewise.driver.effect;

/**
 * A weighted list of DAGs over the store's variables: draws from a posterior over structures
 * (equal weights) or an enumeration with posterior weights. The effect of an intervention over
 * them is Σ_g w_g P(y | do(x), G_g, θ̄) / Σ_g w_g (see {@link DagEffects}). Under the
 * structure-modular prior, exact DAG samples plug in here.
 */
public interface WeightedDags {
    /** Number of DAGs. */
    int size();

    /** Parents of every variable in DAG {@code g}: {@code parents(g)[v]} sorted variable indices. */
    int[][] parents(int g);

    /** Non-negative weight of DAG {@code g} (need not be normalised). */
    double weight(int g);

    /**
     * Number of chains the draws come from, consecutive and equally long (MCSE then
     * autocorrelation-aware), or 0 for independent draws or an enumeration.
     */
    default int chains() {
        return 0;
    }

    /** Whether the DAGs are independent draws with equal weights (MCSE from their spread) rather than an enumeration. */
    boolean sampled();
}
