package org.edgewise.driver.average.convergence;

import org.edgewise.driver.Checks;

/**
 * What "converged" means for a run of several chains: every deciding quantity has rank-normalised
 * R̂ below {@code rhat}, bulk-ESS at least {@code ess} and — for the reported probabilities (edge
 * posteriors, features) — a Monte Carlo standard error of at most {@code mcse}.
 *
 * <p><b>Why an MCSE target besides ESS ≥ 400.</b> ESS ≥ 400 (Vehtari et al. 2021) makes R̂ and
 * the ESS estimate itself reliable; it does not make two runs agree to a stated accuracy. An
 * edge posterior near 0.5 whose per-draw values are 0 or 1 has variance p(1 − p) = 1/4, so with
 * ESS 400 its MCSE is √(0.25/400) = 0.025: the standard error of a mean is σ/√N, for N independent
 * Bernoulli(p) draws √(p(1 − p)/N) (any statistics text, e.g. Casella &amp; Berger, Statistical
 * Inference, 2nd ed., sec. 5.2 — from memory), and for correlated draws N becomes the ESS (Flegal,
 * Haran &amp; Jones 2008, "Markov chain Monte Carlo: can we trust the third significant figure?",
 * Statistical Science 23). Two independent runs then differ by a
 * normal amount with standard deviation √2·MCSE = 0.035, and over many such edges the largest
 * difference exceeds 0.05 almost surely.
 *
 * <p><b>The default, {@value #DEFAULT_MCSE}.</b> With every reported probability's MCSE ≤ t, the
 * difference of two runs on one edge has sd ≤ √2·t, and P(|Δ| &gt; 0.05) ≤ 2(1 − Φ(0.05/(√2 t))).
 * For t = 0.01 that is 2(1 − Φ(3.54)) = 4.1·10⁻⁴ per edge; by the union bound the largest |Δ|
 * over m uncertain edges stays within 0.05 with probability ≥ 1 − m·4.1·10⁻⁴: ≥ 99 % for m = 20,
 * ≥ 95 % for m = 100 edges all at the bound (Φ from Abramowitz &amp; Stegun table 26.1). Edges
 * near 0 or 1 have far smaller MCSE, so in practice only the few genuinely uncertain edges count.
 * t = 0.0125 would give 4.7·10⁻³ per edge (m = 10 already 5 %); t = 0.005 would cost four times
 * the draws of 0.01. The cost of t is an ESS of up to σ²/t² = 2,500 for the worst edge (σ² ≤
 * 1/4 for any quantity in [0, 1], Bhatia &amp; Davis 2000, Amer. Math. Monthly 107), about six times the 400 of the ESS rule.
 *
 * <p>The draws kept per chain must allow that ESS: a check uses at least half of the ≥ cap stored
 * draws of each of M chains, so {@link #drawsPerChain} keeps cap ≥ 1/(M·t²) — then M·cap/2 draws
 * used hold twice the ESS σ²/t² needs, room for draws that are correlated up to ESS/N = 1/2.
 *
 * @param rhat R̂ strictly below this counts as converged (default {@value ChainDiagnostics#RHAT_TARGET})
 * @param ess  bulk-ESS at or above this (default {@value ChainDiagnostics#ESS_TARGET})
 * @param mcse MCSE of a probability at or below this (default {@value #DEFAULT_MCSE})
 */
public record ConvergenceTargets(double rhat, double ess, double mcse) {
    /** The default MCSE target of a reported probability (argued above). */
    public static final double DEFAULT_MCSE = 0.01;
    /**
     * Smallest MCSE target accepted: below it the draws kept per chain (1/(M·t²), {@link #drawsPerChain})
     * would not fit in memory on wide tables (t = 0.005, 4 chains: 10,000 draws of 4 bytes per edge).
     */
    public static final double MIN_MCSE = 0.005;
    /** Largest MCSE target accepted: 0.5 is the largest standard deviation of a quantity in [0, 1] (no requirement). */
    public static final double MAX_MCSE = 0.5;
    /** Least draws kept per chain when running until converged. */
    public static final int MIN_DRAWS = 1000;

    /** R̂ 1.01, bulk-ESS 400 (Vehtari et al. 2021, sec. 4), MCSE 0.01 (argued above). */
    public static final ConvergenceTargets DEFAULTS = new ConvergenceTargets(ChainDiagnostics.RHAT_TARGET,
            ChainDiagnostics.ESS_TARGET, DEFAULT_MCSE);

    public ConvergenceTargets {
        if (!(rhat > 1) || !(ess > 0)) {
            throw new IllegalArgumentException("targets R-hat " + rhat + ", ESS " + ess);
        }
        mcse(mcse, "the Monte Carlo standard error target");
    }

    /** The default targets with R̂ target {@code rhat}. */
    public static ConvergenceTargets withRhat(double rhat) {
        return new ConvergenceTargets(rhat, ChainDiagnostics.ESS_TARGET, DEFAULT_MCSE);
    }

    /** These targets with MCSE target {@code t}. */
    public ConvergenceTargets withMcse(double t) {
        return new ConvergenceTargets(rhat, ess, t);
    }

    /** Checks a user's MCSE target, naming it {@code what}: in [{@value #MIN_MCSE}, {@value #MAX_MCSE}]. */
    public static double mcse(double t, String what) {
        return Checks.between(t, MIN_MCSE, MAX_MCSE, what);
    }

    /**
     * Draws to keep per chain when running until converged with {@code chains} chains:
     * max({@code asked}, {@value #MIN_DRAWS}, ⌈1/(chains·t²)⌉) — 2,500 for 4 chains and t = 0.01.
     */
    public int drawsPerChain(int asked, int chains) {
        double need = Math.ceil(1.0 / (Math.max(1, chains) * mcse * mcse));
        return (int) Math.max(Math.max(asked, MIN_DRAWS), Math.min(need, Integer.MAX_VALUE / 4));
    }
}
