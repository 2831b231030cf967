package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.DagPrior;
import org.edgewise.driver.average.ChainDiagnostics;
import org.edgewise.driver.average.ExactOrderSum;
import org.edgewise.driver.average.MultiChainDiagnostics;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.McseBound;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.OrderMcmc;
import org.edgewise.driver.average.OrderSampling;
import org.edgewise.driver.average.SampledOrders;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.ResultBuilder;

/**
 * Edge posteriors over unknown orders as an {@link EdgeResult}: runs {@link ExactOrderSum} or
 * {@link OrderMcmc} with the settings' budget (the per-child tables get a quarter of the heap),
 * burn-in and step caps, then assembles the result — edges, top parent sets (from at most
 * {@value #SET_ORDERS} evenly spaced stored orders), features, and for MCMC the diagnostics with
 * traces thinned to at most {@value #TRACE_POINTS} points per chain. A Monte Carlo estimate of exactly
 * 0 or 1 reports the rule-of-three bound 3/K as its error ({@link McseBound}), not 0; pairs that
 * cannot be edges at all (no candidate) are exactly 0 with error 0.
 */
public final class UnknownOrderAveraging {
    /** R̂ above this is reported as not converged (Vehtari et al. 2021 recommend 1.01). */
    public static final double RHAT_WARN = ChainDiagnostics.RHAT_TARGET;
    /** Points kept per chain trace in the result. */
    static final int TRACE_POINTS = 500;
    /** Stored orders used for the parent-set posteriors of an MCMC result. */
    static final int SET_ORDERS = 1000;

    private UnknownOrderAveraging() {
    }

    /** The averaged edges (and features) of {@code ls}; {@code storePath} goes into the provenance. */
    public static EdgeResult edges(LocalScores ls, Path storePath, UnknownOrderSettings s, ProgressListener progress) {
        if (s.dagPrior() == DagPrior.STRUCTURE_MODULAR) {
            OrderConstraints oc = s.constraints(ls);
            return s.method() == UnknownOrderSettings.Method.EXACT
                    ? DagPriorAveraging.exact(ls, storePath, s, oc, settings(ls, oc), progress)
                    : ReportedMcse.check(DagPriorAveraging.mcmc(ls, storePath, s, oc, settings(ls, oc), progress));
        }
        return s.method() == UnknownOrderSettings.Method.EXACT ? exact(ls, storePath, s, progress)
                : ReportedMcse.check(mcmc(ls, storePath, s, progress));
    }

    private static EdgeResult.Settings settings(LocalScores ls, OrderConstraints oc) {
        EdgeResult.Settings s = ResultBuilder.settings(ls);
        return new EdgeResult.Settings(s.score(), s.ess(), s.prior(), s.maxParents(), s.forbid(), s.require(),
                oc.tierNames().isEmpty() ? null : oc.tierNames());
    }

    private static EdgeResult exact(LocalScores ls, Path storePath, UnknownOrderSettings s, ProgressListener progress) {
        OrderConstraints oc = s.constraints(ls);
        boolean feats = s.features();
        ExactOrderSum.Result r;
        progress.start("exact sum over orders", 1_000_000);
        try {
            r = ExactOrderSum.run(ls, oc, feats ? s.orderSamples() : 0, s.seed(), progress.partsPerMillion());
        } finally {
            progress.finish();
        }
        List<String> names = names(ls);
        List<EdgeResult.Feature> features = null;
        if (feats) {
            double[][][] f = SampledOrders.features(ls, Arrays.asList(r.sampledOrders()), s.seed() + 1);
            features = features(names, s, f[0], f[2], f[1], f[3], r.sampledOrders().length);
        }
        return new EdgeResult("exact", names, r.logEvidence(), null, ResultBuilder.ORDER_MODULAR, null,
                settings(ls, oc), ResultBuilder.provenance(ls.store(), storePath),
                ResultBuilder.edges(names, r.edgePosterior()),
                ResultBuilder.topParents(ls, r.setPosterior(), s.topParents()), null, null, features, null, DagPrior.ORDER_MODULAR.label(),
                s.essentialGraph() ? DagPriorAveraging.exactOrderModularEssential(ls, s, oc) : null);
    }

