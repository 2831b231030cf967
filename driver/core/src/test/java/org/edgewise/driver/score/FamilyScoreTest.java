package org.edgewise.driver.score;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;
import org.apache.commons.math3.special.Gamma;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

class FamilyScoreTest {
    /**
     * Cooper &amp; Herskovits (1992), "A Bayesian method for the induction of probabilistic networks
     * from data", Machine Learning 9, the ten-case database over binary x1, x2, x3 (from memory).
     */
    static final int[][] TEN_CASES = {
        {1, 0, 0}, {1, 1, 1}, {0, 0, 1}, {1, 1, 1}, {0, 0, 0},
        {0, 1, 1}, {1, 1, 1}, {0, 0, 0}, {1, 1, 1}, {0, 0, 0},
    };

    static final List<Variable> BINARY3 = List.of(
            new Variable("x1", List.of("0", "1")), new Variable("x2", List.of("0", "1")),
            new Variable("x3", List.of("0", "1")));

    static double family(FamilyScore s, List<Variable> vars, int[][] rows, int child, int... parents) {
        FamilyCounts fc = InMemoryTally.count(vars, rows, child, parents);
        double q = 1;
        for (int p : parents) {
            q *= vars.get(p).arity();
        }
        return s.logScore(fc.counts(), vars.get(child).arity(), q);
    }

    @Test
    void cooperHerskovitsWorkedExample() {
        FamilyScore k2 = FamilyScore.of(ScoreKind.K2, 1);
        // B_S1: x1 -> x2 -> x3;  B_S2: x2 <- x1 -> x3
        double s1 = family(k2, BINARY3, TEN_CASES, 0) + family(k2, BINARY3, TEN_CASES, 1, 0)
                + family(k2, BINARY3, TEN_CASES, 2, 1);
        double s2 = family(k2, BINARY3, TEN_CASES, 0) + family(k2, BINARY3, TEN_CASES, 1, 0)
                + family(k2, BINARY3, TEN_CASES, 2, 0);
        // Cooper & Herskovits (1992): P(D | B_S1) = 2.23e-9 (three significant digits in the paper)
        assertEquals(2.23e-9, Math.exp(s1), 0.005e-9);
        // ... and B_S1 is ten times as probable as B_S2 (equal structure priors)
        assertEquals(Math.log(10), s1 - s2, 1e-12);
        // exact value of the same product: 5!5!/11! · (1/30)^2 · (1/6)(1/30), worked by hand from the K2 formula
        assertEquals(Math.log(14400.0 / 39916800.0 / 900.0 / 180.0), s1, 1e-12);
    }

    @Test
    void logGammaMatchesHandbookValues() {
        // lnΓ(1/2) = ½ ln π (well known: Γ(1/2) = √π)
        assertEquals(0.5 * Math.log(Math.PI), Gamma.logGamma(0.5), 1e-14);
        // Abramowitz & Stegun (1964), Table 6.1, Γ(x) on [1, 2] (10 decimals, from memory)
        assertEquals(Math.log(0.9064024771), Gamma.logGamma(1.25), 1e-9);
        assertEquals(Math.log(0.8862269255), Gamma.logGamma(1.5), 1e-9);
        assertEquals(Math.log(0.9190625268), Gamma.logGamma(1.75), 1e-9);
        // Γ(n) = (n−1)!: lnΓ(10) = ln 362880
        assertEquals(Math.log(362880), Gamma.logGamma(10), 1e-12);
        // Stirling's series ln Γ(x) ≈ (x−½)ln x − x + ½ln 2π + 1/(12x) − 1/(360x³) for large x (A&S 6.1.41)
        double x = 1e6;
        double stirling = (x - 0.5) * Math.log(x) - x + 0.5 * Math.log(2 * Math.PI) + 1 / (12 * x) - 1 / (360 * x * x * x);
        assertEquals(stirling, Gamma.logGamma(x), 1e-6);
    }

    @Test
    void emptyFamilyOfOneRowIsTheDirichletPredictive() {
        // one observation of a 2-state child under BDeu(ESS = 1), no parents: P = α/(rα) = 1/2
        FamilyScore bdeu = FamilyScore.withDefaults();
        assertEquals(Math.log(0.5), bdeu.logScore(new long[] {1, 0}, 2, 1), 1e-14);
        // K2, counts (2, 1): 1!·2!·1!/4! = 1/12 (Cooper & Herskovits 1992, eq. for (r−1)!/(N+r−1)! Π N_k!)
        assertEquals(Math.log(1.0 / 12), FamilyScore.of(ScoreKind.K2, 1).logScore(new long[] {2, 1}, 2, 1), 1e-14);
    }

    /**
     * Heckerman, Geiger &amp; Chickering (1995), Machine Learning 20: BDeu is score-equivalent —
     * Markov-equivalent DAGs get the same total score — and K2 is not. Checked over random small tables
     * for a → b → c, a ← b ← c, a ← b → c (equivalent) and for a → b vs b → a.
     */
    @Test
    void bdeuIsScoreEquivalentAndK2IsNot() {
        Random rnd = new Random(20261201L); // fixed seed: common practice
        int k2Differs = 0;
        for (int trial = 0; trial < 25; trial++) {
            int ra = 2 + rnd.nextInt(3);
            int rb = 2 + rnd.nextInt(3);
            int rc = 2 + rnd.nextInt(3);
            List<Variable> vars = List.of(var("a", ra), var("b", rb), var("c", rc));
            int n = 5 + rnd.nextInt(60);
            int[][] rows = new int[n][];
            for (int t = 0; t < n; t++) {
                int a = rnd.nextInt(ra);
                int b = rnd.nextDouble() < 0.6 ? a % rb : rnd.nextInt(rb);
                int c = rnd.nextDouble() < 0.6 ? b % rc : rnd.nextInt(rc);
                rows[t] = new int[] {a, b, c};
            }
            double ess = 0.5 + 10 * rnd.nextDouble();
            for (ScoreKind kind : ScoreKind.values()) {
                FamilyScore s = FamilyScore.of(kind, ess);
                double chain = family(s, vars, rows, 0) + family(s, vars, rows, 1, 0) + family(s, vars, rows, 2, 1);
                double back = family(s, vars, rows, 2) + family(s, vars, rows, 1, 2) + family(s, vars, rows, 0, 1);
                double fork = family(s, vars, rows, 1) + family(s, vars, rows, 0, 1) + family(s, vars, rows, 2, 1);
                double ab = family(s, vars, rows, 0) + family(s, vars, rows, 1, 0);
                double ba = family(s, vars, rows, 1) + family(s, vars, rows, 0, 1);
                if (kind == ScoreKind.BDEU) {
                    assertEquals(chain, back, 1e-9 * Math.abs(chain), "trial " + trial);
                    assertEquals(chain, fork, 1e-9 * Math.abs(chain), "trial " + trial);
                    assertEquals(ab, ba, 1e-9 * Math.abs(ab), "trial " + trial);
                } else if (Math.abs(ab - ba) > 1e-6 || Math.abs(chain - fork) > 1e-6) {
                    k2Differs++;
                }
            }
        }
        // K2 gives different totals to equivalent DAGs on (almost) every table with unequal arities
        assertTrue(k2Differs >= 20, "K2 differed on only " + k2Differs + " of 25 tables");
    }

    private static Variable var(String name, int r) {
        String[] s = new String[r];
        for (int k = 0; k < r; k++) {
            s[k] = Integer.toString(k);
        }
        return new Variable(name, List.of(s));
    }
}
