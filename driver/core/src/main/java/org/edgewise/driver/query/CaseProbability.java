package org.edgewise.driver.query;

/**
 * A model that gives the probability of a case with hidden variables summed out: a single order
 * ({@link CasePredictor}) or a mixture over orders ({@link OrderMixture}).
 */
public interface CaseProbability {
    /** log P(case | D); {@code states[v]} a state index or {@link CaseParser#HIDDEN}. */
    double logProbability(int[] states);

    /** log P(target | given, D); −∞ when the two disagree on a variable. */
    double logConditional(int[] target, int[] given);

    /** The hidden variables that must be summed out for this case. */
    int[] hiddenToSumOut(int[] states);

    /** Joint states enumerated to sum them out. */
    double hiddenJointStates(int[] states);

    /** Parent-set posterior mass skipped (0 = exact). */
    double skippedMass();

    /** Whether the probability is a Monte Carlo estimate (then {@link #mcse} gives its error). */
    default boolean sampled() {
        return false;
    }

    /** The Monte Carlo standard error of P(target | D) or P(target | given, D); NaN when not sampled. */
    default double mcse(int[] target, int[] given) {
        return Double.NaN;
    }
}
