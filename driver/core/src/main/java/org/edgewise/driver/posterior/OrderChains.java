package org.edgewise.driver.posterior;

import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.dag.DagDraws;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;
import org.edgewise.driver.average.mcmc.OrderSampling;
import org.edgewise.driver.average.ordermcmc.SampledOrders;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.effect.EffectOrders;
import org.edgewise.driver.query.OrderMixture;
import org.edgewise.driver.average.mcmc.McmcResult;

/**
 * Order MCMC under the order-modular DAG prior (Friedman &amp; Koller 2003; {@link OrderMcmc}):
 * Rao-Blackwellised edge posteriors with MCSE and R̂; parent sets over
 * {@value ChainSummaries#MAX_MIXED} evenly spaced stored orders; predictions mixed over as many;
 * effects over at most {@value ChainSummaries#EFFECT_ORDERS_PER_CHAIN} orders per chain, chains
 * kept apart for an autocorrelation-aware MCSE. The chains run once, when first asked.
 */
public final class OrderChains extends UnknownOrders {
    private McmcResult r;

    OrderChains(LocalScores ls, UnknownOrderSettings s, ProgressListener progress) {
        super(ls, s, progress);
    }

    @Override
    public McmcResult chains() {
        if (r == null) {
            r = OrderSampling.runMcmc(ls, oc, s, s.features(), progress);
        }
        return r;
    }

    @Override
    public Labels labels() {
        return new Labels("mcmc", DagPrior.ORDER_MODULAR, "order MCMC");
    }

    @Override
    public EdgeEstimates edges() {
        return ChainSummaries.edges(chains());
    }

    @Override
    public double[][] setPosterior() {
        return SampledOrders.setPosteriors(ls, OrderSampling.evenlySpaced(chains().orders(), ChainSummaries.MAX_MIXED));
    }

    @Override
    public Features features() {
        return s.features() ? ChainSummaries.features(chains()) : null;
    }

    @Override
    public DagDraws essentialDraws() {
        return s.essentialGraph()
                ? DagLists.knowing(DagLists.fromChains(ls, chains(), s.chains(), s.orderSamples(), s.seed() + 3), ls, oc) : null;
    }

    @Override
    public Cases cases(double tailMass, long maxHiddenStates) {
        OrderMixture mix = OrderMixture.sampled(ls, OrderSampling.evenlySpaced(chains().orders(), ChainSummaries.MAX_MIXED),
                tailMass, maxHiddenStates);
        return Cases.mixture(mix, "mcmc: " + mix.draws() + " sampled orders, " + mix.size() + " distinct",
                DagPrior.ORDER_MODULAR, "orders");
    }

    @Override
    public EffectSource effectSource() {
        List<int[]> kept = ChainSummaries.perChain(chains().orders(), s.chains());
        return new OverOrders(EffectOrders.chains(kept, s.chains()), kept.size() + " orders kept by " + s.chains()
                + " order-MCMC chains, and every DAG consistent with each (sampled; see mcse)", r.converged(), r.maxRhat());
    }

    /** One DAG per stored order, drawn given it, chain by chain in draw order (no bound on the number of variables). */
    @Override
    public Sampled sampleDags(int count, long seed) {
        McmcResult r = chains();
        int n = ls.variableCount();
        int chains = s.chains();
        int per = r.orders().size() / chains;
        java.util.SplittableRandom rng = new java.util.SplittableRandom(seed);
        List<List<int[]>> out = new java.util.ArrayList<>();
        long[] mask = new long[n];
        double[] z = new double[n];
        for (int c = 0; c < chains; c++) {
            List<int[]> chain = new java.util.ArrayList<>(per);
            for (int t = 0; t < per; t++) {
                int[] pos = org.edgewise.driver.average.givenorder.OrderSum.positions(r.orders().get(c * per + t), n);
                for (int i = 0; i < n; i++) {
                    mask[i] = ls.predecessorMask(i, pos);
                    z[i] = org.edgewise.driver.average.givenorder.OrderSum.childLogSum(ls, i, mask[i]);
                }
                chain.add(org.edgewise.driver.average.dag.DagFeatures.sampleDag(ls, mask, z, rng));
            }
            out.add(chain);
        }
        return new Sampled(DagSample.fromSets(ls, out), (long) chains * per + " DAGs from " + chains
                + " order-MCMC chains, one drawn given each stored order (order-modular posterior)");
    }
}
