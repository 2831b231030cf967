package org.edgewise.driver.analysis;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;

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
                r.outcome().samplingSeconds(), tempering(r), r.memory() == null ? null : r.memory().totalBytes());
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
