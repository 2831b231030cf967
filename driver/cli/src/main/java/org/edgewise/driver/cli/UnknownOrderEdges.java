package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.OrderMcmc;
import org.edgewise.driver.average.SampledOrders;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.ResultBuilder;
import org.edgewise.driver.store.ScoreStore;

/**
 * {@code edges --method exact|mcmc}: edge posteriors over unknown orders — thin glue between the
 * options and the engines {@link ExactOrderSum} and {@link OrderMcmc}, building the
 * {@link EdgeResult} with {@link ResultBuilder} like the given-order method.
 */
final class UnknownOrderEdges {
    /** R̂ above this is reported as not converged (Vehtari et al. 2021 recommend 1.01). */
    static final double RHAT_WARN = 1.01;

    private UnknownOrderEdges() {
    }

    /** Tiers of the run: {@code --tiers} when given, else the store's. */
    static OrderConstraints constraints(LocalScores ls, UnknownOrderOptions o) {
        List<List<String>> tiers = o.tierLists();
        if (tiers.isEmpty() && ls.store().manifest().tiers() != null) {
            tiers = ls.store().manifest().tiers();
        }
        return OrderConstraints.of(ls, tiers);
    }

    static EdgeResult compute(String method, ScoreStore store, Path storePath, List<ScoringOptions> options,
                              UnknownOrderOptions o, int topParents, PrintWriter err) {
        EdgeResult primary = null;
        List<EdgeResult.Sensitivity> sens = new ArrayList<>();
        for (ScoringOptions so : options) {
            LocalScores ls = LocalScores.build(store, so);
            EdgeResult r = method.equals("exact") ? exact(ls, storePath, o, topParents, err)
                    : mcmc(ls, storePath, o, topParents, err);
            if (primary == null) {
                primary = r;
            } else {
                sens.add(new EdgeResult.Sensitivity(ls.familyScore().ess(), r.logEvidence(), r.edges()));
            }
        }
        if (sens.isEmpty()) {
            return primary;
        }
        return new EdgeResult(primary.method(), primary.variables(), primary.logEvidence(), null,
                primary.evidenceConvention(), null, primary.settings(), primary.store(), primary.edges(),
                primary.parentSets(), null, primary.diagnostics(), primary.features(), sens);
    }

    private static EdgeResult.Settings settings(LocalScores ls, OrderConstraints oc) {
        EdgeResult.Settings s = ResultBuilder.settings(ls);
        return new EdgeResult.Settings(s.score(), s.ess(), s.prior(), s.maxParents(), s.forbid(), s.require(),
                oc.tierNames().isEmpty() ? null : oc.tierNames());
    }

    static EdgeResult exact(LocalScores ls, Path storePath, UnknownOrderOptions o, int topParents, PrintWriter err) {
        int n = ls.variableCount();
        OrderConstraints oc = constraints(ls, o);
        boolean feats = o.ancestors() || o.markovBlanket();
        if (feats && o.orderSamples < 1) {
            throw new UserError("--order-samples must be at least 1, got " + o.orderSamples);
        }
        ExactOrderSum.Estimate est = ExactOrderSum.estimateHere(n);
        if (est.seconds() > 5) {
            err.println("edges: " + est);
        }
        ExactOrderSum.Result r;
        try (Progress p = Progress.start("exact sum over orders", 1_000_000)) {
            long[] last = {0};
            r = ExactOrderSum.run(ls, oc, feats ? o.orderSamples : 0, o.seed, ppm -> {
                synchronized (last) {
                    if (ppm > last[0]) {
                        p.step(ppm - last[0]);
                        last[0] = ppm;
                    }
                }
            });
        }
        List<String> names = names(ls);
        List<EdgeResult.Feature> features = null;
        if (feats) {
            double[][][] f = SampledOrders.features(ls, Arrays.asList(r.sampledOrders()), o.seed + 1);
            features = features(names, o, f[0], f[2], f[1], f[3]);
        }
        return new EdgeResult("exact", names, r.logEvidence(), null, ResultBuilder.ORDER_MODULAR, null,
                settings(ls, oc), ResultBuilder.provenance(ls.store(), storePath),
                ResultBuilder.edges(names, r.edgePosterior()),
                ResultBuilder.topParents(ls, r.setPosterior(), topParents), null, null, features, null);
    }

