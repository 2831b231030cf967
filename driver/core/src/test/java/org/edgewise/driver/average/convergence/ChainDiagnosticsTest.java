package org.edgewise.driver.average.convergence;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.apache.commons.math3.distribution.NormalDistribution;
import org.junit.jupiter.api.Test;

/**
 * Rank-normalised split-R̂ and bulk/tail ESS (Vehtari, Gelman, Simpson, Carpenter &amp; Bürkner
 * 2021) against a hand-computed example, an independent re-implementation (direct O(N²)
 * autocovariances, Φ⁻¹ from Commons Math, ranks by counting), and processes whose answers are
 * known in closed form.
 */
class ChainDiagnosticsTest {

    private static double gaussian(SplittableRandom r) {
        // Box–Muller
        return Math.sqrt(-2 * Math.log(1 - r.nextDouble())) * Math.cos(2 * Math.PI * r.nextDouble());
    }

    /** AR(1) x_t = φ x_{t−1} + σ ε_t, started from its stationary law. */
    private static double[][] ar1(int chains, int n, double phi, long seed) {
        SplittableRandom r = new SplittableRandom(seed);
        double[][] x = new double[chains][n];
        for (int c = 0; c < chains; c++) {
            double v = gaussian(r) / Math.sqrt(1 - phi * phi);
            for (int t = 0; t < n; t++) {
                v = phi * v + gaussian(r);
                x[c][t] = v;
            }
        }
        return x;
    }

    @Test
    void splitRhatOfAHandComputedExample() {
        // chains (1,2,3,4) and (2,3,4,5) split into (1,2) (3,4) (2,3) (4,5): W = 0.5, B/N = 5/3,
        // var⁺ = ½·0.5 + 5/3 = 23/12, R̂ = sqrt(23/6) = 1.9578900 (by hand, Gelman & Rubin 1992's formula)
        double[][] s = ChainDiagnostics.split(new double[][] {{1, 2, 3, 4}, {2, 3, 4, 5}});
        assertEquals(Math.sqrt(23.0 / 6), ChainDiagnostics.splitRhat(s), 1e-12);
        assertEquals(1.9578900, ChainDiagnostics.splitRhat(s), 1e-7);
        // ranks with ties averaged: pooled 1,2,2,3,3,4,4,5 → ranks 1, 2.5, 2.5, 4.5, 4.5, 6.5, 6.5, 8;
        // z = Φ⁻¹((r − 3/8)/(8 + 1/4)); Φ⁻¹(0.625/8.25 = 0.0757576) = −1.434 (A&S table 26.1 by interpolation)
        double[][] z = ChainDiagnostics.rankNormal(s);
        assertEquals(-1.434, z[0][0], 2e-3);
        assertEquals(z[0][1], z[2][0], 0.0); // the two 2s share a rank
        assertEquals(-z[0][0], z[3][1], 1e-12); // 1 and 5 are mirror ranks
    }

    @Test
    void inverseNormalMatchesHandbookPercentagePoints() {
        // Φ⁻¹(p) to ten digits, Abramowitz & Stegun 1964, ch. 26 (Table 26.1 / percentage points):
        // z(0.975) = 1.959963985, z(0.995) = 2.575829304, z(0.9) = 1.281551566, z(0.5) = 0
        assertEquals(1.959963985, ChainDiagnostics.inverseNormal(0.975), 1e-9);
        assertEquals(2.575829304, ChainDiagnostics.inverseNormal(0.995), 1e-9);
        assertEquals(1.281551566, ChainDiagnostics.inverseNormal(0.9), 1e-9);
        assertEquals(-1.959963985, ChainDiagnostics.inverseNormal(0.025), 1e-9);
        assertEquals(0.0, ChainDiagnostics.inverseNormal(0.5), 1e-15);
    }

    /** The reference: Vehtari et al. 2021 written out directly, sharing no code with the class under test. */
    static double[] reference(double[][] x) {
        int m = x.length;
        int h = x[0].length / 2;
        double[][] s = new double[2 * m][];
        for (int c = 0; c < m; c++) {
            s[2 * c] = Arrays.copyOfRange(x[c], 0, h);
            s[2 * c + 1] = Arrays.copyOfRange(x[c], x[c].length - h, x[c].length);
        }
        double[] pooled = Arrays.stream(s).flatMapToDouble(Arrays::stream).toArray();
        NormalDistribution nd = new NormalDistribution();
        double[][] z = new double[s.length][h];
        double[][] f = new double[s.length][h];
        double[] sorted = pooled.clone();
        Arrays.sort(sorted);
        double med = sorted.length % 2 == 1 ? sorted[sorted.length / 2]
                : (sorted[sorted.length / 2 - 1] + sorted[sorted.length / 2]) / 2;
        double[] fold = Arrays.stream(pooled).map(v -> Math.abs(v - med)).toArray();
        for (int c = 0; c < s.length; c++) {
            for (int t = 0; t < h; t++) {
                z[c][t] = nd.inverseCumulativeProbability((rank(pooled, s[c][t]) - 0.375) / (pooled.length + 0.25));
                f[c][t] = nd.inverseCumulativeProbability((rank(fold, Math.abs(s[c][t] - med)) - 0.375) / (pooled.length + 0.25));
            }
        }
        return new double[] {Math.max(rhat(z), rhat(f)), ess(z), ess(s)};
    }

