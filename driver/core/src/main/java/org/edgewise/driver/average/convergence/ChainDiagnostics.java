package org.edgewise.driver.average.convergence;

import java.util.Arrays;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;

/**
 * Convergence diagnostics of a scalar quantity sampled by several Markov chains, after Vehtari,
 * Gelman, Simpson, Carpenter &amp; Bürkner 2021, "Rank-normalization, folding, and localization: an
 * improved R̂ for assessing convergence of MCMC", Bayesian Analysis 16 (sec. 3–4):
 * <ul>
 *   <li>each chain is split into halves (the middle draw dropped when the length is odd): 2M
 *       sequences of N draws;</li>
 *   <li>rank normalisation: pooled ranks r (ties get their average rank) mapped to
 *       z = Φ⁻¹((r − 3/8)/(S + 1/4)), S = 2M·N (Blom 1958);</li>
 *   <li>bulk R̂ = split-R̂ of z; folded R̂ = split-R̂ of the rank-normalised |x − median(x)|;
 *       {@code rhat} = max of the two (so equal means with unequal spreads are flagged);</li>
 *   <li>bulk-ESS = ESS of z; tail-ESS = min of the ESS of the indicators I(x ≤ q₀.₀₅) and
 *       I(x ≤ q₀.₉₅) (an indicator that never varies is left out);</li>
 *   <li>split-R̂ (Gelman &amp; Rubin 1992): W = mean within-sequence variance, B/N = variance of the
 *       sequence means, var⁺ = (N−1)/N·W + B/N, R̂ = sqrt(var⁺/W);</li>
 *   <li>ESS = S/τ, τ = −1 + 2 Σ_k (ρ̂_{2k} + ρ̂_{2k+1}) with ρ̂_t = 1 − (W − mean_m acov_{t,m})/var⁺
 *       summed while the pairs are positive and made monotone (Geyer 1992, Statistical Science
 *       7; the multi-chain form of Vehtari et al. 2021, eq. 10), τ ≥ 1/log₁₀(S);</li>
 *   <li>MCSE of the mean = sqrt(var⁺ / ESS) with the ESS of the raw (not rank-normalised)
 *       draws.</li>
 * </ul>
 *
 * <p>Degenerate quantities are classified instead of producing artefacts ({@link State}): a
 * quantity equal in every draw of every chain is {@link State#CONSTANT} (R̂ 1, nothing to
 * estimate); constant within each chain but different between chains is {@link State#STUCK}
 * (R̂ = ∞: a real failure); a probability whose draws all lie within {@code settleSpan} is
 * {@link State#SETTLED}: however the chains move between the orders they visit, no estimate
 * formed from them can differ by more than that span, so its R̂ (which is scale-free, and
 * would flag chains that differ by 10⁻⁶) is reported but does not decide convergence.
 *
 * <p>Agreement is not convergence when every chain may sit in the same wrong mode (issue 20: an
 * order-modular run said converged with an edge at 0 against an exact 0.20, all chains in one
 * mode). So when the chains' starting values are known ({@link #summary(double[][], double, double[], boolean)}),
 * a quantity whose draws agree (constant, or within {@code settleSpan}) is judged by one of three
 * rules, and the state says which applied:
 * <ul>
 *   <li>{@link State#SETTLED}: chains that started on both sides of the estimate (some at or below
 *       it, some at or above it, to within {@code settleSpan}) came to agree — unless every draw of
 *       every chain is the one value every chain started from (then no chain moved) — over-dispersed starts that
 *       meet (Gelman &amp; Rubin 1992, sec. 2); it does not block convergence;</li>
 *   <li>{@link State#NEGLIGIBLE}: no chain started on the other side, but the quantity is a
 *       Rao-Blackwellised probability whose estimate in every chain is within
 *       {@value #NEGLIGIBLE} of 0 or of 1 — the other value is out of the chains' reach by the
 *       chains' own exact conditional probabilities, so it does not block either;</li>
 *   <li>{@link State#TRAP}: otherwise — every chain started on one side and stayed there, a trap the
 *       chains may share; it blocks convergence.</li>
 * </ul>
 *
 * <p>The MCSE of a Rao-Blackwellised probability ({@link #honestMcse}) is the largest of the ESS-based
 * one above, a batch-means one (which sees the rare long excursions a Rao-Blackwellised estimate of
 * a rare edge rests on) and a floor of 1/S for S pooled draws.
 */
