package org.edgewise.driver.average;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;
import org.edgewise.driver.average.ordermcmc.SampledOrders;

/**
 * Features beyond edges against an enumeration of every DAG. The enumeration is first checked
 * against the number of labelled DAGs (Robinson 1973, "Counting labeled acyclic digraphs";
 * OEIS A003024: 1, 1, 3, 25, 543, 29281, 3781503 for n = 0..6). Under the order-modular prior
 * (Koivisto &amp; Sood 2004) a DAG G has weight Π_i β_i(U_i) · #(orders consistent with G).
 */
class DagEnumerationTest {

    @Test
    void enumerationCountsTheLabelledDags() {
        // OEIS A003024 (Robinson 1973) for n = 1..5; n = 6 (3781503) would take 2^30 candidate graphs
        long[] expected = {1, 3, 25, 543, 29281};
        for (int n = 1; n <= 5; n++) {
            assertEquals(expected[n - 1], DagEnumeration.allDags(n).size(), "n = " + n);
        }
        // Σ_G #linear extensions(G) counts (order, DAG consistent with it) pairs = n! · 2^{n(n−1)/2}
        long pairs = 0;
        for (int[] g : DagEnumeration.allDags(4)) {
            pairs += DagEnumeration.linearExtensions(g, 4);
        }
        assertEquals(24L * (1L << 6), pairs);
    }

    @Test
    void edgesParentSetsAndFeaturesMatchTheEnumeration() {
        int n = 4;
        ScoreStore s = TestStores.random(n, 2, 3, 150, 61);
        LocalScores ls = TestStores.scores(s);
        double[][] logBeta = DagEnumeration.logWeights(ls);
        int[][] setIndex = DagEnumeration.setIndex(ls);
        List<int[]> dags = DagEnumeration.allDags(n);
        double[] lw = new double[dags.size()];
        for (int k = 0; k < dags.size(); k++) {
            int[] g = dags.get(k);
            double w = Math.log(DagEnumeration.linearExtensions(g, n));
            for (int i = 0; i < n; i++) {
                w += logBeta[i][g[i]];
            }
            lw[k] = w;
        }
        double z = LogSum.of(lw);
        double[][] edge = new double[n][n];
        double[][] anc = new double[n][n];
        double[][] mb = new double[n][n];
        double[][] sets = new double[n][];
        for (int i = 0; i < n; i++) {
            sets[i] = new double[ls.setCount(i)];
        }
        for (int k = 0; k < dags.size(); k++) {
            int[] g = dags.get(k);
            double p = Math.exp(lw[k] - z);
            int[] reach = new int[n];
            for (int it = 0; it < n; it++) {
                for (int v = 0; v < n; v++) {
                    int r = g[v];
                    for (int u = 0; u < n; u++) {
                        if ((g[v] >> u & 1) != 0) {
                            r |= reach[u];
                        }
                    }
                    reach[v] = r;
                }
            }
            for (int v = 0; v < n; v++) {
                sets[v][setIndex[v][g[v]]] += p;
                for (int u = 0; u < n; u++) {
                    if ((g[v] >> u & 1) != 0) {
                        edge[u][v] += p;
                    }
                    if ((reach[v] >> u & 1) != 0) {
                        anc[u][v] += p;
                    }
                }
            }
            for (int a = 0; a < n; a++) {
                for (int b = a + 1; b < n; b++) {
                    boolean in = (g[a] >> b & 1) != 0 || (g[b] >> a & 1) != 0;
                    for (int c = 0; c < n && !in; c++) {
                        in = (g[c] >> a & 1) != 0 && (g[c] >> b & 1) != 0;
                    }
                    if (in) {
                        mb[a][b] += p;
                    }
                }
            }
        }
        ExactOrderSum.Result dp = ExactOrderSum.run(ls, OrderConstraints.none(n), 20_000, 5L, null);
        assertEquals(z - Math.log(24), dp.logEvidence(), 1e-9);
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                assertEquals(edge[a][b], dp.edgePosterior()[a][b], 1e-9);
            }
            for (int k = 0; k < ls.setCount(a); k++) {
                assertEquals(sets[a][k], dp.setPosterior()[a][k], 1e-9);
            }
        }
        // features from 20,000 orders drawn from the exact posterior: within 4 standard errors
        double[][][] f = SampledOrders.features(ls, Arrays.asList(dp.sampledOrders()), 6L);
        // MCMC features: one DAG per stored draw
        McmcResult mc = OrderMcmc.run(ls, OrderConstraints.none(n),
                McmcSettings.defaults(8).withSteps(40_000, 2000).withChains(4, 5000).withFeatures(true), null);
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a == b) {
                    continue;
                }
                assertEquals(anc[a][b], f[0][a][b], 4 * f[2][a][b] + 1e-3, "ancestor " + a + "~>" + b);
                assertEquals(anc[a][b], mc.ancestors()[a][b].mean(), 0.03, "mcmc ancestor " + a + "~>" + b);
                double m = a < b ? mb[a][b] : mb[b][a];
                assertEquals(m, f[1][a][b], 4 * f[3][a][b] + 1e-3, "blanket " + a + "," + b);
                assertEquals(m, mc.blanket()[a][b].mean(), 0.03, "mcmc blanket " + a + "," + b);
            }
        }
    }
}
