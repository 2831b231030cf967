package org.edgewise.driver.average;

import java.util.SplittableRandom;

/**
 * One draw θ ~ Dirichlet(a_1, …, a_r), made by normalising independent Gamma(a_k, 1) draws (the
 * standard construction; Devroye 1986, §XI.4), each drawn by Marsaglia &amp; Tsang (2000, "A simple
 * method for generating gamma variables", ACM TOMS 26(3)) for a ≥ 1 and boosted below 1 by
 * Gamma(a) = Gamma(a + 1)·U^{1/a} — in log space, because BDeu's α_ijk can be 10⁻³ and U^{1/a}
 * then underflows. Pure; the caller owns the random source. The one Gamma sampler of the project:
 * the parameter draws of effects, of predictions' intervals and of data augmentation all use it.
 */
public final class DirichletDraw {
    private DirichletDraw() {
    }

    /** θ drawn from Dirichlet(alpha), written into {@code out} (same length). */
    public static void draw(double[] alpha, SplittableRandom rng, double[] out) {
        for (int k = 0; k < alpha.length; k++) {
            out[k] = logGamma(alpha[k], rng);
        }
        double z = LogSum.of(out);
        for (int k = 0; k < alpha.length; k++) {
            out[k] = Math.exp(out[k] - z);
        }
    }

    /** The log of a Gamma(shape, 1) draw. */
    public static double logGamma(double shape, SplittableRandom rng) {
        if (!(shape > 0)) {
            throw new IllegalArgumentException("Gamma shape must be positive, got " + shape);
        }
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
