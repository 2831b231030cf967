package org.edgewise.driver.posterior;

import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.dag.DagDraws;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.mcmc.OrderSampling;
import org.edgewise.driver.average.partition.PartitionMcmc;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.query.OrderMixture;
import org.edgewise.driver.average.mcmc.McmcResult;

/**
 * Partition MCMC under the structure-modular DAG prior (Kuipers &amp; Moffa 2017, with DAG moves;
 * {@link PartitionMcmc}): its chains target P(G | D) under this prior directly — no re-weighting.
 * Rao-Blackwellised edges and parent sets with MCSE and R̂; predictions mixed over at most
 * {@value ChainSummaries#MAX_MIXED} stored partitions, each averaged over its DAGs in closed form;
 * effects and the essential graph over the DAGs the chains drew. The chains run once, when first asked.
 */
public final class PartitionChains extends UnknownOrders {
    private PartitionMcmc.Result r;

    PartitionChains(LocalScores ls, UnknownOrderSettings s, ProgressListener progress) {
        super(ls, s, progress);
        if (s.essentialGraph()) {
            DagLists.checkDrawable(ls); // before minutes of sampling, not after
        }
    }

    private PartitionMcmc.Result run() {
        if (r == null) {
            r = OrderSampling.runPartitionMcmc(ls, oc, s, s.features(), progress);
        }
        return r;
    }

    @Override
    public McmcResult chains() {
        return run().chains();
    }

    @Override
    public Labels labels() {
        return new Labels("mcmc", DagPrior.STRUCTURE_MODULAR, "partition MCMC");
    }

    @Override
    public EdgeEstimates edges() {
        return ChainSummaries.edges(chains());
    }

    @Override
    public double[][] setPosterior() {
        return run().setPosterior();
    }

    @Override
    public Features features() {
        return s.features() ? ChainSummaries.features(chains()) : null;
    }

    @Override
    public DagDraws essentialDraws() {
        return s.essentialGraph() ? DagLists.knowing(DagLists.fromPartitions(ls, run()), ls, oc) : null;
    }

    @Override
    public Cases cases(double tailMass, long maxHiddenStates) {
        OrderMixture mix = OrderMixture.sampledPartitions(ls, oc,
                OrderSampling.evenlySpaced(run().partitions(), ChainSummaries.MAX_MIXED), tailMass, maxHiddenStates);
        return Cases.mixture(mix, "mcmc: " + mix.draws() + " sampled partitions, " + mix.size() + " distinct",
                DagPrior.STRUCTURE_MODULAR, "partitions");
    }

    @Override
    public EffectSource effectSource() {
        DagLists.checkDrawable(ls);
        StructureDraws d = StructureDraws.ofChains(DagLists.fromPartitions(ls, run()), s.chains(),
                run().chains().converged(), run().chains().maxRhat());
        return new OverDags(d, d.description(), d.converged(), d.maxRhat());
    }

    /** The DAGs partition MCMC drew, one per stored partition, chain by chain in draw order. */
    @Override
    public Sampled sampleDags(int count, long seed) {
        DagSample d = DagSample.fromSets(ls, run().dags());
        return new Sampled(d, d.total() + " DAGs from " + d.chains()
                + " partition-MCMC chains, drawn from the structure-modular posterior");
    }
}
