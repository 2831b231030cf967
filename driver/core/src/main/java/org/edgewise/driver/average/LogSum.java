package org.edgewise.driver.average;

/**
 * Log-space sums, the one place they are written: log(e^a + e^b) and log Σ e^{x_i} over an array,
 * a prefix of it, or the entries whose parent-set mask fits in a set of allowed variables.
 *
 * <p>Every sum subtracts the largest term before exponentiating, so no term overflows and the
 * largest contributes exactly 1 (the usual log-sum-exp shift). The methods take primitive arrays
 * and allocate nothing: they sit in the inner loops of the order sums, the DP and the MCMC.
 */
public final class LogSum {
    private LogSum() {
    }

    /** log(e^a + e^b), exact for ±∞ operands. */
    public static double add(double a, double b) {
        if (a == Double.NEGATIVE_INFINITY) {
            return b;
        }
        if (b == Double.NEGATIVE_INFINITY) {
            return a;
        }
        return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
    }

    /**
     * log(e^x + e^y) for the zeta transforms of the exact DP, where it runs n·2^n times. A term
     * more than 40 nats below the other changes the sum by less than e^−40 ≈ 4·10^−18, below half
     * an ulp of 1, so it is dropped exactly as the rounding would; log(1 + t) with t ∈ [e^−40, 1]
     * loses nothing of the absolute accuracy that matters there. −∞ operands fall in the cut-off
     * branch (NaN compares false), so they need no test of their own.
     */
    public static double addTruncated(double x, double y) {
        double hi = Math.max(x, y);
        double d = Math.min(x, y) - hi;
        if (!(d > -40.0)) {
            return hi;
        }
        return hi + Math.log(1.0 + Math.exp(d));
    }

    /** log Σ e^{x_i} over {@code x[0..len)}, in two passes (max, then scaled sum); −∞ for an empty sum. */
    public static double of(double[] x, int len) {
        double max = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < len; i++) {
            max = Math.max(max, x[i]);
        }
        return of(x, len, max);
    }

    /**
     * log Σ e^{x_i} over {@code x[0..len)} when the caller already knows {@code max} = max_i x_i
     * (found while filling {@code x}); −∞ when {@code max} is −∞.
     */
    public static double of(double[] x, int len, double max) {
        if (max == Double.NEGATIVE_INFINITY) {
            return max;
        }
        double s = 0;
        for (int i = 0; i < len; i++) {
            s += Math.exp(x[i] - max);
        }
        return max + Math.log(s);
    }

    public static double of(double[] x) {
        return of(x, x.length);
    }

    /**
     * log Σ e^{x_s} over the entries s with {@code (masks[s] & ~allowed) == 0} — the parent sets
     * that lie inside {@code allowed} (e.g. an order's predecessors); −∞ when none does.
     */
    public static double ofSubsets(long[] masks, double[] x, long allowed) {
        double max = Double.NEGATIVE_INFINITY;
        for (int s = 0; s < masks.length; s++) {
            if ((masks[s] & ~allowed) == 0 && x[s] > max) {
                max = x[s];
            }
        }
        if (max == Double.NEGATIVE_INFINITY) {
            return max;
        }
        double sum = 0;
        for (int s = 0; s < masks.length; s++) {
            if ((masks[s] & ~allowed) == 0) {
                sum += Math.exp(x[s] - max);
            }
        }
        return max + Math.log(sum);
    }
}