    static EdgeResult mcmc(LocalScores ls, Path storePath, UnknownOrderOptions o, int topParents, PrintWriter err) {
        int n = ls.variableCount();
        OrderConstraints oc = constraints(ls, o);
        long burn = o.burnIn == null ? o.steps / 4 : o.burnIn;
        boolean feats = o.ancestors() || o.markovBlanket();
        OrderMcmc.Settings s = new OrderMcmc.Settings(o.chains, o.steps, burn, o.seed, o.draws,
                o.untilRhat == null ? Double.NaN : o.untilRhat, o.maxSteps == null ? 20 * o.steps : o.maxSteps,
                feats, Math.max(64L << 20, Runtime.getRuntime().maxMemory() / 4));
        if (o.untilRhat != null && !(o.untilRhat > 1)) {
            throw new UserError("--until-rhat must be above 1 (e.g. 1.01), got " + o.untilRhat);
        }
        OrderMcmc.Result r;
        try (Progress p = Progress.start("order MCMC", (burn + o.steps) * o.chains)) {
            long[] shown = {0};
            r = OrderMcmc.run(ls, oc, s, new OrderMcmc.Listener() {
                @Override
                public void progress(long done, long planned, double acc, double rhat) {
                    if (done > shown[0]) {
                        p.step(done - shown[0]);
                        shown[0] = done;
                    }
                    p.extra(String.format(Locale.ROOT, "acceptance %.3f  max R-hat %s", acc,
                            Double.isNaN(rhat) ? "-" : String.format(Locale.ROOT, "%.3f", rhat)));
                }

                @Override
                public boolean wantsRhat() {
                    return p.visible();
                }
            });
        }
        List<String> names = names(ls);
        List<EdgeResult.Edge> edges = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a == b) {
                    continue;
                }
                OrderMcmc.Estimate e = r.edges()[a][b];
                edges.add(e == null ? new EdgeResult.Edge(names.get(a), names.get(b), 0.0, 0.0, null)
                        : new EdgeResult.Edge(names.get(a), names.get(b), clamp(e.mean()), finite(e.mcse()), finite(e.rhat())));
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
            features = features(names, o, f[0], f[1], f[2], f[3]);
        }
        int traceEvery = Math.max(1, r.traces().get(0).length / 500);
        List<List<Double>> traces = new ArrayList<>();
        for (double[] t : r.traces()) {
            List<Double> l = new ArrayList<>();
            for (int k = 0; k < t.length; k += traceEvery) {
                l.add(t[k]);
            }
            traces.add(l);
        }
        EdgeResult.Diagnostics d = new EdgeResult.Diagnostics(o.chains, r.stepsPerChain(), r.burnIn(), o.seed,
                r.acceptance(), r.maxRhat(), Double.isNaN(r.minEss()) ? 0 : r.minEss(), r.converged(), traces,
                (int) Math.min(Integer.MAX_VALUE, r.thin() * traceEvery));
        if (!r.converged()) {
            err.println(String.format(Locale.ROOT,
                    "edges: WARNING: the chains disagree (largest split-R-hat %.3f > %.2f): the posteriors are not reliable; "
                            + "run longer (--steps, --until-rhat %.2f) or check the traces", r.maxRhat(), RHAT_WARN, RHAT_WARN));
        }
        List<int[]> orders = r.orders();
        List<int[]> few = new ArrayList<>();
        int every = Math.max(1, orders.size() / 1000);
        for (int k = 0; k < orders.size(); k += every) {
            few.add(orders.get(k));
        }
        return new EdgeResult("mcmc", names, null, null, ResultBuilder.ORDER_MODULAR, null, settings(ls, oc),
                ResultBuilder.provenance(ls.store(), storePath), edges,
                ResultBuilder.topParents(ls, SampledOrders.setPosteriors(ls, few), topParents), null, d, features, null);
    }

    private static List<EdgeResult.Feature> features(List<String> names, UnknownOrderOptions o, double[][] anc,
                                                     double[][] ancSe, double[][] mb, double[][] mbSe) {
        int n = names.size();
        List<EdgeResult.Feature> out = new ArrayList<>();
        if (o.ancestors()) {
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (a != b) {
                        out.add(new EdgeResult.Feature("ancestor", names.get(a), names.get(b), clamp(anc[a][b]), finite(ancSe[a][b])));
                    }
                }
            }
        }
        if (o.markovBlanket()) {
            for (int a = 0; a < n; a++) {
                for (int b = a + 1; b < n; b++) {
                    out.add(new EdgeResult.Feature("markov-blanket", names.get(a), names.get(b), clamp(mb[a][b]), finite(mbSe[a][b])));
                }
            }
        }
        return out;
    }

    private static Double finite(double x) {
        return Double.isFinite(x) ? x : null;
    }

    private static double clamp(double p) {
        return p < 0 ? 0 : Math.min(p, 1.0);
    }

    private static List<String> names(LocalScores ls) {
        List<String> out = new ArrayList<>();
        for (var v : ls.store().variables()) {
            out.add(v.name());
        }
        return out;
    }

    /** Lines for the terminal table: the MCMC diagnostics and features, most probable first. */
    static String summary(EdgeResult r) {
        StringBuilder sb = new StringBuilder();
        EdgeResult.Diagnostics d = r.diagnostics();
        if (d != null) {
            sb.append(String.format(Locale.ROOT,
                    "%nOrder MCMC: %d chains x %d steps (+ %d burn-in), seed %d, acceptance %.3f%n"
                            + "  largest split-R-hat %.4f (%s), smallest effective sample size %.0f%n",
                    d.chains(), d.steps(), d.burnIn(), d.seed(), d.acceptance(), d.rhat(),
                    d.converged() ? "below " + RHAT_WARN + ": chains agree" : "ABOVE " + RHAT_WARN + ": not converged, do not trust",
                    d.ess()));
        }
        if (r.features() != null && !r.features().isEmpty()) {
            List<EdgeResult.Feature> f = new ArrayList<>(r.features());
            f.sort((x, y) -> Double.compare(y.posterior(), x.posterior()));
            sb.append(String.format(Locale.ROOT, "%nFeatures (%s)%n", r.method().equals("exact")
                    ? "from one DAG per order drawn from the exact order posterior: Monte Carlo estimates"
                    : "from one DAG per stored order"));
            int shown = 0;
            for (EdgeResult.Feature x : f) {
                if (shown == 30 || x.posterior() < 0.01) {
                    break;
                }
                sb.append(String.format(Locale.ROOT, "  %-14s %s %s %s  %.4f%s%n", x.kind(), x.from(),
                        x.kind().equals("ancestor") ? "~>" : "--", x.to(), x.posterior(),
                        x.mcse() == null ? "" : String.format(Locale.ROOT, " +- %.4f", x.mcse())));
                shown++;
            }
        }
        return sb.toString();
    }
}
