package org.edgewise.driver.effect;

/**
 * The (DAG, θ) draws of one question kept as pairs: P(y | do(x = a), w) and, with a reference,
 * P(y | do(x = a0), w) under the same DAG and parameters, and whether the DAG has no directed path
 * from the intervened variables to the outcome. The effect measures are functions of the pair
 * ({@link EffectMeasures}). Memory: 17 bytes per draw. Arrays are shared: treat them as read-only.
 *
 * @param probability P(y | do(x = a), w) per draw
 * @param versus      P(y | do(x = a0), w) per draw (unused without a reference)
 * @param noPath      per draw, whether its DAG has no directed path
 */
public record PairDraws(double[] probability, double[] versus, boolean[] noPath) {
    static PairDraws[] empty(int questions, int draws) {
        PairDraws[] out = new PairDraws[questions];
        for (int q = 0; q < questions; q++) {
            out[q] = new PairDraws(new double[draws], new double[draws], new boolean[draws]);
        }
        return out;
    }

    /** Number of draws. */
    public int count() {
        return probability.length;
    }
}
