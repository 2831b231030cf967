package org.edgewise.driver.average.ordermcmc;

import java.util.SplittableRandom;
import org.edgewise.driver.average.mcmc.DrawStore;
import org.edgewise.driver.average.mcmc.SteppedChain;

/**
 * One reported order-MCMC chain made of a ladder of tempered order chains — Metropolis-coupled
 * MCMC, or parallel tempering (Geyer 1991, "Markov chain Monte Carlo maximum likelihood";
 * Earl &amp; Deem 2005, "Parallel tempering: theory, applications, and new perspectives"). Rung r
 * is an {@link OrderChain} with the target π(≺)^{β_r}, β_0 = 1 &gt; β_1 &gt; … &gt; β_{R−1}; a
 * flatter rung crosses between modes of the order posterior that the β = 1 chain cannot leave,
 * and swaps hand its states down the ladder. Only rung 0 (β = 1) is recorded.
 *
 * <p>One step: every rung makes one move of its own ({@link OrderChain#move}: a swap proposal or
 * a Gibbs relocation, each invariant for π^β), then states are proposed for exchange between
 * adjacent rungs — on even steps the pairs (0,1), (2,3), …, on odd steps (1,2), (3,4), … (the
 * deterministic even–odd scheme; Okabe et al. 2001; Syed, Bouchard-Côté, Deligiannidis &amp;
 * Doucet 2021, which makes the states travel the ladder in O(R) rather than O(R²) steps). The
 * exchange of the states of rungs a and b is accepted with probability
 * min(1, exp((β_a − β_b)(L_b − L_a))), L the log target at β = 1 of a state ({@link OrderChain#score}):
 * the Metropolis–Hastings ratio π(x_b)^{β_a} π(x_a)^{β_b} / (π(x_a)^{β_a} π(x_b)^{β_b}) of a
 * symmetric proposal on the product space Π_r π^{β_r}, so the joint — and its β = 1 marginal, the
 * order posterior — is invariant. Each swap set is a product of such updates on disjoint pairs;
 * the alternation composes invariant kernels (not reversible, still invariant).
 *
 * <p>A swap exchanges the rungs' chain objects and their β (O(1); a chain's caches travel with its
 * state). The ladder is geometric: β_r = β_min^{r/(R−1)} ({@link #geometricLadder}).
 *
 * <p>Memory per reported chain: R × (the state and caches of one {@link OrderChain}: O(n) plus,
 * per non-tabulated child, 4096 cache entries of 17 bytes) and one {@link DrawStore}. CPU: R
 * moves per step. Mutable, confined to one thread at a time.
 */
public final class TemperedOrderChain extends SteppedChain {
    private final OrderChain[] rung;
    private final double[] beta;
    private final long[] swapTried;
    private final long[] swapAccepted;
    private final SplittableRandom swapRng;

    /**
     * @param rungs one chain per rung, each with its own random stream; their β is set here
     * @param beta  the ladder, β[0] = 1, strictly decreasing, all &gt; 0
     * @param swapRng the stream of the exchange decisions (the rungs' own streams drive their moves)
     */
    TemperedOrderChain(OrderChain[] rungs, double[] beta, SplittableRandom swapRng, DrawStore draws) {
        super(draws);
        this.swapRng = swapRng;
        if (rungs.length != beta.length || beta.length < 1 || beta[0] != 1) {
            throw new IllegalArgumentException("ladder of " + rungs.length + " rungs, " + beta.length + " temperatures");
        }
        for (int r = 1; r < beta.length; r++) {
            if (!(beta[r] > 0 && beta[r] < beta[r - 1])) {
                throw new IllegalArgumentException("inverse temperatures must decrease and stay > 0: " + beta[r]);
            }
        }
        this.rung = rungs.clone();
        this.beta = beta.clone();
        for (int r = 0; r < rung.length; r++) {
            rung[r].beta(beta[r]);
        }
        swapTried = new long[Math.max(0, beta.length - 1)];
        swapAccepted = new long[swapTried.length];
        rung[0].recordStart(draws);
    }

    /** R inverse temperatures β_r = β_min^{r/(R−1)}, from 1 down to {@code betaMin} (R = 1: just 1). */
    static double[] geometricLadder(int rungs, double betaMin) {
        double[] b = new double[rungs];
        for (int r = 0; r < rungs; r++) {
            b[r] = rungs == 1 ? 1 : Math.pow(betaMin, (double) r / (rungs - 1));
        }
        b[0] = 1;
        return b;
    }

    /**
     * The log acceptance probability of exchanging the states of two rungs:
     * min(0, (β_a − β_b)(L_b − L_a)) with L the β = 1 log targets of their states.
     */
    static double logSwapAcceptance(double betaA, double betaB, double logTargetA, double logTargetB) {
        return Math.min(0, (betaA - betaB) * (logTargetB - logTargetA));
    }

    @Override
    protected void move() {
        long before = rung[0].acceptedCount();
        OrderChain cold = rung[0];
        for (OrderChain c : rung) {
            c.move();
        }
        accepted += cold.acceptedCount() - before;
        for (int a = (int) (stepsDone & 1); a + 1 < rung.length; a += 2) {
            trySwap(a);
        }
    }

    private void trySwap(int a) {
        int b = a + 1;
        swapTried[a]++;
        double logAcc = logSwapAcceptance(beta[a], beta[b], rung[a].score(), rung[b].score());
        if (logAcc < 0 && !(Math.log(swapRng.nextDouble()) < logAcc)) {
            return;
        }
        swapAccepted[a]++;
        OrderChain t = rung[a];
        rung[a] = rung[b];
        rung[b] = t;
        rung[a].beta(beta[a]);
        rung[b].beta(beta[b]);
    }

    @Override
    protected void record() {
        rung[0].recordInto(draws, stepsDone);
    }

    /** Per adjacent pair (r, r+1), the share of proposed exchanges accepted (NaN when none was proposed). */
    @Override
    public double[] swapAcceptance() {
        double[] a = new double[swapTried.length];
        for (int r = 0; r < a.length; r++) {
            a[r] = swapTried[r] == 0 ? Double.NaN : (double) swapAccepted[r] / swapTried[r];
        }
        return a;
    }

    int rungs() {
        return rung.length;
    }
}