    /** Average rank of v among a (counting, no sort). */
    private static double rank(double[] a, double v) {
        int less = 0;
        int equal = 0;
        for (double u : a) {
            if (u < v) {
                less++;
            } else if (u == v) {
                equal++;
            }
        }
        return less + (equal + 1) / 2.0;
    }

    private static double rhat(double[][] s) {
        double[] wb = withinBetween(s);
        int n = s[0].length;
        return Math.sqrt(((n - 1.0) / n * wb[0] + wb[1]) / wb[0]);
    }

    /** W (mean within-chain variance) and B/n (variance of the chain means), each with divisor count − 1. */
    private static double[] withinBetween(double[][] s) {
        int n = s[0].length;
        double[] means = Arrays.stream(s).mapToDouble(r -> Arrays.stream(r).average().orElseThrow()).toArray();
        double w = 0;
        for (int c = 0; c < s.length; c++) {
            for (double v : s[c]) {
                w += (v - means[c]) * (v - means[c]) / (n - 1) / s.length;
            }
        }
        double gm = Arrays.stream(means).average().orElseThrow();
        return new double[] {w, Arrays.stream(means).map(v -> (v - gm) * (v - gm)).sum() / (s.length - 1)};
    }

    private static double ess(double[][] s) {
        int m = s.length;
        int n = s[0].length;
        double[] means = Arrays.stream(s).mapToDouble(r -> Arrays.stream(r).average().orElseThrow()).toArray();
        double w = 0;
        for (int c = 0; c < m; c++) {
            for (double v : s[c]) {
                w += (v - means[c]) * (v - means[c]) / (n - 1) / m;
            }
        }
        double gm = Arrays.stream(means).average().orElseThrow();
        double b = Arrays.stream(means).map(v -> (v - gm) * (v - gm)).sum() / (m - 1);
        double vp = (n - 1.0) / n * w + b;
        double[] rho = new double[n];
        for (int t = 0; t < n; t++) {
            double acov = 0;
            for (int c = 0; c < m; c++) {
                for (int u = 0; u + t < n; u++) {
                    acov += (s[c][u] - means[c]) * (s[c][u + t] - means[c]) / n / m;
                }
            }
            rho[t] = t == 0 ? 1 : 1 - (w - acov) / vp;
        }
        double tau = -1;
        double prev = Double.MAX_VALUE;
        for (int t = 0; t + 1 < n; t += 2) {
            double p = rho[t] + rho[t + 1];
            if (p < 0) {
                break;
            }
            p = Math.min(p, prev);
            prev = p;
            tau += 2 * p;
        }
        return m * n / Math.max(tau, 1 / Math.log10(m * n));
    }

    @Test
    void agreesWithAnIndependentReimplementation() {
        double[][] x = ar1(4, 301, 0.6, 21);
        // a discrete quantity with ties too (a Rao-Blackwellised edge takes few values)
        double[][] d = ar1(3, 200, 0.3, 22);
        for (double[] c : d) {
            for (int t = 0; t < c.length; t++) {
                c[t] = Math.round(c[t] * 2) / 2.0;
            }
        }
        for (double[][] q : new double[][][] {x, d}) {
            double[] ref = reference(q);
            ChainDiagnostics.Summary s = ChainDiagnostics.summary(q);
            assertEquals(ref[0], s.rhat(), 1e-9);
            assertEquals(ref[1], s.essBulk(), 1e-6 * ref[1]);
            assertEquals(Math.sqrt(varPlus(q) / ref[2]), s.mcse(), 1e-9);
        }
    }

    private static double varPlus(double[][] x) {
        double[][] s = ChainDiagnostics.split(x);
        double[] wb = withinBetween(s);
        int n = s[0].length;
        return (n - 1.0) / n * wb[0] + wb[1];
    }

    @Test
    void essOfAutoregressiveChainsMatchesTheirAutocorrelationTime() {
        // AR(1): τ = (1+φ)/(1−φ) (Geyer 1992, sec. 1), so ESS/N = (1−φ)/(1+φ). Tolerance 15 %
        // (Monte Carlo, 4 × 20,000 draws). Bulk-ESS is the ESS of a monotone transform: the same law.
        for (double phi : new double[] {0.0, 0.5, 0.8}) {
            double[][] x = ar1(4, 20_000, phi, 7 + (long) (10 * phi));
            ChainDiagnostics.Summary s = ChainDiagnostics.summary(x);
            double expected = 80_000 * (1 - phi) / (1 + phi);
            assertEquals(expected, s.essBulk(), expected * 0.15, "phi " + phi);
            assertEquals(1.0, s.rhat(), 0.01);
            // a tail indicator decorrelates faster than the draws themselves: between bulk-ESS/2 and N
            assertTrue(s.essTail() > 0.5 * s.essBulk() && s.essTail() < 80_000 * 1.1, "tail ESS " + s.essTail());
            assertEquals(ChainDiagnostics.State.VARIES, s.state());
        }
    }

