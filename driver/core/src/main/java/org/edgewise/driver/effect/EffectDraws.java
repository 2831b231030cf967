package org.edgewise.driver.effect;

import java.util.Arrays;
import org.edgewise.driver.average.convergence.ChainDiagnostics;

/**
 * The posterior distribution of an effect from draws of (DAG, θ): a DAG from the structure
 * posterior, its parameters from their Dirichlet posteriors, and the effect computed exactly
 * under that pair. The effect is the difference P(y | do(a), w) − P(y | do(a0), w) with a
 * reference intervention, else P(y | do(a), w) itself.
 *
 * @param of        {@code "difference"} or {@code "probability"}
 * @param count     number of draws
 * @param mean      mean of the draws
 * @param level     level of the central credible interval (0.95)
 * @param lower     its lower end (the (1 − level)/2 quantile of the draws, type 7)
 * @param upper     its upper end
 * @param binLow    left edge of the first histogram bin
 * @param binHigh   right edge of the last bin
 * @param counts    draws per bin (equal widths)
 * @param noPathShare share of draws whose DAG has no directed path from an intervened variable to the outcome
 */
public record EffectDraws(String of, int count, double mean, double level, double lower, double upper,
                          double binLow, double binHigh, int[] counts, double noPathShare) {
    /** Bins of the histogram. */
    public static final int BINS = 24;

    /** Summarises the effect values of the draws and their no-path indicators. */
    static EffectDraws of(String of, double[] values, boolean[] noPath, double level) {
        double[] v = values.clone();
        Arrays.sort(v);
        int k = v.length;
        double mean = 0;
        int none = 0;
        for (int i = 0; i < k; i++) {
            mean += values[i] / k;
            none += noPath[i] ? 1 : 0;
        }
        double lo = v[0];
        double hi = v[k - 1];
        if (hi - lo < 1e-12) {
            lo -= 0.005;
            hi += 0.005;
        }
        int[] counts = new int[BINS];
        for (double x : v) {
            int b = (int) Math.floor((x - lo) / (hi - lo) * BINS);
            counts[Math.max(0, Math.min(BINS - 1, b))]++;
        }
        return new EffectDraws(of, k, mean, level, ChainDiagnostics.sortedQuantile(v, (1 - level) / 2), ChainDiagnostics.sortedQuantile(v, (1 + level) / 2),
                lo, hi, counts, none / (double) k);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof EffectDraws d && d.count == count && d.mean == mean && Arrays.equals(d.counts, counts);
    }

    @Override
    public int hashCode() {
        return Arrays.hashCode(counts);
    }

    @Override
    public String toString() {
        return "EffectDraws[" + of + ", " + count + ", mean " + mean + "]";
    }
}
