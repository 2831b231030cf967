package org.edgewise.driver.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.annotation.JsonProperty;
import com.fasterxml.jackson.annotation.JsonPropertyOrder;
import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.UserError;

/**
 * The JSON result of {@code effect} for one question (docs/effect.md says what every field means).
 *
 * @param intervention      {@code "do"}: the intervention x = a, variable → state
 * @param target            the outcome y = b
 * @param given             evidence w = e observed after the intervention, or null
 * @param probability       P(y | do(x = a)[, w], D) averaged over structures and parameters; under a
 *                          case-control design on y, re-weighted to the given prevalence, and null
 *                          (not estimable) without one
 * @param mcse              its Monte Carlo standard error (0 when {@code estimate} is exact)
 * @param estimate          {@code exact} or {@code sampled}
 * @param versus            the reference intervention and its probability, or null
 * @param difference        probability − versus.probability, or null
 * @param differenceMcse    its MCSE, or null
 * @param ratio             probability / versus.probability, or null
 * @param noPathProbability posterior probability of no directed path from an intervened variable to
 *                          the target (or the evidence): the effect is then exactly zero
 * @param noPathMcse        its MCSE (0 when exact)
 * @param noPathEstimate    {@code exact} (forward pass per order) or {@code sampled} (DAG draws)
 * @param interval          central credible interval of the effect from (DAG, θ) draws
 * @param posterior         the draws: their mean, count, histogram and share without a path
 * @param observational     the model's observational conditional P(y | x = a[, w], D) beside it
 * @param riskDifference    P(y | do(a)) − P(y | do(a0)) with its interval, or null (no reference; case-control without prevalence)
 * @param riskRatio         P(y | do(a)) / P(y | do(a0)) with its interval, or null (likewise)
 * @param oddsRatio         the odds ratio of the two with its interval, or null without a reference
 * @param leadingMeasure    the measure the text leads with ({@code riskDifference}, {@code riskRatio} or {@code oddsRatio}), or null
 * @param measures          what the measures are, in words (model-based, interval level, draws), or null
 * @param observed          the raw conditional frequencies from the store's counts (no model), or what they lack
 * @param design            the sampling design when it is case-control, else null
 * @param method            {@code order}, {@code exact} or {@code mcmc}
 * @param dagPrior          the DAG prior over unknown orders; null given an order (both coincide)
 * @param averagedOver      what was averaged over, in words
 * @param order             the given order, else null
 * @param settings          score, ESS, prior, d, constraints
 * @param converged         MCMC: whether the chains agreed (largest split-R̂ below 1.01), else null
 * @param maxRhat           MCMC: the largest split-R̂, else null
 * @param assumptions       the assumptions the causal reading rests on
 * @param note              how to read it
 * @param split             where the gap between conditioning and setting comes from (networks
 *                          without a directed path vs with one), or null without a reference
 *                          intervention (on the log odds-ratio scale where risks are not estimable)
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
@JsonPropertyOrder({"do", "target", "given", "probability", "mcse", "estimate", "versus",
    "difference", "differenceMcse", "ratio", "noPathProbability", "noPathMcse", "noPathEstimate", "interval",
    "posterior", "observational", "riskDifference", "riskRatio", "oddsRatio", "leadingMeasure", "measures", "observed",
    "design", "split"})
public record EffectResult(@JsonProperty("do") Map<String, String> intervention, Map<String, String> target,
                           Map<String, String> given, Double probability, double mcse, String estimate, Versus versus,
                           Double difference, Double differenceMcse, Double ratio, double noPathProbability,
                           double noPathMcse, String noPathEstimate, Interval interval, Posterior posterior,
                           Observational observational, Measure riskDifference, Measure riskRatio, Measure oddsRatio,
                           String leadingMeasure, String measures, Observed observed, Design design, String method, String dagPrior, String averagedOver,
                           List<String> order, EdgeResult.Settings settings, Boolean converged, Double maxRhat,
                           List<String> assumptions, String note, Split split) implements JsonResult {
    /** The format version written and read. */
    public static final int FORMAT_VERSION = 1;

    @Override
    public int formatVersion() {
        return FORMAT_VERSION;
    }

    @Override
    public String kind() {
        return "effect";
    }

    /** This result with {@code split} beside it. */
    public EffectResult withSplit(Split split) {
        return new EffectResult(intervention, target, given, probability, mcse, estimate, versus, difference, differenceMcse, ratio,
                noPathProbability, noPathMcse, noPathEstimate, interval, posterior, observational, riskDifference, riskRatio,
                oddsRatio, leadingMeasure, measures, observed, design, method, dagPrior, averagedOver, order, settings, converged,
                maxRhat, assumptions, note, split);
    }

    /** The reference intervention x = a0: its probability P(y | do(x = a0)[, w], D) and MCSE. */
    public record Versus(@JsonProperty("do") Map<String, String> intervention, Double probability, double mcse) {
    }

    /** A central credible interval of {@code of} ({@code difference} or {@code probability}). */
    public record Interval(double level, double lower, double upper, String of) {
    }

    /**
     * The (DAG, θ) draws of the effect: their count and mean, a histogram of equal-width bins from
     * {@code binLow} to {@code binHigh}, and the share of draws whose DAG has no path.
     */
    public record Posterior(String of, int draws, double mean, double binLow, double binHigh, int[] counts,
                            double noPathShare) {
    }

    /**
     * The model's observational conditionals P(y | x = a[, w], D) and, with a reference, P(y | x = a0[, w], D)
     * (null under a case-control design on y without a prevalence); {@code oddsRatio}, with a reference, the
     * odds ratio of the two (estimable under a case-control design too: sampling on y multiplies both odds
     * by the same factor); {@code label} says what they are.
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Observational(Double probability, Double versusProbability, Double difference, String label,
                                Double oddsRatio) {
    }

    /**
     * One effect measure: its estimate and central credible interval from the (DAG, θ) draws.
     *
     * @param estimate            the estimate (always inside the interval)
     * @param interval            the interval; {@code of} says over which draws ("all draws" or "draws with an effect")
     * @param estimateOf          {@code model}, {@code median of the draws} or {@code median of the draws with an effect}
     * @param noEffectProbability when the interval is of the draws with an effect: the share of draws without a
     *                            directed path (no effect at all); else null
     * @param overallEstimate     the model's estimate over all structures when {@code estimate} is not it; else null
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Measure(double estimate, Interval interval, String estimateOf, Double noEffectProbability,
                          Double overallEstimate) {
    }

    /**
     * Raw conditional frequencies from the store's counts (no model, no averaging).
     *
     * @param probability         n(y, x = a[, w]) / n(x = a[, w]), or null when not available
     * @param versusProbability   the same for x = a0, or null
     * @param events              n(y, x = a[, w]); null when not available
     * @param rows                n(x = a[, w])
     * @param versusEvents        n(y, x = a0[, w]), or null
     * @param versusRows          n(x = a0[, w]), or null
     * @param oddsRatio           the crude odds ratio (ad)/(bc) of the two rows, or null
     * @param reweighted          under a case-control design with a prevalence: the two frequencies re-weighted to
     *                            the population (cases by π/π̂, controls by (1 − π)/(1 − π̂)), else null
     * @param reweightedVersus    likewise for x = a0
     * @param family              the stored family whose counts served, or null
     * @param label               what these figures are, or why they are not available
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Observed(Double probability, Double versusProbability, Long events, Long rows, Long versusEvents,
                           Long versusRows, Double oddsRatio, Double reweighted, Double reweightedVersus, String family,
                           String label) {
    }

    /**
     * A case-control design: the sample was drawn on {@code outcome}.
     *
     * @param type           {@code case-control}
     * @param outcome        the variable the sample was drawn on
     * @param state          the outcome's state the target asks about (the cases), or null when the target is not the outcome
     * @param sampleShare    π̂, the share of that state in the sample's counts, or null
     * @param prevalence     π, its population prevalence as given, or null
     * @param note           what the design changes in this result, in words
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Design(String type, String outcome, String state, Double sampleShare, Double prevalence, String note) {
    }

    /**
     * The posterior split over "x cannot affect y" (no directed path) and "x affects y", and how
     * much of the observational association each explains (analysis/EffectSplit has the formula).
     *
     * @param noEffect        P(no directed path from the set variables to the outcome)
     * @param effect          1 − noEffect
     * @param association     the model's observational difference P(y | x = a) − P(y | x = a0) (on {@code scale})
     * @param setting         the effect's difference P(y | do(a)) − P(y | do(a0)) (on {@code scale})
     * @param directionPart   the gap's part from networks without a path: noEffect × association
     * @param confoundingPart the gap's part from networks with one: effect × association − setting
     * @param backDoor        the set variable's most probable parents (P ≥ 0.1, at most three)
     * @param cause           {@code none}, {@code unknown direction}, {@code confounding} or {@code both}
     * @param words           the sentence the CLI and the report print
     * @param scale           {@code risk difference}, or {@code log odds ratio} where risks are not estimable
     *                        (a case-control sample drawn on the outcome): association and setting are then
     *                        log odds ratios; null in results written before (risk difference)
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Split(double noEffect, double effect, double association, double setting, double directionPart,
                        double confoundingPart, List<String> backDoor, String cause, String words, String scale) {
    }

    /** Several results ({@code effect --cases}). */
    public record Batch(List<EffectResult> results) implements JsonResult {
        @Override
        public int formatVersion() {
            return FORMAT_VERSION;
        }

        @Override
        public String kind() {
            return "effects";
        }
    }

    /** Reads an effect result or a batch of them; refuses another kind or format version, naming the file. */
    public static List<EffectResult> read(Path file) {
        if (!Files.isRegularFile(file)) {
            throw new UserError("effect file " + file + " does not exist");
        }
        org.edgewise.driver.JsonInput.checkSize(file, "effect file " + file);
        try {
            JsonNode tree = ResultJson.MAPPER.readTree(file.toFile());
            String kind = tree == null || tree.get("kind") == null ? "" : tree.get("kind").asText();
            if (!kind.equals("effect") && !kind.equals("effects")) {
                throw new UserError("effect file " + file + " is not an effect result (no \"kind\": \"effect\")");
            }
            JsonNode v = tree.get("formatVersion");
            if (v == null || v.asInt() != FORMAT_VERSION) {
                throw new UserError("effect file " + file + " has " + (v == null ? "no format version" : "format version " + v)
                        + "; this Edgewise reads effect results of format version " + FORMAT_VERSION);
            }
            List<EffectResult> out = new ArrayList<>();
            if (kind.equals("effect")) {
                out.add(ResultJson.MAPPER.treeToValue(tree, EffectResult.class));
            } else {
                for (JsonNode r : tree.get("results")) {
                    out.add(ResultJson.MAPPER.treeToValue(r, EffectResult.class));
                }
            }
            return out;
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new UserError("effect file " + file + " " + org.edgewise.driver.JsonInput.problem(e));
        } catch (IOException e) {
            throw new UserError("cannot read effect file " + file + ": " + e.getMessage());
        }
    }
}