    @Test
    void aConstantQuantityIsReportedAsSuchWithoutInfinityOrNaNRhat() {
        double[][] x = new double[4][100];
        for (double[] c : x) {
            Arrays.fill(c, 0.37);
        }
        ChainDiagnostics.Summary s = ChainDiagnostics.summary(x, ChainDiagnostics.SETTLE_SPAN);
        assertEquals(ChainDiagnostics.State.CONSTANT, s.state());
        assertEquals(1.0, s.rhat(), 0.0);
        assertEquals(0.0, s.mcse(), 0.0);
        assertTrue(s.converged(1.01));
    }

    @Test
    void oneStuckChainIsFlagged() {
        // three chains mix over N(0,1); the fourth sits at 0.5 throughout
        double[][] x = ar1(4, 2000, 0.3, 9);
        Arrays.fill(x[3], 0.5);
        ChainDiagnostics.Summary s = ChainDiagnostics.summary(x);
        assertTrue(s.rhat() > 1.01, "rhat " + s.rhat());
        assertFalse(s.converged(1.01));
        // every chain constant but at different values: stuck, R̂ = ∞ (a real failure, not an artefact)
        double[][] y = new double[4][50];
        for (int c = 0; c < 4; c++) {
            Arrays.fill(y[c], c * 0.1);
        }
        ChainDiagnostics.Summary st = ChainDiagnostics.summary(y, ChainDiagnostics.SETTLE_SPAN);
        assertEquals(ChainDiagnostics.State.STUCK, st.state());
        assertEquals(Double.POSITIVE_INFINITY, st.rhat());
        assertFalse(st.converged(1.01));
    }

    @Test
    void foldingFlagsEqualMeansWithUnequalVariances() {
        // Vehtari et al. 2021, sec. 4.1: one chain with 3× the spread and the same mean; the classic
        // split-R̂ (on the raw draws) does not see it, the folded rank-normalised R̂ does.
        double[][] x = ar1(4, 1000, 0.0, 12);
        for (int t = 0; t < x[0].length; t++) {
            x[0][t] *= 3;
        }
        double classic = ChainDiagnostics.splitRhat(ChainDiagnostics.split(x));
        ChainDiagnostics.Summary s = ChainDiagnostics.summary(x);
        assertTrue(classic < 1.01, "classic " + classic);
        assertTrue(s.rhat() > 1.01, "rank-normalised " + s.rhat());
    }

    @Test
    void chainsThatDifferByNegligibleAmountsAreSettledNotAlarming() {
        // The symptom: Rao-Blackwellised posteriors of an edge that is practically absent,
        // 1e-6 in two chains and 3e-6 in the others, each with rounding-level wiggles. R̂ is scale-free
        // and would call this "not converged" (and give an ESS near the number of chains whatever the
        // seed); every draw lies within 0.005, so no estimate can move by more: settled.
        SplittableRandom r = new SplittableRandom(3);
        double[][] x = new double[4][1000];
        for (int c = 0; c < 4; c++) {
            for (int t = 0; t < 1000; t++) {
                x[c][t] = (c < 2 ? 1e-6 : 3e-6) + (r.nextDouble() < 0.01 ? 1e-9 : 0);
            }
        }
        double[][] sp = ChainDiagnostics.split(x);
        assertTrue(ChainDiagnostics.splitRhat(sp) > 1.5, "raw R̂ " + ChainDiagnostics.splitRhat(sp));
        assertTrue(ChainDiagnostics.ess(sp) < 20, "raw ESS " + ChainDiagnostics.ess(sp));
        ChainDiagnostics.Summary s = ChainDiagnostics.summary(x, ChainDiagnostics.SETTLE_SPAN);
        assertEquals(ChainDiagnostics.State.SETTLED, s.state());
        assertTrue(Double.isNaN(s.essBulk()), "a settled quantity has no ESS that could decide anything");
        assertTrue(s.converged(1.01));
        // the same chains on a scale that matters (0.1 vs 0.3) are not settled
        for (double[] c : x) {
            for (int t = 0; t < c.length; t++) {
                c[t] *= 1e5;
            }
        }
        assertFalse(ChainDiagnostics.summary(x, ChainDiagnostics.SETTLE_SPAN).converged(1.01));
    }

    @Test
    void fftAutocovarianceEqualsDirectSum() {
        double[] x = ar1(1, 37, 0.3, 3)[0];
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