public final class ChainDiagnostics {
    /** R̂ below this counts as converged (Vehtari et al. 2021, sec. 4: 1.01). */
    public static final double RHAT_TARGET = 1.01;
    /** Bulk-ESS at or above this counts as converged (Vehtari et al. 2021, sec. 4: 400 for 4 chains). */
    public static final double ESS_TARGET = 400;
    /** Probabilities whose draws span less than this are {@link State#SETTLED}. */
    public static final double SETTLE_SPAN = 0.005;
    /**
     * A Rao-Blackwellised probability whose every chain's estimate is within this of 0 or 1 is
     * {@link State#NEGLIGIBLE} when its draws agree (issue 20's figure: beyond any value a chain
     * can reach in the draws a run keeps).
     */
    public static final double NEGLIGIBLE = 1e-6;
    /** Φ for the rank normalisation; no random generator (its draws are never asked for). */
    private static final NormalDistribution STANDARD_NORMAL = new NormalDistribution(null, 0, 1);

    private ChainDiagnostics() {
    }

    /** How a quantity behaved in the chains. */
    public enum State {
        /** Varied: R̂ and ESS are meaningful. */
        VARIES,
        /** Equal in every draw of every chain. */
        CONSTANT,
        /** Constant within each chain, different between chains. */
        STUCK,
        /**
         * A probability whose draws all lie within {@link #SETTLE_SPAN} — when the starts are known,
         * only if chains that started on both sides of it agree.
         */
        SETTLED,
        /** Draws agree, no chain started on the other side, every chain's estimate within {@link #NEGLIGIBLE} of 0 or 1. */
        NEGLIGIBLE,
        /** Draws agree, every chain started on one side, and the other side is not negligible: a shared trap. */
        TRAP;

        public String label() {
            return name().toLowerCase(java.util.Locale.ROOT);
        }
    }

    /**
     * Diagnostics of one quantity.
     *
     * @param rhat    max(bulk, folded) rank-normalised split-R̂; 1 when constant, +∞ when stuck
     * @param essBulk bulk-ESS; NaN when constant or stuck
     * @param essTail tail-ESS; NaN when neither tail indicator varies
     * @param mcse    Monte Carlo standard error of the mean ({@link #honestMcse}); 0 when constant and the starts are unknown
     * @param equalDraws whether the quantity was equal in every draw of every chain
     */
    public record Summary(double mean, double rhat, double essBulk, double essTail, double mcse, State state,
                          boolean equalDraws) {
        /** Whether this quantity meets R̂ &lt; {@code rhatTarget} and bulk-ESS ≥ {@link #ESS_TARGET} (or does not vary enough to matter). */
        public boolean converged(double rhatTarget) {
            return converged(ConvergenceTargets.withRhat(rhatTarget), false);
        }

        /**
         * Whether this quantity meets the targets: R̂ &lt; {@code t.rhat()}, bulk-ESS ≥ {@code t.ess()}
         * and, when it is a reported {@code probability}, MCSE ≤ {@code t.mcse()} (an undefined MCSE
         * fails); constant and settled quantities do not vary enough to matter, stuck ones fail.
         */
        public boolean converged(ConvergenceTargets t, boolean probability) {
            return switch (state) {
                case CONSTANT, SETTLED, NEGLIGIBLE -> true;
                case STUCK, TRAP -> false;
                case VARIES -> rhat < t.rhat() && essBulk >= t.ess() && (!probability || mcse <= t.mcse());
            };
        }
    }

