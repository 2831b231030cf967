package org.edgewise.driver.average.convergence;

import java.util.Arrays;
import org.apache.commons.math3.distribution.BetaDistribution;

/**
 * The Monte Carlo standard error of a quantile of draws (Vehtari, Gelman, Simpson, Carpenter &amp;
 * Bürkner 2021, "Rank-normalization, folding, and localization: an improved R̂", Bayesian Analysis 16,
 * §4.3): with q̂ the p-quantile of the pooled draws, S the effective sample size of the indicator
 * I(x ≤ q̂) over the chains in draw order (split chains, Geyer's initial monotone sequence:
 * {@link ChainDiagnostics}), and a₁, a₂ the 15.87% and 84.13% quantiles of Beta(S p + 1, S (1 − p) + 1),
 * the MCSE is half the distance between the order statistics at a₁ M and a₂ M of the M pooled draws.
 * For independent draws S = M and this is the binomial spread of the count below a quantile; for
 * chains that dwell on a value (DAGs revisited for many draws) S is smaller and the error wider.
 * Memory: a copy of the draws.
 */
public final class QuantileMcse {
    private static final double LOW = 0.15865525393145707; // Φ(−1)
    private static final double HIGH = 0.8413447460685429; // Φ(1)

    private QuantileMcse() {
    }

    /**
     * The MCSE of the type-7 p-quantile of {@code x[c][t]} (chain c, draw t in order; chains of equal
     * length). One chain of independent draws: pass it as one row of its draws ({@code independent}
     * true) and S = M. NaN when there are fewer than 4 draws per chain.
     */
    public static double of(double[][] x, double p, boolean independent) {
        int chains = x.length;
        int per = x[0].length;
        int m = chains * per;
        double[] sorted = new double[m];
        for (int c = 0; c < chains; c++) {
            System.arraycopy(x[c], 0, sorted, c * per, per);
        }
        Arrays.sort(sorted);
        double q = ChainDiagnostics.sortedQuantile(sorted, p);
        double s;
        if (independent) {
            s = m;
        } else {
            if (per < 4) {
                return Double.NaN;
            }
            double[][] ind = new double[chains][per];
            for (int c = 0; c < chains; c++) {
                for (int t = 0; t < per; t++) {
                    ind[c][t] = x[c][t] <= q ? 1 : 0;
                }
            }
            s = ChainDiagnostics.ess(ChainDiagnostics.split(ind));
            if (Double.isNaN(s)) {
                // the indicator never varies within a chain half: every draw on one side, or chains stuck apart
                s = 1;
            }
            s = Math.min(s, m);
        }
        BetaDistribution beta = new BetaDistribution(null, s * p + 1, s * (1 - p) + 1);
        double a1 = beta.inverseCumulativeProbability(LOW);
        double a2 = beta.inverseCumulativeProbability(HIGH);
        int i1 = Math.max((int) Math.floor(a1 * m), 1) - 1;
        int i2 = Math.min((int) Math.ceil(a2 * m), m) - 1;
        return (sorted[i2] - sorted[i1]) / 2;
    }
}
