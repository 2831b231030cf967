package org.edgewise.driver.average;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/** Split-R̂ and ESS against processes whose answers are known in closed form. */
class ChainDiagnosticsTest {

    private static double gaussian(SplittableRandom r) {
        // Box–Muller
        return Math.sqrt(-2 * Math.log(1 - r.nextDouble())) * Math.cos(2 * Math.PI * r.nextDouble());
    }

    /** AR(1) x_t = φ x_{t−1} + ε_t, started from its stationary law. */
    private static double[][] ar1(int chains, int n, double phi, double shift, long seed) {
        SplittableRandom r = new SplittableRandom(seed);
        double[][] x = new double[chains][n];
        for (int c = 0; c < chains; c++) {
            double v = gaussian(r) / Math.sqrt(1 - phi * phi);
            for (int t = 0; t < n; t++) {
                v = phi * v + gaussian(r);
                x[c][t] = v + (c == 0 ? shift : 0);
            }
        }
        return x;
    }

    @Test
    void essOfAutoregressiveChainMatchesItsIntegratedAutocorrelationTime() {
        // For AR(1), τ = (1+φ)/(1−φ) (e.g. Geyer 1992, Statistical Science 7, sec. 1), so
        // ESS ≈ N(1−φ)/(1+φ): φ = 0.8 → N/9. Tolerance 15 % (Monte Carlo, 4 × 20,000 draws).
        double[][] x = ar1(4, 20_000, 0.8, 0, 7);
        ChainDiagnostics.Summary s = ChainDiagnostics.summary(x);
        assertEquals(80_000 / 9.0, s.ess(), 80_000 / 9.0 * 0.15);
        assertEquals(1.0, s.rhat(), 0.01);
        // independent draws: ESS ≈ N (within 10 %)
        ChainDiagnostics.Summary iid = ChainDiagnostics.summary(ar1(4, 5000, 0.0, 0, 8));
        assertEquals(20_000, iid.ess(), 2000);
        // MCSE of the mean: sd/sqrt(ESS); sd of the stationary AR(1) with φ = 0.8 is 1/sqrt(0.36)
        assertEquals(1 / Math.sqrt(0.36) / Math.sqrt(80_000 / 9.0), s.mcse(), 0.15 * s.mcse());
    }

    @Test
    void rhatFlagsAChainStuckElsewhere() {
        // one of four chains shifted by 1 sd: the between-chain variance shows it (Gelman & Rubin 1992)
        double[][] x = ar1(4, 2000, 0.5, 1.0 * Math.sqrt(1 / 0.75), 9);
        assertTrue(ChainDiagnostics.splitRhat(x) > 1.05, "rhat " + ChainDiagnostics.splitRhat(x));
        // a trend inside each chain is caught by splitting the chains (Vehtari et al. 2021, sec. 3.1)
        double[][] trend = ar1(4, 2000, 0.0, 0, 10);
        for (double[] c : trend) {
            for (int t = 0; t < c.length; t++) {
                c[t] += 2.0 * t / c.length;
            }
        }
        assertTrue(ChainDiagnostics.splitRhat(trend) > 1.05, "rhat " + ChainDiagnostics.splitRhat(trend));
    }

    @Test
    void constantQuantities() {
        // all chains agree and never move: R̂ = 1; stuck at different values: R̂ = ∞
        assertEquals(1.0, ChainDiagnostics.splitRhat(new double[][] {{0, 0, 0, 0}, {0, 0, 0, 0}}), 0.0);
        assertEquals(Double.POSITIVE_INFINITY, ChainDiagnostics.splitRhat(new double[][] {{0, 0, 0, 0}, {1, 1, 1, 1}}));
    }

    @Test
    void fftAutocovarianceEqualsDirectSum() {
        double[] x = ar1(1, 37, 0.3, 0, 3)[0];
        double m = 0;
        for (double v : x) {
            m += v / x.length;
        }
        double[] a = ChainDiagnostics.autocovariance(x, m);
        for (int t = 0; t < x.length; t++) {
            double d = 0;
            for (int u = 0; u + t < x.length; u++) {
                d += (x[u] - m) * (x[u + t] - m);
            }
            assertEquals(d / x.length, a[t], 1e-12);
        }
    }
}