    private static EdgeResult mcmc(LocalScores ls, Path storePath, UnknownOrderSettings s, ProgressListener progress) {
        OrderConstraints oc = s.constraints(ls);
        OrderMcmc.Result r = OrderSampling.runMcmc(ls, oc, s, s.features(), progress);
        List<EdgeResult.EssentialPair> essential = s.essentialGraph()
                ? DagPriorAveraging.essential(names(ls), DagPriorAveraging.fromChains(ls, oc, r, s.chains(), s.orderSamples(), s.seed() + 3))
                : null;
        return sampled(ls, storePath, s, settings(ls, oc), r, DagPrior.ORDER_MODULAR,
                SampledOrders.setPosteriors(ls, OrderSampling.evenlySpaced(r.orders(), SET_ORDERS)), essential);
    }

    /**
     * The result of sampling chains (order MCMC or partition MCMC, whose {@code r} has the same
     * shape): Rao-Blackwellised edges with MCSE and R̂, features, diagnostics, the given set
     * posteriors and essential-graph pairs, under {@code prior}.
     */
    static EdgeResult sampled(LocalScores ls, Path storePath, UnknownOrderSettings s, EdgeResult.Settings settings,
                              OrderMcmc.Result r, DagPrior prior, double[][] setPosterior,
                              List<EdgeResult.EssentialPair> essential) {
        int n = ls.variableCount();
        boolean feats = s.features();
        List<String> names = names(ls);
        List<EdgeResult.Edge> edges = new ArrayList<>();
        long draws = r.orders().size(); // stored draws, all chains: K of the rule of three (McseBound)
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a == b) {
                    continue;
                }
                OrderMcmc.Estimate e = r.edges()[a][b];
                edges.add(e == null ? new EdgeResult.Edge(names.get(a), names.get(b), 0.0, 0.0, null)
                        : new EdgeResult.Edge(names.get(a), names.get(b), clamp(e.mean()),
                        finite(McseBound.reported(clamp(e.mean()), e.mcse(), draws)), finite(e.rhat())));
            }
        }
        List<EdgeResult.Feature> features = null;
        if (feats) {
            double[][][] f = new double[4][n][n];
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (a != b) {
                        f[0][a][b] = r.ancestors()[a][b].mean();
                        f[1][a][b] = r.ancestors()[a][b].mcse();
                        f[2][a][b] = r.blanket()[a][b].mean();
                        f[3][a][b] = r.blanket()[a][b].mcse();
                    }
                }
            }
            features = features(names, s, f[0], f[1], f[2], f[3], draws);
        }
        return new EdgeResult("mcmc", names, null, null, prior.label(), null, settings,
                ResultBuilder.provenance(ls.store(), storePath), edges, ResultBuilder.topParents(ls, setPosterior, s.topParents()),
                null, diagnostics(r, s), features, null, prior.label(), essential);
    }

    /** The order chains' diagnostics with traces thinned to at most {@value #TRACE_POINTS} points per chain. */
    static EdgeResult.Diagnostics diagnostics(OrderMcmc.Result r, UnknownOrderSettings s) {
        int traceEvery = Math.max(1, r.traces().get(0).length / TRACE_POINTS);
        List<List<Double>> traces = new ArrayList<>();
        for (double[] t : r.traces()) {
            List<Double> l = new ArrayList<>();
            for (int k = 0; k < t.length; k += traceEvery) {
                l.add(t[k]);
            }
            traces.add(l);
        }
        return diagnostics(s, r, traces, traceEvery);
    }

    private static EdgeResult.Diagnostics diagnostics(UnknownOrderSettings s, OrderMcmc.Result r,
                                                      List<List<Double>> traces, int traceEvery) {
        MultiChainDiagnostics.Report rep = r.report();
        List<EdgeResult.Worst> worst = new ArrayList<>();
        for (MultiChainDiagnostics.Worst w : rep.worst()) {
            worst.add(new EdgeResult.Worst(w.quantity(), finite(w.rhat()), finite(w.essBulk()), finite(w.mcse()),
                    finite(w.essTail()), w.state().label()));
        }
        return new EdgeResult.Diagnostics(s.chains(), r.stepsPerChain(), r.burnIn(), s.seed(),
                r.acceptance(), r.maxRhat(), Double.isNaN(r.minEss()) ? 0 : r.minEss(), r.converged(), traces,
                (int) Math.min(Integer.MAX_VALUE, r.thin() * traceEvery), s.rhatTarget(), ChainDiagnostics.ESS_TARGET,
                s.targets().mcse(), finite(rep.maxMcse()), finite(rep.minEssTail()), r.outcome().stop().label(), rep.constant(), rep.settled(), rep.stuck(),
                ChainDiagnostics.SETTLE_SPAN, worst, rep.drawsPerChain(), OrderMcmc.Settings.DEFAULT_RELOCATE,
                r.outcome().checks(), r.outcome().checkSeconds(), r.outcome().samplingSeconds(), tempering(r),
                r.memory() == null ? null : r.memory().totalBytes());
    }

    /** The ladder behind each chain, or null when the chains were not tempered. */
    static EdgeResult.Tempering tempering(OrderMcmc.Result r) {
        if (r.memory() == null || r.memory().rungs() == 1) {
            return null;
        }
        List<Double> swaps = new ArrayList<>();
        for (double a : r.swapAcceptance()) {
            swaps.add(finite(a));
        }
        return new EdgeResult.Tempering(r.memory().rungs(), r.betaMin(), swaps);
    }

    private static List<EdgeResult.Feature> features(List<String> names, UnknownOrderSettings s, double[][] anc,
                                                     double[][] ancSe, double[][] mb, double[][] mbSe, long draws) {
        return features(names, s,
                (a, b) -> new PairEstimate(anc[a][b], McseBound.reported(clamp(anc[a][b]), ancSe[a][b], draws)),
                (a, b) -> new PairEstimate(mb[a][b], McseBound.reported(clamp(mb[a][b]), mbSe[a][b], draws)));
    }

    /** A feature's posterior for one ordered pair and its Monte Carlo standard error (non-finite: none reported). */
    record PairEstimate(double mean, double mcse) {
    }

    /** The estimate of a feature for the pair (a, b). */
    interface PairFeature {
        PairEstimate at(int a, int b);
    }

    /**
     * The {@code features} of a result: with {@code s.ancestors()} a ⇝ b for every ordered pair
     * a ≠ b, with {@code s.markovBlanket()} a — b for every a &lt; b; posteriors clamped to [0, 1].
     */
    static List<EdgeResult.Feature> features(List<String> names, UnknownOrderSettings s, PairFeature ancestor,
                                             PairFeature blanket) {
        int n = names.size();
        List<EdgeResult.Feature> out = new ArrayList<>();
        if (s.ancestors()) {
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (a != b) {
                        out.add(feature("ancestor", names, a, b, ancestor.at(a, b)));
                    }
                }
            }
        }
        if (s.markovBlanket()) {
            for (int a = 0; a < n; a++) {
                for (int b = a + 1; b < n; b++) {
                    out.add(feature("markov-blanket", names, a, b, blanket.at(a, b)));
                }
            }
        }
        return out;
    }

    private static EdgeResult.Feature feature(String kind, List<String> names, int a, int b, PairEstimate e) {
        return new EdgeResult.Feature(kind, names.get(a), names.get(b), clamp(e.mean()), finite(e.mcse()));
    }

    static Double finite(double x) {
        return Double.isFinite(x) ? x : null;
    }

    static double clamp(double p) {
        return p < 0 ? 0 : Math.min(p, 1.0);
    }

    static List<String> names(LocalScores ls) {
        List<String> out = new ArrayList<>();
        for (var v : ls.store().variables()) {
            out.add(v.name());
        }
        return out;
    }
}
