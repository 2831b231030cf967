package org.edgewise.driver.effect;

/**
 * The answer to one {@link EffectQuery}, averaged over structures and parameters.
 *
 * @param probability         P(y | do(x = a), w, D): the ratio of the averaged truncated joints
 *                            P(y, w | do(x = a), D) / P(w | do(x = a), D) (without evidence, the
 *                            average of P(y | do(x = a), G, θ̄))
 * @param mcse                its Monte Carlo standard error; 0 when {@code exact}
 * @param exact               whether {@code probability} is exact (a given order; every allowed order) or sampled
 * @param versusProbability   the same under the reference intervention (NaN without one)
 * @param versusMcse          its MCSE (0 when exact; NaN without a reference)
 * @param difference          probability − versusProbability (NaN without a reference)
 * @param differenceMcse      its MCSE (0 when exact; NaN without a reference)
 * @param ratio               probability / versusProbability (NaN without a reference)
 * @param noPath              posterior probability of no directed path from an intervened variable
 *                            to the target or the evidence (then the effect is exactly zero)
 * @param noPathMcse          its MCSE (0 when exact)
 * @param noPathExact         whether {@code noPath} is exact (forward pass per order) or from DAG draws
 * @param observational       the observational conditional P(y | x = a, w, D) averaged the same way
 * @param observationalVersus P(y | x = a0, w, D) (NaN without a reference)
 * @param draws               the posterior distribution of the effect over (DAG, θ) draws
 * @param pairs               the same draws' two probabilities, for the effect measures ({@link EffectMeasures})
 */
public record Effect(double probability, double mcse, boolean exact, double versusProbability, double versusMcse,
                     double difference, double differenceMcse, double ratio, double noPath, double noPathMcse,
                     boolean noPathExact, double observational, double observationalVersus, EffectDraws draws,
                     PairDraws pairs) {
}
