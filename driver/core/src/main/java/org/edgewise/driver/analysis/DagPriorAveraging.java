package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.DagDraws;
import org.edgewise.driver.average.DagPrior;
import org.edgewise.driver.average.ExactDagSampler;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.OrderMcmc;
import org.edgewise.driver.average.OrderSampling;
import org.edgewise.driver.average.PartitionMcmc;
import org.edgewise.driver.average.OrderSum;
import org.edgewise.driver.average.StructureSum;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.ResultBuilder;

/**
 * The structure-modular results ({@code --dag-prior structure-modular}) and the essential-graph
 * features of either prior, from DAGs drawn from the posterior:
 * <ul>
 *   <li>exact: {@link StructureSum} (edges, parent sets, log P(D)); features from
 *       {@link ExactDagSampler}'s independent draws;</li>
 *   <li>mcmc: partition MCMC ({@link PartitionMcmc}; Kuipers &amp; Moffa 2017, with DAG moves),
 *       whose chains target P(G | D) under this prior directly: no re-weighting, no limit on n
 *       from counting linear extensions; every estimate with MCSE, R̂ and ESS as order MCMC's.</li>
 * </ul>
 */
public final class DagPriorAveraging {
    /** Largest n for DAG draws (parent bitmasks in an int). */
    public static final int MAX_DRAW_VARIABLES = 31;

    /** Importance-weighted exact draws per asked sample, when rejection would take too long. */
    static final int WEIGHTED_FACTOR = 4;

    private DagPriorAveraging() {
    }

    /** Exact structure-modular edges (and features from exact draws). */
    static EdgeResult exact(LocalScores ls, Path storePath, UnknownOrderSettings s, OrderConstraints oc,
                            EdgeResult.Settings settings, ProgressListener progress) {
        StructureSum.Result r;
        progress.start("exact structure-modular sum", 1_000_000);
        try {
            r = StructureSum.run(ls, oc, progress.partsPerMillion());
        } finally {
            progress.finish();
        }
        List<String> names = UnknownOrderAveraging.names(ls);
        List<EdgeResult.Feature> features = null;
        List<EdgeResult.EssentialPair> essential = null;
        if (s.drawsDags()) {
            ExactDagSampler sampler = ExactDagSampler.of(ls, oc);
            DagDraws d = sampler.expectedTrials(s.orderSamples(), r.logDagSum()) <= ExactDagSampler.MAX_TRIALS
                    ? new DagDraws(ls.variableCount(), List.of(sampler.draw(DagPrior.STRUCTURE_MODULAR, s.orderSamples(),
                    s.seed() + 2, r.logDagSum())), 1, null)
                    : sampler.drawWeighted(WEIGHTED_FACTOR * s.orderSamples(), s.seed() + 2);
            features = features(names, s, d);
            essential = s.essentialGraph() ? essential(names, d) : null;
        }
        return new EdgeResult("exact", names, r.logEvidence(), null, DagPrior.STRUCTURE_MODULAR.label(), null, settings,
                ResultBuilder.provenance(ls.store(), storePath), ResultBuilder.edges(names, r.edgePosterior()),
                ResultBuilder.topParents(ls, r.setPosterior(), s.topParents()), null, null, features, null,
                DagPrior.STRUCTURE_MODULAR.label(), essential);
    }

    /** Essential-graph features from exact draws under the order-modular prior. */
    static List<EdgeResult.EssentialPair> exactOrderModularEssential(LocalScores ls, UnknownOrderSettings s,
                                                                     OrderConstraints oc) {
        List<int[]> dags = ExactDagSampler.of(ls, oc).draw(DagPrior.ORDER_MODULAR, s.orderSamples(), s.seed() + 2, Double.NaN);
        return essential(UnknownOrderAveraging.names(ls), new DagDraws(ls.variableCount(), List.of(dags), 1, null));
    }

    /** DAGs drawn over MCMC's stored orders, {@code group} per order (order-modular DAG draws). */
    static DagDraws fromChains(LocalScores ls, OrderConstraints oc, OrderMcmc.Result r, int chains, int samples, long seed) {
        int n = ls.variableCount();
        checkDrawable(ls);
        int perChain = r.orders().size() / chains;
        int group = Math.max(1, (samples + r.orders().size() - 1) / r.orders().size());
        SplittableRandom rng = new SplittableRandom(seed);
        List<List<int[]>> dags = new ArrayList<>();
        long[] mask = new long[n];
        double[] z = new double[n];
        for (int c = 0; c < chains; c++) {
            List<int[]> chain = new ArrayList<>();
            for (int t = 0; t < perChain; t++) {
                int[] order = r.orders().get(c * perChain + t);
                int[] pos = OrderSum.positions(order, n);
                for (int i = 0; i < n; i++) {
                    mask[i] = ls.predecessorMask(i, pos);
                    z[i] = OrderSum.childLogSum(ls, i, mask[i]);
                }
                for (int g = 0; g < group; g++) {
                    chain.add(parentMasks(ls, org.edgewise.driver.average.DagFeatures.sampleDag(ls, mask, z, rng)));
                }
            }
            dags.add(chain);
        }
        return new DagDraws(n, dags, group, null);
    }

