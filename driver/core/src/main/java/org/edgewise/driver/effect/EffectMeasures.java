package org.edgewise.driver.effect;

import java.util.Arrays;
import org.edgewise.driver.average.convergence.ChainDiagnostics;

/**
 * The measures epidemiologists compare two interventions by, each with a central credible interval
 * from the same (DAG, θ) draws ({@link PairDraws}), for the target event y = b (a binary target or
 * one chosen state): with p = P(y | do(x = a)) and p0 = P(y | do(x = a0)),
 * <pre>
 *   risk difference  p − p0,        risk ratio  p / p0,        odds ratio  [p / (1 − p)] / [p0 / (1 − p0)]
 * </pre>
 * (Rothman, Greenland &amp; Lash, Modern Epidemiology, 3rd ed. 2008, ch. 4 — chapter from memory).
 * Ratios are computed in log space (log p − log p0; log p − log1p(−p) − …) so that small risks keep
 * their digits. The point estimate is the measure of the model's probabilities (the posterior means
 * P(y | do(·), D)); the interval is the (1 ± level)/2 quantiles of the measure over the draws
 * (type 7, {@link ChainDiagnostics#sortedQuantile}).
 *
 * <p><b>An interval that contains its estimate.</b> A draw whose DAG has no directed path from x to
 * the outcome has exactly no effect (difference 0, ratios 1). When such draws make up at least
 * (1 + level)/2 of all (P(no path) ≥ 0.975 at level 0.95) the central interval is the single point
 * of no effect, which would sit beside a non-zero estimate. Then the measure says so: it reports
 * the probability of no effect, and its estimate (the median) and interval are those of the draws
 * with a path — the effect given that there is one — with the model's overall estimate beside them.
 * Should the model's estimate fall outside the interval of all draws otherwise (a skewed ratio with
 * few draws), the estimate is the draws' median, labelled so. Either way the interval contains
 * the estimate.
 *
 * <p><b>Outcome-dependent sampling.</b> {@code oddsFactor} k multiplies the odds of y = b before
 * the measures are taken: the re-weighting of a case-control sample to a population of prevalence
 * π (cases weighted by π/π̂, controls by (1 − π)/(1 − π̂), π̂ the sample share of cases;
 * k = [π/(1 − π)] / [π̂/(1 − π̂)]; Rothman, Greenland &amp; Lash 2008, ch. 8, and Breslow 1996,
 * "Statistics in epidemiology: the case-control study", JASA 91 — both from memory). It leaves the
 * odds ratio unchanged, which is why the odds ratio alone survives a case-control design.
 */
public final class EffectMeasures {
    /** The three measures, their JSON names and the value of no effect. */
    public enum Kind {
        RISK_DIFFERENCE("riskDifference", "risk difference", 0),
        RISK_RATIO("riskRatio", "risk ratio", 1),
        ODDS_RATIO("oddsRatio", "odds ratio", 1);

        private final String json;
        private final String words;
        private final double none;

        Kind(String json, String words, double none) {
            this.json = json;
            this.words = words;
            this.none = none;
        }

        /** The JSON field name. */
        public String json() {
            return json;
        }

        /** The name in words ("risk difference"). */
        public String words() {
            return words;
        }

        /** The value of no effect: 0 for a difference, 1 for a ratio. */
        public double none() {
            return none;
        }

        /** The measure of the pair (p, p0); NaN when undefined (0/0). */
        public double of(double p, double p0) {
            return switch (this) {
                case RISK_DIFFERENCE -> p - p0;
                case RISK_RATIO -> Math.exp(Math.log(p) - Math.log(p0));
                case ODDS_RATIO -> Math.exp(logOddsRatio(p, p0));
            };
        }
    }

    /**
     * One measure.
     *
     * @param kind                which measure
     * @param estimate            the point estimate (inside [lower, upper])
     * @param estimateOf          what the estimate is: {@code "model"} (the measure of the model's
     *                            probabilities), {@code "median of the draws"} or {@code "median of the draws with an effect"}
     * @param level               level of the central credible interval
     * @param lower               its lower end
     * @param upper               its upper end
     * @param intervalOf          {@code "all draws"} or {@code "draws with an effect"} (given a directed path)
     * @param noEffectProbability the share of draws without a path, when the interval is of the draws with one; else null
     * @param overallEstimate     the model's estimate over all structures, when {@code estimate} is not it; else null
     */
    public record Measure(Kind kind, double estimate, String estimateOf, double level, double lower, double upper,
                          String intervalOf, Double noEffectProbability, Double overallEstimate) {
    }

    private EffectMeasures() {
    }

    /** The log odds ratio log{[p / (1 − p)] / [p0 / (1 − p0)]}, in log space; NaN when undefined. */
    public static double logOddsRatio(double p, double p0) {
        return Math.log(p) - Math.log1p(-p) - Math.log(p0) + Math.log1p(-p0);
    }

    /** p with its odds multiplied by k (k = 1: p itself), in log-odds. */
    public static double scaleOdds(double p, double k) {
        if (k == 1 || p == 0 || p == 1) {
            return p;
        }
        double logit = Math.log(p) - Math.log1p(-p) + Math.log(k);
        return logit > 0 ? 1 / (1 + Math.exp(-logit)) : Math.exp(logit) / (1 + Math.exp(logit));
    }

    /**
     * The measure {@code kind} of the model's probabilities {@code p} and {@code p0}, its interval
     * from {@code draws}, after multiplying every odds by {@code oddsFactor}.
     */
    public static Measure of(Kind kind, double p, double p0, PairDraws draws, double oddsFactor, double level) {
        double est = kind.of(scaleOdds(p, oddsFactor), scaleOdds(p0, oddsFactor));
        int k = draws.count();
        double[] all = new double[k];
        double[] withPath = new double[k];
        int m = 0;
        int w = 0;
        int none = 0;
        for (int d = 0; d < k; d++) {
            double v = draws.noPath()[d] ? kind.none()
                    : kind.of(scaleOdds(draws.probability()[d], oddsFactor), scaleOdds(draws.versus()[d], oddsFactor));
            if (Double.isNaN(v)) {
                continue; // 0/0 under a draw: no measure (never for a draw without a path)
            }
            all[m++] = v;
            if (draws.noPath()[d]) {
                none++;
            } else {
                withPath[w++] = v;
            }
        }
        double noneShare = m == 0 ? 1 : none / (double) m;
        if (noneShare >= (1 + level) / 2) {
            if (w == 0) {
                return new Measure(kind, kind.none(), "median of the draws", level, kind.none(), kind.none(), "all draws",
                        1.0, est);
            }
            double[] v = Arrays.copyOf(withPath, w);
            Arrays.sort(v);
            return new Measure(kind, ChainDiagnostics.sortedQuantile(v, 0.5), "median of the draws with an effect", level,
                    ChainDiagnostics.sortedQuantile(v, (1 - level) / 2), ChainDiagnostics.sortedQuantile(v, (1 + level) / 2),
                    "draws with an effect", noneShare, est);
        }
        double[] v = Arrays.copyOf(all, m);
        Arrays.sort(v);
        double lo = ChainDiagnostics.sortedQuantile(v, (1 - level) / 2);
        double hi = ChainDiagnostics.sortedQuantile(v, (1 + level) / 2);
        if (est >= lo && est <= hi) {
            return new Measure(kind, est, "model", level, lo, hi, "all draws", null, null);
        }
        return new Measure(kind, ChainDiagnostics.sortedQuantile(v, 0.5), "median of the draws", level, lo, hi, "all draws", null, est);
    }
}