    /** {@link #summary(double[][], double)} without the settled rule (for quantities that are not probabilities). */
    public static Summary summary(double[][] x) {
        return summary(x, 0);
    }

    /** The diagnostics of {@code x[c][t]} (chain c, draw t; chains of equal length ≥ 4), starts unknown. */
    public static Summary summary(double[][] x, double settleSpan) {
        return summary(x, settleSpan, null, false);
    }

    /**
     * The diagnostics of {@code x[c][t]} with {@code starts[c]} the value of the quantity at chain c's
     * starting state (null or any NaN: unknown, then agreeing draws are {@link State#CONSTANT} or
     * {@link State#SETTLED} as before); {@code raoBlackwellised}: the draws are exact conditional
     * probabilities (the {@link State#NEGLIGIBLE} rule and the MCSE floor apply to those only).
     */
    public static Summary summary(double[][] x, double settleSpan, double[] starts, boolean raoBlackwellised) {
        Summary s = plain(x, settleSpan, raoBlackwellised);
        // agreeing: equal draws, or all within the span — also when each chain is constant at its own value
        boolean agreeing = s.state() == State.CONSTANT || s.state() == State.SETTLED
                || (s.state() == State.STUCK && span(x) < settleSpan);
        if (starts == null || !agreeing) {
            return s;
        }
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double v : starts) {
            if (Double.isNaN(v)) {
                return s;
            }
            lo = Math.min(lo, v);
            hi = Math.max(hi, v);
        }
        State rule;
        // sides at the resolution the draws agree to: a start within the span of the estimate is on both;
        // chains whose every draw is the value they all started from never moved, and show nothing
        boolean bracketed = lo <= s.mean() + settleSpan && s.mean() - settleSpan <= hi;
        boolean moved = !(s.equalDraws() && lo == hi && lo == x[0][0]);
        if (bracketed && moved) {
            rule = State.SETTLED;
        } else if (raoBlackwellised && negligible(x)) {
            rule = State.NEGLIGIBLE;
        } else {
            rule = State.TRAP;
        }
        return new Summary(s.mean(), s.rhat(), s.essBulk(), s.essTail(), s.mcse(), rule, s.equalDraws());
    }

    private static double span(double[][] x) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (double[] c : x) {
            for (double v : c) {
                lo = Math.min(lo, v);
                hi = Math.max(hi, v);
            }
        }
        return hi - lo;
    }

    /** Whether every chain's mean of {@code x} is within {@link #NEGLIGIBLE} of 0, or every one within it of 1. */
    static boolean negligible(double[][] x) {
        boolean low = true;
        boolean high = true;
        for (double[] c : x) {
            double m = mean(c);
            low &= m < NEGLIGIBLE;
            high &= m > 1 - NEGLIGIBLE;
        }
        return low || high;
    }

    /**
     * The MCSE of the pooled mean of {@code x} that its error can be trusted to: for Rao-Blackwellised
     * probabilities the largest of {@code essMcse} (sqrt(var⁺/ESS)), the batch-means standard error over
     * all chains and the floor; for other quantities {@code essMcse} (indicator draws are bounded, and
     * an estimate of 0 or 1 from them reports the rule of three downstream, {@link McseBound}).
     * Batch means (Flegal, Haran &amp; Jones 2008, "Markov chain Monte Carlo: can we trust the third
     * significant figure?", Statistical Science 23): each chain cut into B = ⌊√T⌋ batches of
     * b = ⌊T/B⌋ draws, σ̂² = b·Σ (batch mean − grand mean)² / (M·B − 1), MCSE = sqrt(σ̂²/(M·B·b)); the
     * deviations are taken from the grand mean, so chains that disagree raise it. It sees what the
     * ESS of the raw draws misses for a rare edge: a mean resting on a few long excursions (Geyer's
     * truncation stops at the first negative pair). The floor, for Rao-Blackwellised probabilities,
     * is 1/S for S pooled draws: no estimate from S draws resolves mass finer than one draw's share —
     * a region of the state space the chains visit once in S draws shifts the mean by up to 1/S — so
     * an estimate of 10⁻¹⁹ is not reported ± 10⁻²⁰.
     */
    static double honestMcse(double[][] x, double essMcse, boolean raoBlackwellised) {
        double floor = raoBlackwellised ? 1.0 / ((double) x.length * x[0].length) : 0;
        if (!raoBlackwellised) {
            return Double.isNaN(essMcse) ? floor : essMcse;
        }
        int m = x.length;
        int t = x[0].length;
        int batches = Math.max(1, (int) Math.sqrt(t));
        int b = t / batches;
        double grand = 0;
        for (double[] c : x) {
            for (int k = 0; k < batches * b; k++) {
                grand += c[k];
            }
        }
        grand /= (double) m * batches * b;
        double ss = 0;
        for (double[] c : x) {
            for (int j = 0; j < batches; j++) {
                double bm = 0;
                for (int k = j * b; k < (j + 1) * b; k++) {
                    bm += c[k];
                }
                bm /= b;
                ss += (bm - grand) * (bm - grand);
            }
        }
        int nb = m * batches;
        double bmMcse = nb > 1 ? Math.sqrt(b * ss / (nb - 1) / ((double) nb * b)) : Double.NaN;
        double out = floor;
        if (!Double.isNaN(essMcse)) {
            out = Math.max(out, essMcse);
        }
        if (!Double.isNaN(bmMcse)) {
            out = Math.max(out, bmMcse);
        }
        return out;
    }

    private static Summary plain(double[][] x, double settleSpan, boolean raoBlackwellised) {
        double[][] s = split(x);
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        double sum = 0;
        int total = 0;
        for (double[] c : x) {
            for (double v : c) {
                lo = Math.min(lo, v);
                hi = Math.max(hi, v);
                sum += v;
            }
            total += c.length;
        }
        double mean = sum / total;
        if (x[0].length < 4) {
            return new Summary(mean, Double.NaN, Double.NaN, Double.NaN, Double.NaN, State.VARIES, lo == hi);
        }
        if (lo == hi) {
            return new Summary(mean, 1.0, Double.NaN, Double.NaN, raoBlackwellised ? honestMcse(x, 0, true) : 0.0,
                    State.CONSTANT, true);
        }
        boolean within = false;
        for (double[] c : x) {
            for (double v : c) {
                if (v != c[0]) {
                    within = true;
                    break;
                }
            }
        }
        if (!within) {
            return new Summary(mean, Double.POSITIVE_INFINITY, Double.NaN, Double.NaN,
                    honestMcse(x, Math.sqrt(variance(chainMeans(x)) / x.length), raoBlackwellised), State.STUCK, false);
        }
        if (hi - lo < settleSpan) {
            // settled: the classic split-R̂ for the record (cheap), no ESS — it decides nothing
            return new Summary(mean, splitRhat(s), Double.NaN, Double.NaN,
                    honestMcse(x, Math.sqrt(varPlus(s) / s.length / s[0].length), raoBlackwellised), State.SETTLED, false);
        }
        double rBulk = splitRhat(rankNormal(s));
        double[][] folded = new double[s.length][];
        double med = median(s);
        for (int m = 0; m < s.length; m++) {
            folded[m] = new double[s[m].length];
            for (int t = 0; t < s[m].length; t++) {
                folded[m][t] = Math.abs(s[m][t] - med);
            }
        }
        double rFold = splitRhat(rankNormal(folded));
        double rhat = Math.max(rBulk, rFold);
        double essBulk = ess(rankNormal(s));
        double essTail = Math.min(orNaN(ess(indicator(s, quantile(s, 0.05)))),
                orNaN(ess(indicator(s, quantile(s, 0.95)))));
        double essRaw = ess(s);
        double mcse = honestMcse(x, Math.sqrt(varPlus(s) / essRaw), raoBlackwellised);
        return new Summary(mean, rhat, essBulk, essTail == Double.POSITIVE_INFINITY ? Double.NaN : essTail, mcse, State.VARIES,
                false);
    }

    private static double orNaN(double e) {
        return Double.isNaN(e) ? Double.POSITIVE_INFINITY : e;
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

    /** Rank normalisation of the pooled draws of {@code s} (average ranks for ties, Blom's offsets). */
    static double[][] rankNormal(double[][] s) {
        int m = s.length;
        int n = s[0].length;
        int total = m * n;
        double[] flat = new double[total];
        for (int c = 0; c < m; c++) {
            System.arraycopy(s[c], 0, flat, c * n, n);
        }
        int[] idx = sortedIndex(flat);
        double[][] z = new double[m][n];
        int k = 0;
        while (k < total) {
            int j = k;
            while (j + 1 < total && flat[idx[j + 1]] == flat[idx[k]]) {
                j++;
            }
            double rank = (k + j) / 2.0 + 1; // average of the tied ranks k+1..j+1
            double zv = inverseNormal((rank - 0.375) / (total + 0.25));
            for (int u = k; u <= j; u++) {
                z[idx[u] / n][idx[u] % n] = zv;
            }
            k = j + 1;
        }
        return z;
    }

    /** Indices of {@code a} in ascending order of value (a primitive merge sort: no boxing). */
    static int[] sortedIndex(double[] a) {
        int[] idx = new int[a.length];
        for (int k = 0; k < idx.length; k++) {
            idx[k] = k;
        }
        int[] tmp = new int[a.length];
        for (int width = 1; width < a.length; width *= 2) {
            for (int lo = 0; lo < a.length; lo += 2 * width) {
                int mid = Math.min(lo + width, a.length);
                int hi = Math.min(lo + 2 * width, a.length);
                int i = lo;
                int j = mid;
                int o = lo;
                while (i < mid && j < hi) {
                    tmp[o++] = a[idx[j]] < a[idx[i]] ? idx[j++] : idx[i++];
                }
                while (i < mid) {
                    tmp[o++] = idx[i++];
                }
                while (j < hi) {
                    tmp[o++] = idx[j++];
                }
            }
            int[] t = idx;
            idx = tmp;
            tmp = t;
        }
        return idx;
    }

    /** Split-R̂ of already split sequences; +∞ when they do not vary within but differ between. */
    static double splitRhat(double[][] s) {
        double w = within(s);
        double b = variance(rowMeans(s));
        if (!(w > 1e-300)) {
            return b > 1e-300 ? Double.POSITIVE_INFINITY : 1.0;
        }
        int n = s[0].length;
        return Math.sqrt(((n - 1.0) / n * w + b) / w);
    }

    private static double varPlus(double[][] s) {
        int n = s[0].length;
        return (n - 1.0) / n * within(s) + variance(rowMeans(s));
    }

    /** Multi-chain ESS of already split sequences (Geyer's initial monotone sequence); NaN when W = 0. */
    static double ess(double[][] s) {
        int m = s.length;
        int n = s[0].length;
        double w = within(s);
        if (!(w > 1e-300)) {
            return Double.NaN;
        }
        double[] means = rowMeans(s);
        double vp = (n - 1.0) / n * w + variance(means);
        double[] acov = new double[n];
        for (int c = 0; c < m; c++) {
            double[] a = autocovariance(s[c], means[c]);
            for (int t = 0; t < n; t++) {
                acov[t] += a[t] / m;
            }
        }
        double prevPair = Double.POSITIVE_INFINITY;
        double tau = -1;
        int t = 0;
        while (t + 1 < n) {
            double r0 = t == 0 ? 1.0 : 1 - (w - acov[t]) / vp;
            double r1 = 1 - (w - acov[t + 1]) / vp;
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
        return draws / tau;
    }

    private static double[][] indicator(double[][] s, double q) {
        double[][] out = new double[s.length][s[0].length];
        for (int c = 0; c < s.length; c++) {
            for (int t = 0; t < s[c].length; t++) {
                out[c][t] = s[c][t] <= q ? 1 : 0;
            }
        }
        return out;
    }

    /** Sample quantile of the pooled draws (type 7: linear interpolation between order statistics). */
    static double quantile(double[][] s, double p) {
        return sortedQuantile(Arrays.stream(s).flatMapToDouble(Arrays::stream).sorted().toArray(), p);
    }

    /**
     * Hyndman &amp; Fan (1996) type 7 quantile of sorted values (linear interpolation; R's default): the
     * one quantile of the project (intervals of effects and predictions, tail ESS).
     */
    public static double sortedQuantile(double[] sorted, double p) {
        double h = (sorted.length - 1) * p;
        int i = (int) Math.floor(h);
        if (i + 1 >= sorted.length) {
            return sorted[sorted.length - 1];
        }
        return sorted[i] + (h - i) * (sorted[i + 1] - sorted[i]);
    }

    private static double median(double[][] s) {
        return quantile(s, 0.5);
    }

    /** Φ⁻¹(p) of the standard normal law (Commons Math: via its inverse error function). */
    static double inverseNormal(double p) {
        return STANDARD_NORMAL.inverseCumulativeProbability(p);
    }

    /**
     * Biased autocovariance acov_t = (1/N) Σ_{u<N−t} (x_u − m)(x_{u+t} − m), by FFT (O(N log N)):
     * the inverse transform of the power spectrum of the centred draws, zero-padded to a power of
     * two ≥ 2N (Commons Math's radix-2 FFT needs a power of two; ≥ 2N − 1 keeps the sum acyclic).
     */
    static double[] autocovariance(double[] x, double mean) {
        int n = x.length;
        int size = Integer.highestOneBit(Math.max(1, 2 * n - 1));
        if (size < 2 * n) {
            size <<= 1;
        }
        double[][] ri = new double[2][size];
        double[] re = ri[0];
        double[] im = ri[1];
        for (int u = 0; u < n; u++) {
            re[u] = x[u] - mean;
        }
        FastFourierTransformer.transformInPlace(ri, DftNormalization.STANDARD, TransformType.FORWARD);
        for (int k = 0; k < size; k++) {
            re[k] = re[k] * re[k] + im[k] * im[k];
            im[k] = 0;
        }
        // STANDARD normalisation: the inverse transform divides by size
        FastFourierTransformer.transformInPlace(ri, DftNormalization.STANDARD, TransformType.INVERSE);
        double[] out = new double[n];
        for (int u = 0; u < n; u++) {
            out[u] = re[u] / n;
        }
        return out;
    }

    private static double[] rowMeans(double[][] s) {
        double[] out = new double[s.length];
        for (int c = 0; c < s.length; c++) {
            out[c] = mean(s[c]);
        }
        return out;
    }

    private static double[] chainMeans(double[][] x) {
        return rowMeans(x);
    }

    private static double within(double[][] s) {
        double w = 0;
        for (double[] row : s) {
            w += variance(row);
        }
        return w / s.length;
    }

    private static double mean(double[] x) {
        double s = 0;
        for (double v : x) {
            s += v;
        }
        return s / x.length;
    }

    /** Sample variance with the N−1 denominator. */
    private static double variance(double[] x) {
        if (x.length < 2) {
            return 0;
        }
        double m = mean(x);
        double s = 0;
        for (double v : x) {
            s += (v - m) * (v - m);
        }
        return s / (x.length - 1);
    }
}
