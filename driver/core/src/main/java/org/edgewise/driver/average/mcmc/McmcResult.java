package org.edgewise.driver.average.mcmc;

import java.util.List;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;

/**
 * What a run of chains (order MCMC or partition MCMC) gives: Rao-Blackwellised estimates, the
 * diagnostics of every quantity, the stored draws' states and traces, timing, tempering and memory.
 *
 * @param edges       {@code [from][to]}; null for pairs where {@code from} is no candidate of {@code to} (posterior 0)
 * @param ancestors   {@code [a][b]} for a ⇝ b when features were asked, else null
 * @param blanket     {@code [a][b]} (a &lt; b filled, symmetric) when features were asked, else null
 * @param report      the diagnostics of every quantity and the log score
 * @param outcome     why the run stopped, steps done and discarded, time in checks
 * @param traces      per chain, the log evidence of the draws used
 * @param orders      the orders of the draws used (chain by chain), for averaging predictions
 * @param thin        steps between the draws used
 * @param chainCpuSeconds CPU time of the chains' steps (incl. stored draws), summed over chains
 * @param swapAcceptance  tempering: per adjacent pair of rungs (β_r, β_{r+1}), the share of
 *                        proposed exchanges accepted, over all chains; empty without tempering
 * @param betaMin         tempering: the smallest inverse temperature of the ladders
 * @param memory          the memory planned before the run (and checked against the heap)
 */
public record McmcResult(Estimate[][] edges, Estimate[][] ancestors, Estimate[][] blanket,
                     MultiChainDiagnostics.Report report, ChainRunner.Outcome outcome, double acceptance, long thin,
                     List<double[]> traces, List<int[]> orders, double setupSeconds, double chainCpuSeconds,
                     double[] swapAcceptance, double betaMin, McmcMemory memory) {
    public double maxRhat() {
        return report.maxRhat();
    }

    public double minEss() {
        return report.minEssBulk();
    }

    public boolean converged() {
        return report.converged();
    }

    public long stepsPerChain() {
        return outcome.stepsPerChain() - outcome.discarded();
    }

    public long burnIn() {
        return outcome.discarded();
    }

    public double samplingSeconds() {
        return outcome.samplingSeconds();
    }
}
