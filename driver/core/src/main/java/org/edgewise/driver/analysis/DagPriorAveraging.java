package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.DagDraws;
import org.edgewise.driver.average.DagPrior;
import org.edgewise.driver.average.ExactDagSampler;
import org.edgewise.driver.average.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.OrderMcmc;
import org.edgewise.driver.average.OrderSampling;
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
 *   <li>mcmc: order MCMC's stored orders, {@code group} DAGs drawn per order, each weighted by
 *       1 / ext(G) (Ellis &amp; Wong 2008: the order-modular joint P(≺, G) ∝ Π β_i(U_i) has DAG
 *       marginal ∝ Π β_i(U_i) · ext(G), so these self-normalised weights give the structure-modular
 *       posterior); every estimate with MCSE, split-R̂ and ESS ({@link DagDraws}).</li>
 * </ul>
 */
public final class DagPriorAveraging {
    /** Largest n for which ext(G) is counted (dynamic programming over down-sets, up to 2^n of them). */
    public static final int MAX_REWEIGHT_VARIABLES = 25;
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

    /** DAGs drawn over MCMC's stored orders, {@code group} per order, weighted by 1/ext(G) when {@code reweight}. */
    static DagDraws fromChains(LocalScores ls, OrderConstraints oc, OrderMcmc.Result r, int chains, int samples,
                               boolean reweight, long seed) {
        int n = ls.variableCount();
        if (n > (reweight ? MAX_REWEIGHT_VARIABLES : MAX_DRAW_VARIABLES)) {
            throw new UserError(reweight
                    ? ls.options().names().structureModular() + " with " + ls.options().names().methodMcmc()
                    + " re-weights each drawn DAG by 1 / (its number of "
                    + "linear extensions), counted over subsets: at most " + MAX_REWEIGHT_VARIABLES + " variables, this store has "
                    + n + "; use " + ls.options().names().orderModular()
                    : ls.options().names().drawFeatures() + " from DAG draws handle at most "
                    + MAX_DRAW_VARIABLES + " variables, this store has " + n);
        }
        int perChain = r.orders().size() / chains;
        int group = Math.max(1, (samples + r.orders().size() - 1) / r.orders().size());
        int[] before = oc.restricts() ? oc.predecessorMasks() : null;
        SplittableRandom rng = new SplittableRandom(seed);
        List<List<int[]>> dags = new ArrayList<>();
        double[][] w = reweight ? new double[chains][perChain * group] : null;
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
                    int[] chosen = org.edgewise.driver.average.DagFeatures.sampleDag(ls, mask, z, rng);
                    int[] pa = new int[n];
                    for (int i = 0; i < n; i++) {
                        for (int p : ls.parents(i, chosen[i])) {
                            pa[i] |= 1 << p;
                        }
                    }
                    if (reweight) {
                        w[c][chain.size()] = 1.0 / DagDraws.linearExtensions(pa, before);
                    }
                    chain.add(pa);
                }
            }
            dags.add(chain);
        }
        return new DagDraws(n, dags, group, w);
    }

    /** Structure-modular MCMC: order MCMC, DAGs per stored order re-weighted by 1/ext(G). */
    static EdgeResult mcmc(LocalScores ls, Path storePath, UnknownOrderSettings s, OrderConstraints oc,
                           EdgeResult.Settings settings, ProgressListener progress) {
        int n = ls.variableCount();
        if (n > MAX_REWEIGHT_VARIABLES) {
            fromChains(ls, oc, null, 1, 1, true, 0); // refuses with the message
        }
        OrderMcmc.Result r = OrderSampling.runMcmc(ls, oc, s, false, progress);
        DagDraws d = fromChains(ls, oc, r, s.chains(), s.orderSamples(), true, s.seed() + 3);
        List<String> names = UnknownOrderAveraging.names(ls);
        List<EdgeResult.Edge> edges = new ArrayList<>();
        double maxRhat = 1.0;
        double minEss = Double.POSITIVE_INFINITY;
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a == b) {
                    continue;
                }
                OrderMcmc.Estimate e = d.estimate(d.edge(a, b));
                edges.add(new EdgeResult.Edge(names.get(a), names.get(b), UnknownOrderAveraging.clamp(e.mean()), UnknownOrderAveraging.finite(e.mcse()), UnknownOrderAveraging.finite(e.rhat())));
                if (Double.isFinite(e.rhat())) {
                    maxRhat = Math.max(maxRhat, e.rhat());
                }
                if (e.ess() > 0 && Double.isFinite(e.ess())) {
                    minEss = Math.min(minEss, e.ess());
                }
            }
        }
        EdgeResult.Diagnostics od = UnknownOrderAveraging.diagnostics(r, s);
        // converged: the order chains by their own diagnostics, and the re-weighted edge estimates by the same targets
        double ess = Double.isFinite(minEss) ? Math.min(minEss, od.ess()) : od.ess();
        double essTarget = od.essTarget() == null ? 0 : od.essTarget();
        boolean converged = od.converged() && maxRhat < UnknownOrderAveraging.RHAT_WARN && ess >= essTarget;
        EdgeResult.Diagnostics diag = od.withSummary(Math.max(maxRhat, od.rhat()), ess, converged);
        return new EdgeResult("mcmc", names, null, null, DagPrior.STRUCTURE_MODULAR.label(), null, settings,
                ResultBuilder.provenance(ls.store(), storePath), edges, ResultBuilder.topParents(ls, setPosteriors(ls, d), s.topParents()),
                null, diag, s.features() ? features(names, s, d) : null, null, DagPrior.STRUCTURE_MODULAR.label(),
                s.essentialGraph() ? essential(names, d) : null);
    }

    /** Weighted frequency of each allowed parent set among the draws. */
    static double[][] setPosteriors(LocalScores ls, DagDraws d) {
        int n = ls.variableCount();
        double[][] out = new double[n][];
        for (int i = 0; i < n; i++) {
            Map<Integer, Integer> index = new HashMap<>();
            for (int s = 0; s < ls.setCount(i); s++) {
                index.put(ExactOrderSum.globalMaskOf(ls.masks(i)[s], ls.candidates(i)), s);
            }
            out[i] = new double[ls.setCount(i)];
            final int child = i;
            for (Map.Entry<Integer, Integer> e : index.entrySet()) {
                int g = e.getKey();
                out[i][e.getValue()] = d.estimate((c, k) -> d.parentsOf(c, k, child) == g).mean();
            }
        }
        return out;
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
