package org.edgewise.driver.average;

/**
 * Convergence diagnostics of a scalar quantity sampled by several Markov chains:
 * split-R̂ (Gelman &amp; Rubin 1992, "Inference from iterative simulation using multiple
 * sequences", Statistical Science 7; split form as in Vehtari, Gelman, Simpson, Carpenter &amp;
 * Bürkner 2021, "Rank-normalization, folding, and localization: an improved R̂", Bayesian
 * Analysis 16), and the effective sample size from the multi-chain autocorrelation with
 * Geyer's initial monotone sequence (Geyer 1992, Statistical Science 7; the multi-chain form of
 * Vehtari et al. 2021, sec. 3.2). Not rank-normalised: the quantities here are Rao-Blackwellised
 * probabilities in [0, 1] or 0/1 indicators, without heavy tails.
 *
 * <p>Input {@code x[c][t]}: chain c, draw t, all chains of equal length. Each chain is split
 * into halves (the middle draw dropped when the length is odd), giving 2M sequences of N draws:
 * <pre>
 *   W = mean of the within-sequence variances,  B/N = variance of the sequence means
 *   var⁺ = (N−1)/N · W + B/N,   R̂ = sqrt(var⁺ / W)
 *   ρ̂_t = 1 − (W − mean_m s²_m ρ̂_{t,m}) / var⁺,   τ = −1 + 2 Σ_{k} (ρ̂_{2k} + ρ̂_{2k+1})  (Geyer)
 *   ESS = 2M·N / τ,   MCSE of the mean = sqrt(var⁺ / ESS)
 * </pre>
 * A quantity that does not vary within any sequence has R̂ = 1 when all sequences agree and +∞
 * when they do not (chains stuck in different places); its ESS is NaN (nothing to estimate).
 */
public final class ChainDiagnostics {
    private ChainDiagnostics() {
    }

    /** R̂, ESS and MCSE of one quantity. */
    public record Summary(double mean, double rhat, double ess, double mcse) {
    }

    /** Split sequences of {@code x}: 2M rows of ⌊T/2⌋ draws. */
    static double[][] split(double[][] x) {
        int m = x.length;
        int t = x[0].length;
        int h = t / 2;
        double[][] s = new double[2 * m][h];
        for (int c = 0; c < m; c++) {
            System.arraycopy(x[c], 0, s[2 * c], 0, h);
            System.arraycopy(x[c], t - h, s[2 * c + 1], 0, h);
        }
        return s;
    }

    /** Split-R̂ alone (cheap: no autocorrelations); 1 with fewer than 4 draws per chain. */
    public static double splitRhat(double[][] x) {
        if (x[0].length < 4) {
            return Double.NaN;
        }
        double[][] s = split(x);
        int m = s.length;
        int n = s[0].length;
        double[] means = new double[m];
        double w = 0;
        for (int c = 0; c < m; c++) {
            means[c] = mean(s[c]);
            w += variance(s[c], means[c]);
        }
        w /= m;
        double b = variance(means, mean(means));
        return rhat(w, b, n);
    }

    private static double rhat(double w, double bOverN, int n) {
        if (!(w > 1e-300)) {
            return bOverN > 1e-24 ? Double.POSITIVE_INFINITY : 1.0;
        }
        double varPlus = (n - 1.0) / n * w + bOverN;
        return Math.sqrt(varPlus / w);
    }

