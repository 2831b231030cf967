package org.edgewise.driver.result;

import java.util.List;

/**
 * The JSON of {@code scores}: every family of a store with its log score under the stated score
 * kind and ESS (null for K2, which has none).
 *
 * @param score    the score kind the log scores are under
 * @param ess      BDeu's equivalent sample size, or null for K2
 * @param families every (child, parent set) family with its log marginal likelihood
 */
@com.fasterxml.jackson.annotation.JsonInclude(com.fasterxml.jackson.annotation.JsonInclude.Include.NON_NULL)
public record FamilyScores(String score, Double ess, List<Family> families) implements JsonResult {
    /** The format version written. */
    public static final int FORMAT_VERSION = 1;

    /** One family: the child, its parents (sorted as stored) and its log score. */
    public record Family(String child, List<String> parents, double logScore) {
    }

    @Override
    public String kind() {
        return "scores";
    }

    @Override
    public int formatVersion() {
        return FORMAT_VERSION;
    }
}
