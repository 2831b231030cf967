package org.edgewise.driver.average.givenorder;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import java.util.stream.Stream;
import org.edgewise.driver.BruteForce;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.score.StructurePrior;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.Arguments;
import org.junit.jupiter.params.provider.MethodSource;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;

/**
 * The closed form given an order (Buntine 1991; Friedman &amp; Koller 2003) against exact
 * enumeration of every DAG consistent with the order and the in-degree bound, each scored by the
 * sequential predictive (see {@link BruteForce}) — two independent computations, tolerance 1e-9.
 */
class OrderSumBruteForceTest {
    static final int[] ARITIES = {2, 3, 2, 2, 3};
    static final int[] ORDER = {2, 0, 4, 1, 3};

    static Stream<Arguments> cases() {
        // score, stored ESS, query ESS (NaN = as stored, else rescored), prior, d, constrained
        return Stream.of(
                Arguments.of(ScoreKind.BDEU, 1.0, Double.NaN, StructurePrior.UNIFORM, 2, false),
                Arguments.of(ScoreKind.BDEU, 1.0, Double.NaN, StructurePrior.SIZE, 2, false),
                Arguments.of(ScoreKind.K2, 1.0, Double.NaN, StructurePrior.UNIFORM, 3, false),
                Arguments.of(ScoreKind.K2, 1.0, Double.NaN, StructurePrior.SIZE, 4, false),
                Arguments.of(ScoreKind.BDEU, 1.0, 4.5, StructurePrior.UNIFORM, 4, false),
                Arguments.of(ScoreKind.BDEU, 10.0, 0.25, StructurePrior.SIZE, 2, false),
                Arguments.of(ScoreKind.BDEU, 1.0, Double.NaN, StructurePrior.SIZE, 3, true),
                Arguments.of(ScoreKind.K2, 1.0, Double.NaN, StructurePrior.UNIFORM, 2, true));
    }

    @ParameterizedTest
    @MethodSource("cases")
    void closedFormEqualsEnumeration(ScoreKind kind, double storedEss, double queryEss, StructurePrior prior,
                                     int d, boolean constrained) {
        List<Variable> vars = HeldOutData.variables(ARITIES);
        int[][] rows = HeldOutData.table(90_417L + d, 70, ARITIES);
        ScoreStore store = InMemoryTally.tally(vars, rows, d, FamilyScore.of(kind, storedEss));
        int n = vars.size();
        boolean[][] forbidden = new boolean[n][n];
        boolean[][] required = new boolean[n][n];
        List<EdgeRule> forbid = List.of();
        List<EdgeRule> require = List.of();
        if (constrained) {
            // v0 -> v1 forbidden, v2 -> v4 required (v2 is first in the order)
            forbidden[0][1] = true;
            required[2][4] = true;
            forbid = List.of(new EdgeRule("v0", "v1"));
            require = List.of(new EdgeRule("v2", "v4"));
        }
        ScoringOptions opts = new ScoringOptions(kind, queryEss, prior, forbid, require);
        OrderPosterior op = OrderPosterior.of(LocalScores.build(store, opts), ORDER);
        double ess = Double.isNaN(queryEss) ? storedEss : queryEss;

        List<BruteForce.Dag> dags = BruteForce.dags(vars, rows, ORDER, d, kind == ScoreKind.K2, ess,
                prior == StructurePrior.SIZE ? BruteForce.Prior.SIZE : BruteForce.Prior.UNIFORM,
                constrained ? forbidden : null, constrained ? required : null);
        double[] w = new double[dags.size()];
        double[] lp = new double[dags.size()];
        int best = 0;
        for (int g = 0; g < w.length; g++) {
            w[g] = dags.get(g).logWeight();
            lp[g] = dags.get(g).logPrior();
            if (w[g] > w[best]) {
                best = g;
            }
        }
        double z = BruteForce.logSumExp(w);
        // Evidence, modular convention (Koivisto & Sood 2004): log Σ_G ρ(G) P(D|G).
        assertEquals(z, op.result().logEvidence(), 1e-9, "logEvidence");
        // Normalised: the prior renormalised over the DAGs consistent with the order.
        assertEquals(z - BruteForce.logSumExp(lp), op.result().logEvidenceNormalized(), 1e-9, "logEvidenceNormalized");
        for (int from = 0; from < n; from++) {
            for (int to = 0; to < n; to++) {
                double p = 0;
                for (int g = 0; g < w.length; g++) {
                    if (from != to && dags.get(g).has(from, to)) {
                        p += Math.exp(w[g] - z);
                    }
                }
                assertEquals(p, op.result().edgePosterior()[from][to], 1e-9, "edge v" + from + " -> v" + to);
            }
        }
        // Parent-set posteriors: marginals of the enumerated DAG posterior.
        LocalScores ls = op.scores();
        for (int child = 0; child < n; child++) {
            for (int s = 0; s < ls.setCount(child); s++) {
                int[] set = ls.parents(child, s);
                double p = 0;
                for (int g = 0; g < w.length; g++) {
                    if (java.util.Arrays.equals(dags.get(g).parents()[child], set)) {
                        p += Math.exp(w[g] - z);
                    }
                }
                assertEquals(p, op.setPosteriors()[child][s], 1e-9, "parent set of v" + child);
            }
        }
        // The best network is the enumerated argmax (the sum factorises, so does the argmax).
        int[] bestSets = op.bestSets();
        for (int child = 0; child < n; child++) {
            assertArrayEquals(dags.get(best).parents()[child], ls.parents(child, bestSets[child]), "best parents of v" + child);
        }
    }
}
