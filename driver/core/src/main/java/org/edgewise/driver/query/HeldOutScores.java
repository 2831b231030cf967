package org.edgewise.driver.query;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * How well predicted distributions over a target's states match held-out truths: pure functions of
 * the probabilities {@code p[i][k]} = P(y = k | row i) and the true states {@code truth[i]}.
 * <ul>
 *   <li><b>log loss</b>: −(1/N) Σ_i ln p[i][truth_i] (natural log; the logarithmic scoring rule, Good 1952);</li>
 *   <li><b>Brier score</b>: (1/N) Σ_i Σ_k (p[i][k] − o_ik)², o_ik = 1 when truth_i = k — Brier's (1950,
 *       "Verification of forecasts expressed in terms of probability", Monthly Weather Review 78(1))
 *       own definition, summed over every state: from 0 (perfect) to 2. With two states it is twice the
 *       one-state form (p − o)² often quoted;</li>
 *   <li><b>AUC</b> of state k against the rest, scored by p[i][k]: the probability that a row whose truth
 *       is k scores above a row whose truth is not, ties counting ½ — the Mann–Whitney U statistic
 *       divided by n_pos·n_neg (Mann &amp; Whitney 1947; Hanley &amp; McNeil 1982), computed from midranks.
 *       With two states both states' AUCs are equal (p[i][0] = 1 − p[i][1]) and that is the AUC; with more,
 *       the macro average of the one-vs-rest AUCs (Provost &amp; Domingos 2000; Fawcett 2006), over the
 *       states that occur and do not occur among the truths (an AUC needs both);</li>
 *   <li><b>calibration</b>: rows binned by the predicted probability of a state into {@code bins}
 *       equal-width bins of [0, 1] (the last closed), each bin's mean prediction beside the observed
 *       share of the state (a reliability diagram; common practice: 10 bins). With two states one
 *       table, of the second state; with more, one per state.</li>
 * </ul>
 */
public final class HeldOutScores {
    /**
     * @param rows        rows scored (with a truth)
     * @param logLoss     mean negative natural log of the probability of the true state
     * @param brier       Brier's (1950) score, summed over states
     * @param auc         the AUC (two states), or the macro average of the one-vs-rest AUCs; NaN when none is defined
     * @param aucPerState per state its one-vs-rest AUC, NaN when the truths hold no row of it or only rows of it
     * @param calibration the calibration tables
     */
    public record Scores(int rows, double logLoss, double brier, double auc, double[] aucPerState,
                         List<Calibration> calibration) {
    }

    /** The calibration table of one state. */
    public record Calibration(int state, List<Bin> bins) {
    }

    /**
     * One bin: predictions in [low, high) (the last bin also holds 1), their count, mean, and the
     * observed share of the state among them (both NaN when empty).
     */
    public record Bin(double low, double high, int count, double meanPredicted, double observedFrequency) {
    }

    /** Common practice for a reliability diagram. */
    public static final int DEFAULT_BINS = 10;

    private HeldOutScores() {
    }

    /**
     * The scores of {@code p} (rows × states) against {@code truth} (a state index per row; every row
     * has one: leave rows without a truth out before).
     */
    public static Scores of(double[][] p, int[] truth, int states, int bins) {
        int n = truth.length;
        if (n == 0) {
            throw new IllegalArgumentException("no row to score");
        }
        double ll = 0;
        double br = 0;
        for (int i = 0; i < n; i++) {
            ll -= Math.log(p[i][truth[i]]);
            for (int k = 0; k < states; k++) {
                double d = p[i][k] - (truth[i] == k ? 1 : 0);
                br += d * d;
            }
        }
        double[] auc = new double[states];
        double[] score = new double[n];
        boolean[] pos = new boolean[n];
        for (int k = 0; k < states; k++) {
            for (int i = 0; i < n; i++) {
                score[i] = p[i][k];
                pos[i] = truth[i] == k;
            }
            auc[k] = auc(score, pos);
        }
        double macro;
        if (states == 2) {
            macro = auc[1];
        } else {
            double s = 0;
            int m = 0;
            for (double a : auc) {
                if (!Double.isNaN(a)) {
                    s += a;
                    m++;
                }
            }
            macro = m == 0 ? Double.NaN : s / m;
        }
        List<Calibration> cal = new ArrayList<>();
        for (int k = states == 2 ? 1 : 0; k < states; k++) {
            cal.add(calibration(p, truth, k, bins));
        }
        return new Scores(n, ll / n, br / n, macro, auc, cal);
    }

    /**
     * P(score of a positive &gt; score of a negative) + ½ P(tie) over all (positive, negative) pairs,
     * as (R_pos − n_pos(n_pos + 1)/2) / (n_pos n_neg) with R_pos the sum of the positives' midranks
     * (the Mann–Whitney U); NaN when there is no positive or no negative.
     */
    public static double auc(double[] score, boolean[] positive) {
        int n = score.length;
        Integer[] idx = new Integer[n];
        for (int i = 0; i < n; i++) {
            idx[i] = i;
        }
        Arrays.sort(idx, (a, b) -> Double.compare(score[a], score[b]));
        double rankSum = 0;
        long np = 0;
        int i = 0;
        while (i < n) {
            int j = i;
            while (j + 1 < n && score[idx[j + 1]] == score[idx[i]]) {
                j++;
            }
            double mid = (i + j) / 2.0 + 1; // ranks from 1; tied values share their mean rank
            for (int t = i; t <= j; t++) {
                if (positive[idx[t]]) {
                    rankSum += mid;
                    np++;
                }
            }
            i = j + 1;
        }
        long nn = n - np;
        if (np == 0 || nn == 0) {
            return Double.NaN;
        }
        return (rankSum - np * (np + 1) / 2.0) / ((double) np * nn);
    }

    /** The calibration table of state k. */
    static Calibration calibration(double[][] p, int[] truth, int k, int bins) {
        int[] count = new int[bins];
        double[] sum = new double[bins];
        int[] hit = new int[bins];
        for (int i = 0; i < truth.length; i++) {
            int b = Math.min(bins - 1, (int) Math.floor(p[i][k] * bins));
            count[b]++;
            sum[b] += p[i][k];
            hit[b] += truth[i] == k ? 1 : 0;
        }
        List<Bin> out = new ArrayList<>(bins);
        for (int b = 0; b < bins; b++) {
            out.add(new Bin(b / (double) bins, (b + 1) / (double) bins, count[b],
                    count[b] == 0 ? Double.NaN : sum[b] / count[b], count[b] == 0 ? Double.NaN : hit[b] / (double) count[b]));
        }
        return new Calibration(k, out);
    }
}
