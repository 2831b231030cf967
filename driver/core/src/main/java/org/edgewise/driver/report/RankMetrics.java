package org.edgewise.driver.report;

import java.util.Arrays;
import java.util.Comparator;

/**
 * Ranking figures of scores against binary labels — pure functions over arrays.
 *
 * <p><b>AUROC</b> by the Mann–Whitney statistic (Mann &amp; Whitney 1947; Hanley &amp; McNeil
 * 1982, Radiology 143: the area under the ROC curve equals the Wilcoxon–Mann–Whitney statistic):
 * rank all scores ascending, tied scores sharing the mean of their ranks (midranks), R₁ the rank
 * sum of the positives, U = R₁ − n₁(n₁+1)/2 and AUROC = U / (n₁ n₀). A tie between a positive and
 * a negative counts ½, as in the pair-counting form U = #{pos &gt; neg} + ½ #{pos = neg}.
 *
 * <p><b>Average precision</b> (non-interpolated; Manning, Raghavan &amp; Schütze 2008,
 * Introduction to Information Retrieval §8.4): AP = Σ_t (R_t − R_{t−1}) · P_t over the distinct
 * scores t taken as thresholds in decreasing order, P_t and R_t the precision and recall of
 * {score ≥ t}. Tied scores enter together (one threshold), so the value does not depend on how
 * ties are ordered.
 *
 * <p>Both are undefined without positives or without negatives (AP without positives): then
 * {@code NaN}.
 */
public final class RankMetrics {
    private RankMetrics() {
    }

    /** AUROC with midranks; NaN when there are no positives or no negatives. */
    public static double auroc(double[] scores, boolean[] positive) {
        check(scores, positive);
        int n = scores.length;
        Integer[] idx = order(scores, false);
        long n1 = 0;
        double rankSum = 0;
        int i = 0;
        while (i < n) {
            int j = lastTied(scores, idx, i);
            double midrank = (i + j) / 2.0 + 1; // ranks i+1 … j+1
            for (int m = i; m <= j; m++) {
                if (positive[idx[m]]) {
                    rankSum += midrank;
                    n1++;
                }
            }
            i = j + 1;
        }
        long n0 = n - n1;
        if (n1 == 0 || n0 == 0) {
            return Double.NaN;
        }
        double u = rankSum - n1 * (n1 + 1) / 2.0;
        return u / ((double) n1 * n0);
    }

    /** Average precision with tied scores as one threshold; NaN without positives. */
    public static double averagePrecision(double[] scores, boolean[] positive) {
        check(scores, positive);
        int n = scores.length;
        long total = 0;
        for (boolean p : positive) {
            if (p) {
                total++;
            }
        }
        if (total == 0) {
            return Double.NaN;
        }
        Integer[] idx = order(scores, true);
        double ap = 0;
        long tp = 0;
        long seen = 0;
        double prevRecall = 0;
        int i = 0;
        while (i < n) {
            int j = lastTied(scores, idx, i);
            for (int m = i; m <= j; m++) {
                seen++;
                if (positive[idx[m]]) {
                    tp++;
                }
            }
            double recall = (double) tp / total;
            ap += (recall - prevRecall) * ((double) tp / seen);
            prevRecall = recall;
            i = j + 1;
        }
        return ap;
    }

    /** The last position from {@code i} on whose score ties the score at {@code i} (a group of tied scores is one rank or threshold). */
    private static int lastTied(double[] scores, Integer[] idx, int i) {
        int j = i;
        while (j + 1 < idx.length && scores[idx[j + 1]] == scores[idx[i]]) {
            j++;
        }
        return j;
    }

    private static Integer[] order(double[] scores, boolean descending) {
        Integer[] idx = new Integer[scores.length];
        for (int i = 0; i < idx.length; i++) {
            idx[i] = i;
        }
        Comparator<Integer> c = Comparator.comparingDouble(k -> scores[k]);
        Arrays.sort(idx, descending ? c.reversed() : c);
        return idx;
    }

    private static void check(double[] scores, boolean[] positive) {
        if (scores.length != positive.length) {
            throw new IllegalArgumentException("scores and labels differ in length: " + scores.length + " vs " + positive.length);
        }
        for (double s : scores) {
            if (Double.isNaN(s)) {
                throw new IllegalArgumentException("a score is NaN");
            }
        }
    }
}
