package org.edgewise.driver.average;

/** Log-space sums, the one place they are written. */
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

    /** log Σ e^{x_i} over {@code x[0..len)}, in two passes (max, then scaled sum); −∞ for an empty sum. */
    public static double of(double[] x, int len) {
        double max = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < len; i++) {
            max = Math.max(max, x[i]);
        }
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
}
