package org.edgewise.driver.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import java.util.List;
import java.util.Map;

/**
 * The JSON result of {@code predict} for one case.
 *
 * @param caseStates                  the case, variable → state (hidden variables left out)
 * @param given                       the evidence of a conditional, else null
 * @param probability                 P(case | given, D, ≺), averaged over every DAG consistent with the order
 * @param logProbability              its natural log
 * @param bestNetworkProbability      the same under the single best network under the order
 * @param bestNetworkLogProbability   its natural log
 * @param hiddenSummedOut             hidden variables that had to be summed out (the rest drop out)
 * @param hiddenJointStates           joint states enumerated to sum them out
 * @param order                       the order
 * @param score                       score kind
 * @param ess                         ESS (null for K2, which has none)
 * @param prior                       structure prior
 * @param maxParents                  in-degree bound d
 * @param skippedPosteriorMass        parent-set posterior mass skipped (total over variables; 0 = exact)
 * @param note                        how to read it
 * @param method                      order (given), exact or mcmc
 * @param averagedOver                what the probability is averaged over: {@code every DAG consistent with the
 *                                    order}, {@code all orders} (exact weights), {@code all DAGs},
 *                                    {@code sampled orders} or {@code sampled partitions}
 * @param samples                     the number K of sampled orders or partitions (repeats counted) when sampled, else null
 * @param mcse                        Monte Carlo standard error of {@code probability} when sampled, else null
 * @param dagPrior                    over unknown orders, the DAG prior the structures are weighted under;
 *                                    null given an order (both priors coincide)
 * @param exactCase                   true when computed as Z(D ∪ x) / Z(D) ({@code --exact-cases}), else null
 * @param sample                      the saved posterior sample it was answered from (path, fingerprint), else null
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record Prediction(@com.fasterxml.jackson.annotation.JsonProperty("case") Map<String, String> caseStates,
                         Map<String, String> given, double probability, double logProbability,
                         double bestNetworkProbability, double bestNetworkLogProbability,
                         List<String> hiddenSummedOut, double hiddenJointStates, List<String> order,
                         String score, Double ess, String prior, int maxParents, double skippedPosteriorMass,
                         String note, String method, String averagedOver, Integer samples, Double mcse, String dagPrior,
                         Boolean exactCase, EdgeResult.SampleRef sample) implements JsonResult {
    /** The format version written: 2 since {@code averagedOver} and {@code samples} replaced {@code orders} and {@code orderSamples}. */
    public static final int FORMAT_VERSION = 2;

    @Override
    public String kind() {
        return "prediction";
    }

    @Override
    public int formatVersion() {
        return FORMAT_VERSION;
    }
}
