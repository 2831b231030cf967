package org.edgewise.driver.analysis;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.posterior.SavedSample;
import org.edgewise.driver.posterior.StructurePosterior;

/**
 * The {@code diagnostics} of a sampled result, from the chains of order MCMC or partition MCMC
 * (same shape): verdict, targets, worst quantities, traces thinned to at most
 * {@value #TRACE_POINTS} points per chain, the tempering ladder and the planned memory.
 */
final class ChainReport {
    /** Points kept per chain trace in the result. */
    static final int TRACE_POINTS = 500;

    private ChainReport() {
    }

    static EdgeResult.Diagnostics diagnostics(McmcResult r, UnknownOrderSettings s) {
        int traceEvery = Math.max(1, r.traces().get(0).length / TRACE_POINTS);
        List<List<Double>> traces = new ArrayList<>();
        for (double[] t : r.traces()) {
            List<Double> l = new ArrayList<>();
            for (int k = 0; k < t.length; k += traceEvery) {
                l.add(t[k]);
            }
            traces.add(l);
        }
        MultiChainDiagnostics.Report rep = r.report();
        List<EdgeResult.Worst> worst = new ArrayList<>();
        for (MultiChainDiagnostics.Worst w : rep.worst()) {
            worst.add(new EdgeResult.Worst(w.quantity(), finite(w.rhat()), finite(w.essBulk()), finite(w.mcse()),
                    finite(w.essTail()), w.state().label()));
        }
        return new EdgeResult.Diagnostics(s.chains(), r.stepsPerChain(), r.burnIn(), s.seed(),
                r.acceptance(), r.maxRhat(), Double.isNaN(r.minEss()) ? 0 : r.minEss(), r.converged(), traces,
                (int) Math.min(Integer.MAX_VALUE, r.thin() * traceEvery), s.rhatTarget(), ChainDiagnostics.ESS_TARGET,
                s.targets().mcse(), finite(rep.maxMcse()), finite(rep.minEssTail()), r.outcome().stop().label(), rep.constant(),
                rep.settled(), rep.stuck(), ChainDiagnostics.SETTLE_SPAN, worst, rep.drawsPerChain(),
                McmcSettings.DEFAULT_RELOCATE, r.outcome().checks(), r.outcome().checkSeconds(),
                r.outcome().samplingSeconds(), tempering(r), r.memory() == null ? null : r.memory().totalBytes(),
                rep.negligible(), rep.traps());
    }

    /**
     * The {@code diagnostics} of a result answered from a saved sample drawn by MCMC (null for any
     * other sample: exact draws carry no verdict). The verdict, stop reason, targets, steps and
     * warm-up are the sampler's, as {@value SampleFile#MANIFEST} records them (the verdict is the one
     * every query over the sample carries, effects included); the largest split-R̂, the smallest bulk
     * and tail effective sample sizes, the largest MCSE and the worst quantities are recomputed over
     * the saved DAGs' edge indicators in draw order ({@code edges}: the sample's edge estimates),
     * i.e. over the figures the result reports. Acceptance and traces are not saved (NaN, none).
     */
    static EdgeResult.Diagnostics fromSample(SavedSample p, StructurePosterior.EdgeEstimates edges) {
        SampleFile.Info info = p.saved().info();
        SampleFile.Diagnostics sd = info.diagnostics();
        if (sd == null || !"mcmc".equals(info.method())) {
            return null;
        }
        List<String> names = EdgeAnalysis.names(p.scores());
        List<EdgeResult.Worst> all = new ArrayList<>();
        List<Double> rhats = new ArrayList<>();
        double maxRhat = Double.NaN;
        double minEss = Double.POSITIVE_INFINITY;
        double minTail = Double.POSITIVE_INFINITY;
        double maxMcse = 0;
        int n = names.size();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                Estimate e = edges.sampled() == null ? null : edges.sampled()[a][b];
                if (e == null) {
                    continue;
                }
                if (!Double.isNaN(e.rhat())) {
                    maxRhat = Double.isNaN(maxRhat) ? e.rhat() : Math.max(maxRhat, e.rhat());
                }
                if (!Double.isNaN(e.ess())) {
                    minEss = Math.min(minEss, e.ess());
                }
                if (!Double.isNaN(e.essTail())) {
                    minTail = Math.min(minTail, e.essTail());
                }
                if (Double.isFinite(e.mcse())) {
                    maxMcse = Math.max(maxMcse, e.mcse());
                }
                all.add(new EdgeResult.Worst("edge " + names.get(a) + " -> " + names.get(b), finite(e.rhat()), finite(e.ess()),
                        finite(e.mcse()), finite(e.essTail()), e.state().label()));
                rhats.add(Double.isNaN(e.rhat()) ? Double.NEGATIVE_INFINITY : e.rhat());
            }
        }
        // the worst first: largest R̂ (an infinite one — a stuck indicator — before any finite), then smallest bulk ESS
        Integer[] idx = new Integer[all.size()];
        for (int i = 0; i < idx.length; i++) {
            idx[i] = i;
        }
        java.util.Arrays.sort(idx, (x, y) -> {
            int c = Double.compare(rhats.get(y), rhats.get(x));
            if (c != 0) {
                return c;
            }
            Double ex = all.get(x).bulkEffectiveSampleSize();
            Double ey = all.get(y).bulkEffectiveSampleSize();
            return Double.compare(ex == null ? Double.POSITIVE_INFINITY : ex, ey == null ? Double.POSITIVE_INFINITY : ey);
        });
        List<EdgeResult.Worst> worst = new ArrayList<>();
        for (int i = 0; i < Math.min(MultiChainDiagnostics.WORST, idx.length); i++) {
            worst.add(all.get(idx[i]));
        }
        return new EdgeResult.Diagnostics(info.chains(), sd.stepsPerChain(), sd.burnIn(), info.seed(), Double.NaN,
                Double.isNaN(maxRhat) ? sd.maxRhat() : maxRhat, Double.isInfinite(minEss) ? 0 : minEss, sd.converged(), null,
                (int) Math.min(Integer.MAX_VALUE, sd.thin()), sd.rhatTarget(), sd.effectiveSampleSizeTarget(), sd.mcseTarget(),
                maxMcse, Double.isInfinite(minTail) ? null : minTail, sd.stopReason(), null, null, null, null, worst,
                info.dagsPerChain(), null, null, null, sd.samplingSeconds(), null, null);
    }

    /** The ladder behind each chain, or null when the chains were not tempered. */
    static EdgeResult.Tempering tempering(McmcResult r) {
        if (r.memory() == null || r.memory().rungs() == 1) {
            return null;
        }
        List<Double> swaps = new ArrayList<>();
        for (double a : r.swapAcceptance()) {
            swaps.add(finite(a));
        }
        return new EdgeResult.Tempering(r.memory().rungs(), r.betaMin(), swaps);
    }

    static Double finite(double x) {
        return Double.isFinite(x) ? x : null;
    }
}
