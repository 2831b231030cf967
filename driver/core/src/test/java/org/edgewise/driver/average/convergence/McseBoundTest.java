package org.edgewise.driver.average.convergence;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * The rule of three (Hanley &amp; Lippman-Hand 1983): with no event in K independent draws, the
 * exact one-sided 95% upper bound on the probability is 1 − 0.05^{1/K} (Clopper &amp; Pearson
 * 1934 with zero successes); 3/K is never below it and within 1% of it from K = 300 on.
 */
class McseBoundTest {
    @Test
    void ruleOfThreeBoundsTheExactBinomialLimit() {
        for (long k = 1; k <= 100_000; k = k < 10 ? k + 1 : k * 3 / 2) {
            double exact = 1 - Math.pow(0.05, 1.0 / k);
            double r3 = McseBound.ruleOfThree(k);
            assertTrue(r3 >= exact, "K = " + k);
            if (k >= 300) {
                assertEquals(exact, r3, 0.01 * exact, "K = " + k);
            }
        }
    }

    @Test
    void onlyEstimatesOfZeroOrOneAreReplaced() {
        assertEquals(0.006, McseBound.reported(0.0, 0.0, 500), 1e-15);
        assertEquals(0.006, McseBound.reported(1.0, 0.0, 500), 1e-15);
        assertEquals(0.02, McseBound.reported(1.0, 0.02, 500), 1e-15, "a larger MCSE stays");
        assertEquals(0.001, McseBound.reported(0.5, 0.001, 500), 1e-15);
        assertEquals(0.006, McseBound.reported(0.0, Double.NaN, 500), 1e-15, "constant chains have no ESS");
    }
}