    /** The DAGs partition MCMC drew (one per stored partition), as parent bitmasks. */
    static DagDraws fromPartitions(LocalScores ls, PartitionMcmc.Result r) {
        checkDrawable(ls);
        List<List<int[]>> dags = new ArrayList<>();
        for (List<int[]> chain : r.dags()) {
            List<int[]> out = new ArrayList<>();
            for (int[] sets : chain) {
                out.add(parentMasks(ls, sets));
            }
            dags.add(out);
        }
        return new DagDraws(ls.variableCount(), dags, 1, null);
    }

    private static void checkDrawable(LocalScores ls) {
        int n = ls.variableCount();
        if (n > MAX_DRAW_VARIABLES) {
            throw new UserError(ls.options().names().drawFeatures() + " from DAG draws handle at most "
                    + MAX_DRAW_VARIABLES + " variables, this store has " + n);
        }
    }

    /** Parent bitmasks of the DAG with parent-set index {@code sets[i]} per child. */
    static int[] parentMasks(LocalScores ls, int[] sets) {
        int[] pa = new int[sets.length];
        for (int i = 0; i < sets.length; i++) {
            for (int p : ls.parents(i, sets[i])) {
                pa[i] |= 1 << p;
            }
        }
        return pa;
    }

    /**
     * Structure-modular MCMC: partition MCMC (Kuipers &amp; Moffa 2017, with DAG moves; {@link PartitionMcmc}),
     * Rao-Blackwellised edge posteriors and parent sets, features from the stored DAGs' bits, the
     * essential graph from the drawn DAGs.
     */
    static EdgeResult mcmc(LocalScores ls, Path storePath, UnknownOrderSettings s, OrderConstraints oc,
                           EdgeResult.Settings settings, ProgressListener progress) {
        if (s.essentialGraph()) {
            checkDrawable(ls);
        }
        PartitionMcmc.Result r = OrderSampling.runPartitionMcmc(ls, oc, s, s.features(), progress);
        return UnknownOrderAveraging.sampled(ls, storePath, s, settings, r.chains(), DagPrior.STRUCTURE_MODULAR,
                r.setPosterior(), s.essentialGraph() ? essential(UnknownOrderAveraging.names(ls), fromPartitions(ls, r)) : null);
    }

    static List<EdgeResult.EssentialPair> essential(List<String> names, DagDraws d) {
        int n = names.size();
        List<EdgeResult.EssentialPair> out = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = a + 1; b < n; b++) {
                OrderMcmc.Estimate adj = d.estimate(d.adjacent(a, b));
                OrderMcmc.Estimate ab = d.estimate(d.compelled(a, b));
                OrderMcmc.Estimate ba = d.estimate(d.compelled(b, a));
                OrderMcmc.Estimate un = d.estimate(d.reversible(a, b));
                double mcse = Math.max(Math.max(adj.mcse(), ab.mcse()), Math.max(ba.mcse(), un.mcse()));
                out.add(new EdgeResult.EssentialPair(names.get(a), names.get(b), UnknownOrderAveraging.clamp(adj.mean()), UnknownOrderAveraging.clamp(ab.mean()),
                        UnknownOrderAveraging.clamp(ba.mean()), UnknownOrderAveraging.clamp(un.mean()), UnknownOrderAveraging.finite(mcse)));
            }
        }
        return out;
    }

    static List<EdgeResult.Feature> features(List<String> names, UnknownOrderSettings s, DagDraws d) {
        if (!s.features()) {
            return null;
        }
        return UnknownOrderAveraging.features(names, s, (a, b) -> estimate(d, d.ancestor(a, b)),
                (a, b) -> estimate(d, d.blanket(a, b)));
    }

    private static UnknownOrderAveraging.PairEstimate estimate(DagDraws d, DagDraws.Feature feature) {
        OrderMcmc.Estimate e = d.estimate(feature);
        return new UnknownOrderAveraging.PairEstimate(e.mean(), e.mcse());
    }
}
