package org.edgewise.driver.posterior;

import java.util.Locale;
import org.edgewise.driver.average.dag.DagDraws;
import org.edgewise.driver.effect.WeightedDags;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.exact.StructureSum;
import org.edgewise.driver.average.dag.ParentListDraws;

/**
 * DAGs from the structure-modular posterior P(G | D) ∝ Π_i ρ_i(U_i) exp(s(i, U_i)), as the list
 * {@link org.edgewise.driver.effect.EffectEngine#overDags} averages over:
 * <ul>
 *   <li>exact: {@value ExactDags#EFFECT_DAG_DRAWS} independent exact draws ({@link org.edgewise.driver.average.exact.ExactDagSampler}, by
 *       rejection from the order-modular sampler against the exact structure-modular sum), or, when
 *       rejection would take too long, 4× as many importance-weighted draws (weight 1/ext(G),
 *       self-normalised);</li>
 *   <li>mcmc: the DAGs partition MCMC draws, one per stored partition ({@link org.edgewise.driver.average.partition.PartitionMcmc};
 *       {@link DagLists#fromPartitions}), chain by chain for an autocorrelation-aware MCSE.</li>
 * </ul>
 * Memory: n ints per DAG (≈ 0.8 MB for 20,000 DAGs on 10 variables).
 */
final class StructureDraws implements WeightedDags {
    private final int[][][] parents;
    private final double[] weights;
    private final int chains;
    private final String description;
    private final Boolean converged;
    private final Double maxRhat;

    private StructureDraws(DagDraws d, int chains, String description, Boolean converged, Double maxRhat) {
        int n = d.variableCount();
        int total = 0;
        for (int c = 0; c < d.chainCount(); c++) {
            total += d.chainLength(c);
        }
        parents = new int[total][][];
        weights = new double[total];
        int g = 0;
        for (int c = 0; c < d.chainCount(); c++) {
            for (int k = 0; k < d.chainLength(c); k++, g++) {
                int[][] pa = new int[n][];
                for (int v = 0; v < n; v++) {
                    pa[v] = ParentListDraws.parents(d.parentsOf(c, k, v));
                }
                parents[g] = pa;
                weights[g] = d.weight(c, k);
            }
        }
        this.chains = chains;
        this.description = description;
        this.converged = converged;
        this.maxRhat = maxRhat;
    }

    /** DAGs drawn exactly from the structure-modular posterior ({@code count} of them, or 4× as many weighted). */
    static StructureDraws exact(LocalScores ls, OrderConstraints oc, int count, long seed) {
        ExactDags.Drawn drawn = ExactDags.draw(ls, oc, count, seed, StructureSum.logDagSum(ls, oc));
        DagDraws d = drawn.dags();
        return new StructureDraws(d, 0, drawn.weighted()
                ? d.chainLength(0) + " DAGs drawn exactly under the order-modular prior and weighted by 1/ext(G) to the "
                + "structure-modular posterior (sampled; see mcse)"
                : count + " DAGs drawn exactly from the structure-modular posterior (sampled; see mcse)", null, null);
    }

    /** The DAGs partition MCMC drew, one per stored partition, chain by chain. */
    static StructureDraws ofChains(DagDraws d, int chains, Boolean converged, Double maxRhat) {
        int total = 0;
        for (int c = 0; c < d.chainCount(); c++) {
            total += d.chainLength(c);
        }
        return new StructureDraws(d, chains, String.format(Locale.ROOT, "%d DAGs from %d partition-MCMC chains, drawn "
                + "from the structure-modular posterior (sampled; see mcse)", total, chains), converged, maxRhat);
    }

    String description() {
        return description;
    }

    Boolean converged() {
        return converged;
    }

    Double maxRhat() {
        return maxRhat;
    }

    @Override
    public int size() {
        return parents.length;
    }

    @Override
    public int[][] parents(int g) {
        return parents[g];
    }

    @Override
    public double weight(int g) {
        return weights[g];
    }

    @Override
    public boolean sampled() {
        return true;
    }

    @Override
    public int chains() {
        return chains;
    }
}
