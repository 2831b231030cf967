package org.edgewise.driver.average.exact;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.score.StructurePrior;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.TestStores;

/**
 * The exact structure-modular sums against an enumeration of every DAG (DagEnumerationTest's
 * enumeration, itself checked against OEIS A003024): P(G | D) ∝ Π_i β_i(U_i), each DAG counted once.
 */
public class StructureSumTest {

    /** Brute force: log Z, log Z_ρ, edges and parent sets over every DAG admitted by {@code oc}. */
    record Enumerated(double logZ, double logPriorZ, double[][] edge, double[][] sets) {
    }

    static Enumerated enumerate(LocalScores ls, OrderConstraints oc) {
        int n = ls.variableCount();
        double[][] logBeta = DagEnumeration.logWeights(ls);
        double[][] logRho = DagEnumeration.logPriors(ls);
        int[][] setIndex = DagEnumeration.setIndex(ls);
        List<int[]> dags = DagEnumeration.allDags(n).stream().filter(g -> admitted(g, oc, n)).toList();
        double[] lw = new double[dags.size()];
        double[] lr = new double[dags.size()];
        for (int k = 0; k < dags.size(); k++) {
            for (int i = 0; i < n; i++) {
                lw[k] += logBeta[i][dags.get(k)[i]];
                lr[k] += logRho[i][dags.get(k)[i]];
            }
        }
        double z = LogSum.of(lw);
        double[][] edge = new double[n][n];
        double[][] sets = new double[n][];
        for (int i = 0; i < n; i++) {
            sets[i] = new double[ls.setCount(i)];
        }
        for (int k = 0; k < dags.size(); k++) {
            double p = Math.exp(lw[k] - z);
            if (p == 0) {
                continue;
            }
            int[] g = dags.get(k);
            for (int v = 0; v < n; v++) {
                sets[v][setIndex[v][g[v]]] += p;
                for (int u = 0; u < n; u++) {
                    if ((g[v] >> u & 1) != 0) {
                        edge[u][v] += p;
                    }
                }
            }
        }
        return new Enumerated(z, LogSum.of(lr), edge, sets);
    }

    /** G is admitted when G plus the required precedences is still acyclic (it has a tier-respecting order). */
    public static boolean admitted(int[] g, OrderConstraints oc, int n) {
        int[] pa = g.clone();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (oc.mustPrecede(a, b)) {
                    pa[b] |= 1 << a;
                }
            }
        }
        return DagEnumeration.acyclic(pa, n);
    }

    /** Number of orders allowed by {@code oc} in which every node of {@code g} follows its parents. */
    static long allowedExtensions(int[] g, OrderConstraints oc, int n) {
        int[] pa = g.clone();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (oc.mustPrecede(a, b)) {
                    pa[b] |= 1 << a;
                }
            }
        }
        return DagEnumeration.linearExtensions(pa, n);
    }

    static void assertMatches(LocalScores ls, OrderConstraints oc, String what) {
        int n = ls.variableCount();
        Enumerated e = enumerate(ls, oc);
        StructureSum.Result r = StructureSum.run(ls, oc);
        double scale = Math.max(1.0, Math.abs(e.logZ()));
        // a posterior is exp of a sum of logs of size |log Z|: each addition may round by an ulp of
        // |log Z| (2.2e-16 relative), some fifty of them on the way: 1e-14 |log Z| (1e-7 at 10^7)
        double tol = Math.max(1e-9, 1e-14 * scale);
        assertEquals(e.logZ(), r.logDagSum(), 1e-12 * scale + 1e-10, what + ": log Z");
        assertEquals(e.logPriorZ(), r.logPriorSum(), 1e-10, what + ": log Z_rho");
        assertEquals(e.logZ() - e.logPriorZ(), r.logEvidence(), 1e-12 * scale + 1e-10, what + ": log P(D)");
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                assertEquals(e.edge()[a][b], r.edgePosterior()[a][b], tol, what + ": edge " + a + "->" + b);
            }
            for (int k = 0; k < ls.setCount(a); k++) {
                assertEquals(e.sets()[a][k], r.setPosterior()[a][k], tol, what + ": set " + k + " of " + a);
            }
        }
    }

    @Test
    void countsTheLabelledDags() {
        // OEIS A003024 (Robinson 1973): 3, 25, 543, 29281 labelled DAGs on n = 2..5; all weights 1
        long[] expected = {3, 25, 543, 29281};
        for (int n = 2; n <= 5; n++) {
            LocalScores ls = TestStores.scores(TestStores.scaled(TestStores.random(n, 2, n - 1, 50, 3), 0.0));
            StructureSum.Result r = StructureSum.run(ls, OrderConstraints.none(n));
            assertEquals(Math.log(expected[n - 2]), r.logDagSum(), 1e-12, "n = " + n);
            assertEquals(Math.log(expected[n - 2]), r.logPriorSum(), 1e-12, "n = " + n);
        }
    }

    @Test
    void equalsTheEnumerationOfEveryDagBothPriors() {
        for (int n = 4; n <= 5; n++) {
            ScoreStore s = TestStores.random(n, 2, n == 4 ? 3 : 2, 150, 17 + n);
            for (StructurePrior prior : StructurePrior.values()) {
                LocalScores ls = LocalScores.build(s, new ScoringOptions(null, Double.NaN, prior, List.of(), List.of()));
                assertMatches(ls, OrderConstraints.none(n), "n = " + n + ", prior " + prior);
            }
        }
    }

    @Test
    void equalsTheEnumerationWithScoresOfLargeMagnitude() {
        // family scores multiplied by 10^4 reach about -10^6: log space must not lose the posteriors
        ScoreStore s = TestStores.scaled(TestStores.random(5, 3, 2, 200, 29), 1e4);
        LocalScores ls = TestStores.scores(s);
        assertTrue(StructureSum.run(ls, OrderConstraints.none(5)).logDagSum() < -1e6);
        assertMatches(ls, OrderConstraints.none(5), "scaled");
        // and nearly flat scores (many DAGs of similar weight: the most cancellation)
        assertMatches(TestStores.scores(TestStores.scaled(TestStores.random(5, 2, 4, 100, 31), 1e-3)),
                OrderConstraints.none(5), "flat");
    }

    @Test
    void equalsTheEnumerationUnderTiersForbiddenAndRequiredEdges() {
        for (TestStores.Constrained c : TestStores.constrained(TestStores.random(5, 2, 2, 150, 41),
                new int[][] {{3, 1}, {0}}, new int[][] {{0}, {1, 2}})) {
            assertMatches(c.scores(), c.constraints(), c.what());
        }
    }

    @Test
    void refusesBeyondTheLargestSizeNamingTheAlternatives() {
        LocalScores ls = TestStores.scores(TestStores.random(23, 2, 1, 40, 5));
        StructureSum.Estimate e = StructureSum.estimateHere(23);
        UserError err = assertThrows(UserError.class, () -> StructureSum.run(ls, OrderConstraints.none(23)));
        assertEquals(String.format(java.util.Locale.ROOT, "exact structure-modular sum for n = 23 needs about %.2f GiB and %.0f s "
                + "on idle cores here; this JVM allows n <= %d; use method MCMC (sampling under the same prior) "
                + "or dagPrior ORDER_MODULAR (exact to larger n)", e.bytes() / (double) (1L << 30), e.seconds(), e.largestN()),
                err.getMessage());
    }
}