    /** Mean over all draws, split-R̂, bulk ESS and Monte Carlo standard error of the mean. */
    public static Summary summary(double[][] x) {
        int total = 0;
        double sum = 0;
        for (double[] c : x) {
            for (double v : c) {
                sum += v;
            }
            total += c.length;
        }
        double mean = sum / total;
        if (x[0].length < 4) {
            return new Summary(mean, Double.NaN, Double.NaN, Double.NaN);
        }
        double[][] s = split(x);
        int m = s.length;
        int n = s[0].length;
        double[] means = new double[m];
        double[] vars = new double[m];
        double w = 0;
        for (int c = 0; c < m; c++) {
            means[c] = mean(s[c]);
            vars[c] = variance(s[c], means[c]);
            w += vars[c];
        }
        w /= m;
        double bOverN = variance(means, mean(means));
        double rhat = rhat(w, bOverN, n);
        if (!(w > 1e-300)) {
            return new Summary(mean, rhat, Double.NaN, bOverN > 1e-24 ? Math.sqrt(bOverN / m) : 0.0);
        }
        double varPlus = (n - 1.0) / n * w + bOverN;
        // mean over sequences of the biased autocovariances acov_{t,m} (= s²_m ρ̂_{t,m} · (N−1)/N)
        double[] acov = new double[n];
        for (int c = 0; c < m; c++) {
            double[] a = autocovariance(s[c], means[c]);
            for (int t = 0; t < n; t++) {
                acov[t] += a[t] / m;
            }
        }
        // Geyer's initial positive and monotone sequence on ρ̂_t = 1 − (W − mean acov_t)/var⁺
        // (W uses the N−1 denominator, acov the biased N one, as in Vehtari et al. 2021, eq. 10)
        double prevPair = Double.POSITIVE_INFINITY;
        double tau = -1;
        int t = 0;
        while (t + 1 < n) {
            double r0 = t == 0 ? 1.0 : 1 - (w - acov[t]) / varPlus;
            double r1 = 1 - (w - acov[t + 1]) / varPlus;
            double pair = r0 + r1;
            if (pair < 0) {
                break;
            }
            pair = Math.min(pair, prevPair);
            prevPair = pair;
            tau += 2 * pair;
            t += 2;
        }
        double draws = (double) m * n;
        tau = Math.max(tau, 1.0 / Math.log10(Math.max(draws, 10)));
        double ess = draws / tau;
        return new Summary(mean, rhat, ess, Math.sqrt(varPlus / ess));
    }

    /** Biased autocovariance acov_t = (1/N) Σ_{u<N−t} (x_u − m)(x_{u+t} − m), by FFT (O(N log N)). */
    static double[] autocovariance(double[] x, double mean) {
        int n = x.length;
        int size = Integer.highestOneBit(Math.max(1, 2 * n - 1));
        if (size < 2 * n) {
            size <<= 1;
        }
        double[] re = new double[size];
        double[] im = new double[size];
        for (int u = 0; u < n; u++) {
            re[u] = x[u] - mean;
        }
        fft(re, im, false);
        for (int k = 0; k < size; k++) {
            re[k] = re[k] * re[k] + im[k] * im[k];
            im[k] = 0;
        }
        fft(re, im, true);
        double[] out = new double[n];
        for (int u = 0; u < n; u++) {
            out[u] = re[u] / size / n;
        }
        return out;
    }

    /** In-place iterative radix-2 FFT (Cooley &amp; Tukey 1965); length a power of two. */
    static void fft(double[] re, double[] im, boolean inverse) {
        int n = re.length;
        for (int i = 1, j = 0; i < n; i++) {
            int bit = n >> 1;
            for (; (j & bit) != 0; bit >>= 1) {
                j ^= bit;
            }
            j ^= bit;
            if (i < j) {
                double t = re[i];
                re[i] = re[j];
                re[j] = t;
                t = im[i];
                im[i] = im[j];
                im[j] = t;
            }
        }
        for (int len = 2; len <= n; len <<= 1) {
            double ang = 2 * Math.PI / len * (inverse ? 1 : -1);
            double wr = Math.cos(ang);
            double wi = Math.sin(ang);
            for (int i = 0; i < n; i += len) {
                double cr = 1;
                double ci = 0;
                for (int k = 0; k < len / 2; k++) {
                    int a = i + k;
                    int b = a + len / 2;
                    double xr = re[b] * cr - im[b] * ci;
                    double xi = re[b] * ci + im[b] * cr;
                    re[b] = re[a] - xr;
                    im[b] = im[a] - xi;
                    re[a] += xr;
                    im[a] += xi;
                    double ncr = cr * wr - ci * wi;
                    ci = cr * wi + ci * wr;
                    cr = ncr;
                }
            }
        }
    }

    private static double mean(double[] x) {
        double s = 0;
        for (double v : x) {
            s += v;
        }
        return s / x.length;
    }

    /** Sample variance with the N−1 denominator. */
    private static double variance(double[] x, double mean) {
        if (x.length < 2) {
            return 0;
        }
        double s = 0;
        for (double v : x) {
            s += (v - mean) * (v - mean);
        }
        return s / (x.length - 1);
    }
}
