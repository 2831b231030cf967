package org.edgewise.driver.query;

import java.util.Arrays;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;

/**
 * Exact predictive probability of one complete case over unknown orders, under the order-modular
 * DAG prior, as the ratio of two exact sums over all orders (Koivisto &amp; Sood 2004):
 * <pre>
 *   P(x | D) = Σ_≺ P(≺ | D) P(x | D, ≺) = Σ_≺ Z_≺(D ∪ x) / Σ_≺ Z_≺(D) = Z(D ∪ x) / Z(D),
 *   Z_≺(D) = Π_i Σ_{U ∈ 𝒰_i(≺)} ρ_i(U) exp(s(i, U; D))
 * </pre>
 * (the first equality is the mixture over orders, the second P(x | D, ≺) = Z_≺(D ∪ x) / Z_≺(D)).
 * The family score of D ∪ x differs from that of D only in the one parent configuration j the case
 * hits, by the factor of the Dirichlet-multinomial predictive (Heckerman, Geiger &amp; Chickering
 * 1995; the chain rule of the marginal likelihood):
 * <pre>
 *   s(i, U; D ∪ x) = s(i, U; D) + log((N_ijk + α_ijk) / (N_ij + α_ij)),   j = x_U, k = x_i
 * </pre>
 * so Z(D ∪ x) is one more exact dynamic programme over orders ({@link ExactOrderSum}) on weights
 * computed from the stored counts — no rescan and no sampled orders. Cost per case: one DP,
 * O(n 2^n) time and memory as {@link ExactOrderSum#estimate}. Complete cases only (every
 * variable observed): a hidden variable would need one DP per joint hidden state.
 */
public final class ExactCasePrediction {
    private final LocalScores ls;
    private final OrderConstraints oc;
    private final double logZ;

    /** Runs the DP for Z(D) once; each {@link #logProbability} runs one more. */
    public ExactCasePrediction(LocalScores ls, OrderConstraints oc) {
        this.ls = ls;
        this.oc = oc;
        this.logZ = ExactOrderSum.run(ls, oc).logOrderSum();
    }

    /** log Z(D) = log Σ_≺ Z_≺(D) over the allowed orders. */
    public double logZ() {
        return logZ;
    }

    /** log P(x | D) for a complete case {@code x} (state indices, none {@link CaseParser#HIDDEN}). */
    public double logProbability(int[] x) {
        int n = ls.variableCount();
        for (int v = 0; v < n; v++) {
            if (x[v] == CaseParser.HIDDEN) {
                throw new UserError(ls.options().names().exactCases() + " needs every variable observed; " + ls.store().variables().get(v).name()
                        + " is hidden");
            }
        }
        return ExactOrderSum.run(ls.withWeights(weightsWith(ls, x)), oc).logOrderSum() - logZ;
    }

    /** The weights log ρ_i(U) + s(i, U; D ∪ x) of every allowed parent set. */
    static double[][] weightsWith(LocalScores ls, int[] x) {
        ScoreStore store = ls.store();
        FamilyScore fs = ls.familyScore();
        int n = ls.variableCount();
        double[][] w = new double[n][];
        for (int c = 0; c < n; c++) {
            w[c] = ls.weights(c).clone();
            int r = store.arity(c);
            for (int s = 0; s < w[c].length; s++) {
                FamilyCounts fc = store.family(ls.families(c)[s]);
                long j = 0;
                for (int p : fc.parents()) {
                    j = j * store.arity(p) + x[p];
                }
                int row = Arrays.binarySearch(fc.configs(), j);
                long nijk = 0;
                long nij = 0;
                if (row >= 0) {
                    nijk = fc.counts()[row * r + x[c]];
                    for (int k = 0; k < r; k++) {
                        nij += fc.counts()[row * r + k];
                    }
                }
                w[c][s] += Math.log(fs.predictive(nijk, nij, r, store.configurations(fc.parents())));
            }
        }
        return w;
    }
}
