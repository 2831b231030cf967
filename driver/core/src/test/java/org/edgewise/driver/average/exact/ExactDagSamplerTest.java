package org.edgewise.driver.average.exact;

import org.edgewise.driver.score.DagPrior;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.TestStores;

/**
 * Exact DAG sampling against the enumeration of every DAG (DagEnumerationTest): the frequency of
 * each DAG of n = 3 and 4 variables within 5 binomial standard errors (plus 1/K) of its exact
 * probability — structure-modular P(G|D) ∝ Π β_i(U_i), order-modular ∝ Π β_i(U_i)·ext(G).
 */
class ExactDagSamplerTest {

    static void check(LocalScores ls, OrderConstraints oc, DagPrior prior, int k, long seed) {
        int n = ls.variableCount();
        double[][] logBeta = new double[n][1 << n];
        for (int i = 0; i < n; i++) {
            Arrays.fill(logBeta[i], Double.NEGATIVE_INFINITY);
            for (int s = 0; s < ls.setCount(i); s++) {
                logBeta[i][ExactOrderSum.globalMask(ls.masks(i)[s], ls.candidates(i))] = ls.weights(i)[s];
            }
        }
        List<int[]> dags = DagEnumeration.allDags(n).stream().filter(g -> StructureSumTest.admitted(g, oc, n)).toList();
        double[] lw = new double[dags.size()];
        for (int d = 0; d < dags.size(); d++) {
            int[] g = dags.get(d);
            for (int i = 0; i < n; i++) {
                lw[d] += logBeta[i][g[i]];
            }
            if (prior == DagPrior.ORDER_MODULAR) {
                lw[d] += Math.log(StructureSumTest.allowedExtensions(g, oc, n));
            }
        }
        double z = LogSum.of(lw);
        ExactDagSampler sampler = ExactDagSampler.of(ls, oc);
        List<int[]> draws = sampler.draw(prior, k, seed, StructureSum.run(ls, oc).logDagSum());
        Map<String, Integer> freq = new HashMap<>();
        for (int[] g : draws) {
            freq.merge(Arrays.toString(g), 1, Integer::sum);
        }
        double total = 0;
        for (int d = 0; d < dags.size(); d++) {
            double p = Math.exp(lw[d] - z);
            total += p;
            double f = freq.getOrDefault(Arrays.toString(dags.get(d)), 0) / (double) k;
            assertEquals(p, f, 5 * Math.sqrt(p * (1 - p) / k) + 1.0 / k, prior + " DAG " + Arrays.toString(dags.get(d)));
        }
        assertEquals(1.0, total, 1e-9);
    }

    @Test
    void frequenciesMatchTheEnumerationUnderBothPriors() {
        // weak data (20 rows) so that many DAGs have visible probability
        for (int n = 3; n <= 4; n++) {
            ScoreStore s = TestStores.random(n, 2, n - 1, 20, 7 + n);
            LocalScores ls = TestStores.scores(s);
            for (DagPrior prior : DagPrior.values()) {
                check(ls, OrderConstraints.none(n), prior, 40_000, 11);
            }
        }
    }

    @Test
    void frequenciesMatchTheEnumerationUnderTiers() {
        ScoreStore s = TestStores.random(4, 2, 3, 20, 13);
        LocalScores ls = TestStores.scores(s);
        OrderConstraints oc = OrderConstraints.of(ls, List.of(List.of(s.variables().get(2).name()),
                List.of(s.variables().get(0).name())));
        for (DagPrior prior : DagPrior.values()) {
            check(ls, oc, prior, 40_000, 12);
        }
    }
}
