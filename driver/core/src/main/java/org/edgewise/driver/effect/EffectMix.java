package org.edgewise.driver.effect;

import static org.edgewise.driver.effect.Term.GIVEN;
import static org.edgewise.driver.effect.Term.JOINT;
import static org.edgewise.driver.effect.Term.NO_PATH;
import static org.edgewise.driver.effect.Term.OBS_GIVEN;
import static org.edgewise.driver.effect.Term.OBS_JOINT;
import static org.edgewise.driver.effect.Term.OBS_VS_GIVEN;
import static org.edgewise.driver.effect.Term.OBS_VS_JOINT;
import static org.edgewise.driver.effect.Term.VS_GIVEN;
import static org.edgewise.driver.effect.Term.VS_JOINT;

import org.edgewise.driver.UserError;
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.average.LogSum;

/**
 * Mixing the per-order (or per-DAG) terms of one query into an {@link Effect}: log-sum-exp of
 * the weighted joints, ratios of the mixed joints, and, for a sample, delta-method MCSEs (see
 * {@link EffectEngine}).
 */
final class EffectMix {
    private EffectMix() {
    }

    /**
     * @param logW    log weights of the units (null: equal weights)
     * @param terms   per unit, the term row ({@link Term})
     * @param exact   whether the units are an exact enumeration (no MCSE)
     * @param chains  for MCMC orders, the number of chains (else 0)
     * @param values  the (DAG, θ) draws' effect values
     * @param noPath  the draws' no-path indicators
     * @param pairs   the draws' P(y | do(a)) and P(y | do(a0)), for the effect measures
     * @param givenName how the caller names the evidence in messages
     */
    static Effect combine(EffectQuery q, double[] logW, double[][] terms, boolean exact, int chains,
                          double[] values, boolean[] noPath, PairDraws pairs, String givenName) {
        int k = terms.length;
        double[] lw = new double[k];
        for (int u = 0; u < k; u++) {
            lw[u] = logW == null ? 0 : logW[u];
        }
        double z = LogSum.of(lw);
        double[] w = new double[k];
        for (int u = 0; u < k; u++) {
            w[u] = Math.exp(lw[u] - z);
        }
        double lg = mix(lw, z, terms, GIVEN);
        if (lg == Double.NEGATIVE_INFINITY) {
            throw new UserError(givenName + " has probability zero under the intervention; a conditional on it is undefined");
        }
        double p = Math.exp(mix(lw, z, terms, JOINT) - lg);
        double obs = Math.exp(mix(lw, z, terms, OBS_JOINT) - mix(lw, z, terms, OBS_GIVEN));
        double[] zp = residuals(terms, JOINT, GIVEN, lg, p);
        double pv = Double.NaN;
        double obsV = Double.NaN;
        double[] zv = null;
        if (q.versus() != null) {
            double lgv = mix(lw, z, terms, VS_GIVEN);
            pv = Math.exp(mix(lw, z, terms, VS_JOINT) - lgv);
            obsV = Math.exp(mix(lw, z, terms, OBS_VS_JOINT) - mix(lw, z, terms, OBS_VS_GIVEN));
            zv = residuals(terms, VS_JOINT, VS_GIVEN, lgv, pv);
        }
        double noPathMix = 0;
        boolean noPathExact = true;
        double[] np = new double[k];
        for (int u = 0; u < k; u++) {
            np[u] = NO_PATH.in(terms[u]);
            if (Double.isNaN(np[u])) {
                noPathExact = false;
            } else {
                noPathMix += w[u] * np[u];
            }
        }
        noPathMix = Math.min(1, noPathMix); // weights summing to 1 + 1e-15
        EffectDraws draws = EffectDraws.of(q.versus() != null ? "difference" : "probability", values, noPath,
                EffectEngine.LEVEL);
        double noPathMcse;
        if (noPathExact) {
            double mean = noPathMix;
            double[] zn = new double[k];
            for (int u = 0; u < k; u++) {
                zn[u] = np[u] - mean;
            }
            noPathMcse = exact ? 0 : se(w, zn, chains);
        } else {
            // the forward pass was too large for some order: fall back to the DAG draws
            noPathMix = draws.noPathShare();
            noPathMcse = Math.sqrt(noPathMix * (1 - noPathMix) / draws.count());
        }
        double mcse = exact ? 0 : se(w, zp, chains);
        double vMcse = Double.NaN;
        double diffMcse = Double.NaN;
        if (zv != null) {
            vMcse = exact ? 0 : se(w, zv, chains);
            double[] zd = new double[k];
            for (int u = 0; u < k; u++) {
                zd[u] = zp[u] - zv[u];
            }
            diffMcse = exact ? 0 : se(w, zd, chains);
        }
        return new Effect(p, mcse, exact, pv, vMcse, p - pv, diffMcse, p / pv, noPathMix, noPathMcse,
                noPathExact && (exact || k == 1), obs, obsV, draws, pairs);
    }

    /** log Σ_u w_u exp(terms[u][col]) with w_u = exp(lw_u − z). */
    private static double mix(double[] lw, double z, double[][] terms, Term col) {
        double[] x = new double[lw.length];
        for (int u = 0; u < lw.length; u++) {
            x[u] = lw[u] + col.in(terms[u]);
        }
        return LogSum.of(x) - z;
    }

    /** z_u = (a_u − R b_u) / b̄ for the ratio R = ā / b̄ (delta method). */
    private static double[] residuals(double[][] terms, Term a, Term b, double logBbar, double r) {
        double[] out = new double[terms.length];
        for (int u = 0; u < terms.length; u++) {
            double x = Math.exp(a.in(terms[u]) - logBbar) - r * Math.exp(b.in(terms[u]) - logBbar);
            out[u] = Double.isNaN(x) ? 0 : x;
        }
        return out;
    }

    /**
     * Standard error of Σ w_u z_u: independent units sqrt(Σ w_u² z_u²); chains via {@link ChainDiagnostics}
     * on x_u = k w_u z_u (whose mean is Σ w_u z_u; x_u = z_u for equal weights).
     */
    private static double se(double[] w, double[] z, int chains) {
        int k = z.length;
        if (chains > 0 && k / chains >= 4) {
            int per = k / chains;
            double[][] x = new double[chains][per];
            for (int c = 0; c < chains; c++) {
                for (int t = 0; t < per; t++) {
                    x[c][t] = k * w[c * per + t] * z[c * per + t];
                }
            }
            double m = ChainDiagnostics.summary(x).mcse();
            return Double.isNaN(m) ? 0 : m;
        }
        double s = 0;
        for (int u = 0; u < k; u++) {
            s += w[u] * w[u] * z[u] * z[u];
        }
        return Math.sqrt(s);
    }
}
