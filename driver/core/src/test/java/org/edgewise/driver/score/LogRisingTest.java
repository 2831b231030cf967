package org.edgewise.driver.score;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.edgewise.driver.UserError;
import org.junit.jupiter.api.Test;

/**
 * The log rising factorial and the family score against an exact summation reference. Source: the
 * identity Γ(a+N)/Γ(a) = Π_{t<N}(a+t), so lnΓ(a+N) − lnΓ(a) = Σ_{t<N} ln(a+t), summed here term by
 * term with Neumaier's compensated summation (every term a correctly rounded log; no lnΓ involved).
 */
class LogRisingTest {
    /** The reference: Σ_{t<n} ln(a+t), compensated. */
    static double reference(double a, long n) {
        double sum = 0;
        double c = 0;
        for (long t = 0; t < n; t++) {
            double x = Math.log(a + t);
            double s = sum + x;
            c += Math.abs(sum) >= Math.abs(x) ? (sum - s) + x : (x - s) + sum;
            sum = s;
        }
        return sum + c;
    }

    static void close(double expected, double actual, String what) {
        double rel = Math.abs(actual - expected) / Math.abs(expected);
        assertTrue(rel <= 1e-12, what + ": " + actual + " vs reference " + expected + ", relative error " + rel);
    }

    @Test
    void matchesTheProductIdentityInEveryRegime() {
        double[] as = {1e-13, 1e-4, 0.3, 2.5, 9.99, 10, 37.5, 1e4, 8.3e10, 1e12, 1e15};
        long[] ns = {1, 2, 7, 8, 9, 30, 1000, 100_000, 1_000_000};
        for (double a : as) {
            for (long n : ns) {
                double ref = reference(a, n);
                if (Math.abs(ref) < 1e-3) {
                    continue; // near a root of (a)_n = 1 every method's relative error is unbounded
                }
                close(ref, LogRising.of(a, n), "ln (" + a + ")_" + n);
            }
        }
        assertEquals(0.0, LogRising.of(0.5, 0));
    }

    /**
     * The family score at ESS 1e-3, 1, 1e6, 1e12 (the range) against Σ_j [Σ_k ref(α_ijk, N_ijk) −
     * ref(α_ij, N_ij)]: relative error ≤ 1e-12. Before LogRising, ESS 1e12 gave 5.6e-6.
     */
    @Test
    void familyScoreIsAccurateAtAnyEss() {
        Random rnd = new Random(11);
        int r = 3;
        int q = 4;
        long[] counts = new long[r * q];
        for (int i = 0; i < counts.length; i++) {
            counts[i] = rnd.nextInt(4) == 0 ? 0 : 1 + rnd.nextInt(i % 2 == 0 ? 20 : 30_000);
        }
        for (double ess : new double[] {1e-3, 1, 1e6, 1e12}) {
            FamilyScore s = FamilyScore.of(ScoreKind.BDEU, ess);
            double a = ess / (r * q);
            double ref = 0;
            for (int j = 0; j < q; j++) {
                long nij = 0;
                for (int k = 0; k < r; k++) {
                    ref += reference(a, counts[j * r + k]);
                    nij += counts[j * r + k];
                }
                ref -= reference(a * r, nij);
            }
            close(ref, s.logScore(counts, r, q), "BDeu ESS " + ess);
        }
    }

    @Test
    void absurdEssIsRefusedNotScored() {
        UserError e = assertThrows(UserError.class, () -> FamilyScore.of(ScoreKind.BDEU, 1e308));
        assertEquals("ESS must be between 1e-9 and 1e15, got 1.0E308 (beyond these the prior alone decides every"
                + " score, or the data alone)", e.getMessage());
    }
}
