package org.edgewise.driver.average.ordermcmc;

import java.util.SplittableRandom;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.DominatedSets;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.mcmc.ChainRunner;
import org.edgewise.driver.average.mcmc.ChainSet;
import org.edgewise.driver.average.mcmc.DispersedStart;
import org.edgewise.driver.average.mcmc.McmcMemory;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;

/**
 * Order MCMC (Friedman &amp; Koller 2003, "Being Bayesian about network structure", Machine
 * Learning 50): several chains over variable orders ({@link OrderChain}), each on its own thread
 * ({@link ChainRunner}) from dispersed starts — pairs of chains from an order — hill-climbed for the first pair, random for the others — and its mirror
 * ({@link DispersedStart}), so that each edge has a chain of a pair starting on either side of it — with Rao-Blackwellised edge estimates —
 * the exact P(j → i | D, ≺) of each stored order, averaged over the draws of all chains — and,
 * per edge, feature and for the log score trace, rank-normalised split-R̂, bulk- and tail-ESS and
 * Monte Carlo standard error across chains ({@link MultiChainDiagnostics}).
 *
 * <p>The target is the order-modular posterior P(≺ | D) ∝ Σ_{G ⊆ ≺} Π_i ρ_i(U_i) P(D | G) under
 * the uniform prior over the allowed orders: the same posterior {@link ExactOrderSum} sums
 * exactly, so the two agree up to Monte Carlo error.
 *
 * <p>Reproducible: chain c draws from the c-th {@link SplittableRandom#split()} of
 * {@code new SplittableRandom(seed)}, made on the calling thread before any chain starts, and
 * chains only meet at round boundaries fixed by step counts — so a seed gives the same result
 * whatever the thread timing, unless a time budget stops the run.
 *
 * <p>On wide tables each reported chain is a ladder of tempered chains (Metropolis-coupled MCMC,
 * {@link TemperedOrderChain}; rungs by width, {@link McmcSettings#rungsFor}): measured at n = 200, it
 * takes chains out of inferior modes of the order posterior that single chains do not leave in
 * minutes (docs/unknown-order.md, "Tempering").
 *
 * <p>Memory: {@link ChildTables} (8·2^K bytes per tabulated child with K candidates, at most
 * {@code tableBudget} in all), plus per chain at most 2·draws stored draws of 4 bytes per
 * candidate edge and 4n bytes of order (2,000 draws × 1,200 candidate edges ≈ 10 MB), plus per
 * rung 84n bytes of state and 69,632 bytes of cache per non-tabulated child; planned and
 * checked against the heap before anything is built ({@link McmcMemory}).
 */
public final class OrderMcmc {
    private OrderMcmc() {
    }

    /** The hill-climb of {@link DispersedStart}'s first pair ({@link OrderChain#climbed}). */
    public static DispersedStart.Climb climb(LocalScores ls, org.edgewise.driver.average.ChildTables tables,
                                             OrderConstraints oc, int[][] cpos, int[] offset) {
        return (order, seed) -> OrderChain.climbed(ls, tables, oc, cpos, offset, order, seed);
    }

    /**
     * Runs the chains on the parent sets {@link DominatedSets} keeps (every edge and feature posterior
     * within its stated ε of the full target; the result indexes no parent set). {@code listener}
     * may be null.
     */
    public static McmcResult run(LocalScores full, OrderConstraints oc, McmcSettings s, ChainRunner.Listener listener) {
        LocalScores ls = full.restrictedTo(DominatedSets.keep(full, DominatedSets.MARGIN));
        int[][] cpos = ChainSet.candidatePositions(ls);
        int[] offset = ChainSet.edgeOffsets(ls);
        int rungs = s.rungsFor(ls.variableCount());
        if (rungs == 1) {
            return ChainSet.runChains(ls, offset, s, 1, 0, listener, (tables, rng, store, start) ->
                    new OrderChain(ls, tables, oc, cpos, offset, s.features(), rng, store, s.relocate(),
                            start.order(oc, climb(ls, tables, oc, cpos, offset)))).result();
        }
        double[] beta = TemperedOrderChain.geometricLadder(rungs, s.betaMinFor(ls.variableCount()));
        return ChainSet.runChains(ls, offset, s, rungs, 0, listener, (tables, rng, store, start) -> {
            OrderChain[] ladder = new OrderChain[beta.length];
            int[] first = start.order(oc, climb(ls, tables, oc, cpos, offset));
            for (int r = 0; r < ladder.length; r++) {
                ladder[r] = new OrderChain(ls, tables, oc, cpos, offset, s.features(), rng.split(), null, s.relocate(),
                        first);
            }
            return new TemperedOrderChain(ladder, beta, rng.split(), store);
        }).result();
    }
}
