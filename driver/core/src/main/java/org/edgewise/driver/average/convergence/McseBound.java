package org.edgewise.driver.average.convergence;

/**
 * The error reported for a Monte Carlo estimate of a probability that came out exactly 0 or 1.
 * Its sample standard error is 0, which would claim a certainty K draws cannot give. Instead
 * report 3/K, the "rule of three" (Hanley &amp; Lippman-Hand 1983, "If nothing goes wrong, is
 * everything all right?", JAMA 249): with no event in K independent draws, the one-sided 95% upper
 * confidence bound on the probability is 1 − 0.05^{1/K} ≈ −ln(0.05)/K ≈ 3/K (and 3/K is never below
 * it). For correlated draws (MCMC) K overstates the information, so the bound is optimistic there;
 * it is still far more honest than 0. Estimates strictly inside (0, 1) keep their MCSE.
 */
public final class McseBound {
    private McseBound() {
    }

    /** 3/K, the rule-of-three bound for K draws without an event. */
    public static double ruleOfThree(long draws) {
        if (draws < 1) {
            throw new IllegalArgumentException("draws must be at least 1, got " + draws);
        }
        return Math.min(1.0, 3.0 / draws);
    }

    /**
     * The error to report for {@code mean} estimated from {@code draws} draws with standard error
     * {@code mcse}: {@code max(mcse, 3/K)} when {@code mean} is exactly 0 or 1, else {@code mcse}.
     */
    public static double reported(double mean, double mcse, long draws) {
        if (mean == 0.0 || mean == 1.0) {
            double b = ruleOfThree(draws);
            return Double.isNaN(mcse) ? b : Math.max(mcse, b);
        }
        return mcse;
    }
}
