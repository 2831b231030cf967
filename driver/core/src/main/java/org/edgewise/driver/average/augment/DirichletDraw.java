package org.edgewise.driver.average.augment;

import java.util.SplittableRandom;
import org.edgewise.driver.average.LogSum;

/**
 * Draws from a Dirichlet distribution by normalising independent Gamma(a_k, 1) draws, in log space
 * (BDeu's pseudo-counts α_ijk can be 10⁻³, whose Gamma draws underflow as plain numbers). The
 * Gamma draws are Marsaglia &amp; Tsang's (2000, "A simple method for generating gamma variables",
 * ACM TOMS 26(3)), shapes below 1 boosted by U^{1/a}. The one Gamma sampler of the project: the
 * parameter draws of effects and of data augmentation both use it.
 */
public final class DirichletDraw {
    private DirichletDraw() {
    }

    /** The log of a Gamma(shape, 1) draw: Marsaglia &amp; Tsang for shape ≥ 1, boosted below 1. */
    public static double logGamma(double shape, SplittableRandom rng) {
        if (shape < 1) {
            double u = 1 - rng.nextDouble(); // in (0, 1]
            return logGamma(shape + 1, rng) + Math.log(u) / shape;
        }
        double d = shape - 1.0 / 3;
        double c = 1 / Math.sqrt(9 * d);
        while (true) {
            double x = rng.nextGaussian();
            double v = 1 + c * x;
            if (v <= 0) {
                continue;
            }
            v = v * v * v;
            double u = rng.nextDouble();
            if (u < 1 - 0.0331 * x * x * x * x || Math.log(u) < 0.5 * x * x + d * (1 - v + Math.log(v))) {
                return Math.log(d) + Math.log(v);
            }
        }
    }

    /**
     * One draw of log θ from Dirichlet(a + counts[from..from+r)) (counts null: the prior alone), written
     * into {@code out[at..at+r)}.
     */
    public static void logDraw(double a, long[] counts, int from, int r, SplittableRandom rng, double[] out, int at) {
        double[] g = new double[r];
        for (int k = 0; k < r; k++) {
            g[k] = logGamma(a + (counts == null ? 0 : counts[from + k]), rng);
        }
        double z = LogSum.of(g);
        for (int k = 0; k < r; k++) {
            out[at + k] = g[k] - z;
        }
    }
}
