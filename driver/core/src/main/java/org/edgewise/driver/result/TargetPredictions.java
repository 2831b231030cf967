package org.edgewise.driver.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import java.util.List;
import java.util.Map;

/**
 * The JSON result of {@code predict} scoring a table of cases for one target: per row the
 * predicted distribution of the target given the row's other cells (and the shared evidence),
 * averaged over the structure posterior, with its Monte Carlo errors when sampled and its interval
 * over (network, parameters) draws when asked; and, where rows carry a truth, held-out scores and
 * calibration tables.
 *
 * @param target       the target variable
 * @param states       its states, in the store's order (the order of every per-state list)
 * @param cases        the file of cases
 * @param truthColumn  the column the truths were read from, or null (no truth: no scores)
 * @param given        evidence added to every row, or null
 * @param rows         rows predicted
 * @param scoredRows   rows with a truth, the ones scored
 * @param unscoredRows rows without a truth (blank): predicted, left out of the scores
 * @param method       order (given), exact, mcmc or sample
 * @param averagedOver what the probabilities are averaged over
 * @param samples      sampled structures averaged over (repeats counted), or null when exact
 * @param estimate     {@code exact} or {@code sampled} (then every probability has an mcse)
 * @param dagPrior     the DAG prior over unknown orders, or null given an order
 * @param score        score kind
 * @param ess          ESS (null for K2)
 * @param prior        structure prior
 * @param maxParents   in-degree bound d
 * @param skippedPosteriorMass parent-set posterior mass skipped (0 = exact)
 * @param sample       the saved sample the answer came from, or null
 * @param interval     the interval's settings, or null when none was asked
 * @param scores       held-out scores, or null when no row has a truth
 * @param note         how to read it
 * @param predictions  one entry per row, in file order
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record TargetPredictions(String target, List<String> states, String cases, String truthColumn, Map<String, String> given,
                                int rows, int scoredRows, int unscoredRows, String method, String averagedOver, Integer samples,
                                String estimate, String dagPrior, String score, Double ess, String prior, int maxParents,
                                double skippedPosteriorMass, EdgeResult.SampleRef sample, Interval interval, Scores scores,
                                String note, List<Row> predictions) implements JsonResult {
    public static final int FORMAT_VERSION = 1;
    public static final String KIND = "target-prediction";

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public int formatVersion() {
        return FORMAT_VERSION;
    }

    /**
     * @param level        the interval's probability (central)
     * @param draws        (network, parameters) draws it is taken over
     * @param of           what it is an interval of, in words
     * @param endpointMcse the largest Monte Carlo standard error of any interval end
     */
    public record Interval(double level, int draws, String of, double endpointMcse) {
    }

    /**
     * @param line        the row's line in the file (the header is line 1)
     * @param truth       its true state, or null
     * @param probability per state P(target = state | the row's cells, given, D)
     * @param mcse        per state its Monte Carlo standard error, or null when exact
     * @param lower       per state the interval's lower end, or null
     * @param upper       per state its upper end, or null
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Row(int line, String truth, List<Double> probability, List<Double> mcse, List<Double> lower, List<Double> upper) {
    }

    /**
     * Held-out scores over the rows with a truth (definitions in the core's {@code HeldOutScores}).
     *
     * @param logLoss     mean −ln P(true state) (natural log)
     * @param brier       Brier's (1950) score, Σ over states of (p − o)², averaged over rows (0 … 2)
     * @param auc         two states: the AUC; more: the macro average of the one-vs-rest AUCs; null when undefined
     * @param aucOf       {@code binary} or {@code one-vs-rest macro average}
     * @param aucPerState per state its one-vs-rest AUC (null where the truths lack the state or hold nothing else)
     * @param calibration per state shown (two states: the second), the reliability table
     */
    public record Scores(double logLoss, double brier, Double auc, String aucOf, List<Double> aucPerState,
                         List<Calibration> calibration) {
    }

    /** The reliability table of one state. */
    public record Calibration(String state, List<Bin> bins) {
    }

    /** Rows whose predicted probability of the state is in [low, high): their count, mean prediction and observed share. */
    public record Bin(double low, double high, int count, Double meanPredicted, Double observedFrequency) {
    }
}
