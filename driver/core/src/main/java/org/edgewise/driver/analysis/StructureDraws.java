package org.edgewise.driver.analysis;

import java.util.List;
import java.util.Locale;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.DagDraws;
import org.edgewise.driver.average.DagPrior;
import org.edgewise.driver.average.ExactDagSampler;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.PartitionMcmc;
import org.edgewise.driver.average.OrderSampling;
import org.edgewise.driver.average.StructureSum;
import org.edgewise.driver.average.UnknownOrderSettings;

/**
 * DAGs from the structure-modular posterior P(G | D) ∝ Π_i ρ_i(U_i) exp(s(i, U_i)), as the list
 * {@link org.edgewise.driver.effect.EffectEngine#overDags} averages over:
 * <ul>
 *   <li>exact: {@value EffectAnalysis#DAG_DRAWS} independent exact draws ({@link ExactDagSampler}, by
 *       rejection from the order-modular sampler against the exact structure-modular sum), or, when
 *       rejection would take too long, 4× as many importance-weighted draws (weight 1/ext(G),
 *       self-normalised);</li>
 *   <li>mcmc: the DAGs partition MCMC draws, one per stored partition ({@link PartitionMcmc};
 *       {@link DagPriorAveraging#fromPartitions}), chain by chain for an autocorrelation-aware MCSE.</li>
 * </ul>
 * Memory: n ints per DAG (≈ 0.8 MB for 20,000 DAGs on 10 variables).
 */
final class StructureDraws implements org.edgewise.driver.effect.DagDraws {
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
                    int mask = d.parentsOf(c, k, v);
                    pa[v] = new int[Integer.bitCount(mask)];
                    for (int m = mask, i = 0; m != 0; m &= m - 1) {
                        pa[v][i++] = Integer.numberOfTrailingZeros(m);
                    }
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

    static StructureDraws of(LocalScores ls, UnknownOrderSettings s, ProgressListener progress) {
        OrderConstraints oc = s.constraints(ls);
        int n = ls.variableCount();
        if (s.method() == UnknownOrderSettings.Method.EXACT) {
            double logDagSum = StructureSum.logDagSum(ls, oc);
            ExactDagSampler sampler = ExactDagSampler.of(ls, oc);
            int k = EffectAnalysis.DAG_DRAWS;
            if (sampler.expectedTrials(k, logDagSum) <= ExactDagSampler.MAX_TRIALS) {
                DagDraws d = new DagDraws(n, List.of(sampler.draw(DagPrior.STRUCTURE_MODULAR, k, s.seed() + 2, logDagSum)), 1, null);
                return new StructureDraws(d, 0, k + " DAGs drawn exactly from the structure-modular posterior (sampled; see mcse)",
                        null, null);
            }
            int kw = DagPriorAveraging.WEIGHTED_FACTOR * k;
            return new StructureDraws(sampler.drawWeighted(kw, s.seed() + 2), 0, kw + " DAGs drawn exactly under the "
                    + "order-modular prior and weighted by 1/ext(G) to the structure-modular posterior (sampled; see mcse)", null, null);
        }
        PartitionMcmc.Result r = OrderSampling.runPartitionMcmc(ls, oc, s, false, progress);
        DagDraws d = DagPriorAveraging.fromPartitions(ls, r);
        int total = 0;
        for (int c = 0; c < d.chainCount(); c++) {
            total += d.chainLength(c);
        }
        return new StructureDraws(d, s.chains(), String.format(Locale.ROOT, "%d DAGs from %d partition-MCMC chains, drawn "
                + "from the structure-modular posterior (sampled; see mcse)", total, s.chains()),
                r.chains().converged(), r.chains().maxRhat());
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
