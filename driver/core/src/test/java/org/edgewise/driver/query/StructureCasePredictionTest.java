package org.edgewise.driver.query;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.BruteForce;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.givenorder.BestDagOrder;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * Exact prediction under the structure-modular DAG prior, Z(D ∪ x) / Z(D), against a brute force
 * over every DAG on 5 nodes with in-degree ≤ 2 (enumeration checked against OEIS A003024 in
 * DagEnumerationTest): P(x | D) = Σ_G P(G | D) P(x | G, D), with P(G | D) ∝ P(D | G) (uniform
 * structure-modular prior, ρ = 1) by the sequential predictive and P(x | G, D) the product of
 * posterior-mean family predictives, both counted from the rows ({@link BruteForce}: no store, no
 * LocalScores). Hidden variables are summed in the brute force by enumerating their states under
 * each DAG; the conditional is the ratio of two such sums.
 */
class StructureCasePredictionTest {
    static final int[] ARITIES = {2, 3, 2, 2, 3};
    static final int D = 2;

    record Reference(List<Variable> vars, int[][] rows, List<int[][]> dags, double[] logPost, boolean k2, double ess) {
        static Reference of(List<Variable> vars, int[][] rows, boolean k2, double ess) {
            List<int[][]> dags = new ArrayList<>();
            for (int[] pa : DagEnumeration.allDags(vars.size())) {
                int[][] parents = new int[pa.length][];
                boolean ok = true;
                for (int v = 0; v < pa.length; v++) {
                    ok &= Integer.bitCount(pa[v]) <= D;
                    int mask = pa[v];
                    parents[v] = java.util.stream.IntStream.range(0, pa.length).filter(u -> (mask >> u & 1) != 0).toArray();
                }
                if (ok) {
                    dags.add(parents);
                }
            }
            double[] lw = new double[dags.size()];
            for (int g = 0; g < lw.length; g++) {
                lw[g] = BruteForce.logLik(vars, rows, dags.get(g), k2, ess);
            }
            double z = LogSum.of(lw);
            for (int g = 0; g < lw.length; g++) {
                lw[g] -= z;
            }
            return new Reference(vars, rows, dags, lw, k2, ess);
        }

        /** Σ_G P(G | D) Σ_h P(x, h | G, D). */
        double probability(int[] x) {
            List<int[]> completions = new ArrayList<>();
            complete(x.clone(), 0, completions);
            double p = 0;
            for (int g = 0; g < dags.size(); g++) {
                double pg = 0;
                for (int[] c : completions) {
                    pg += Math.exp(BruteForce.logPredictive(vars, rows, dags.get(g), k2, ess, c));
                }
                p += Math.exp(logPost[g]) * pg;
            }
            return p;
        }

        private void complete(int[] x, int v, List<int[]> out) {
            if (v == x.length) {
                out.add(x.clone());
                return;
            }
            if (x[v] != CaseParser.HIDDEN) {
                complete(x, v + 1, out);
                return;
            }
            for (int s = 0; s < vars.get(v).arity(); s++) {
                x[v] = s;
                complete(x, v + 1, out);
            }
            x[v] = CaseParser.HIDDEN;
        }
    }

    static LocalScores scores(List<Variable> vars, int[][] rows, FamilyScore fs) {
        return LocalScores.build(InMemoryTally.tally(vars, rows, D, fs), ScoringOptions.asStored());
    }

    @Test
    void equalsTheBruteForceOverEveryDag() {
        final int h = CaseParser.HIDDEN;
        for (String kind : new String[] {"bdeu", "k2"}) {
            double ess = kind.equals("bdeu") ? 2.5 : 1.0;
            FamilyScore fs = FamilyScore.of(ScoreKind.parse(kind), ess);
            List<Variable> vars = HeldOutData.variables(ARITIES);
            int[][] rows = HeldOutData.table(88_001L, 60, ARITIES);
            Reference ref = Reference.of(vars, rows, kind.equals("k2"), ess);
            StructureCasePrediction sm = new StructureCasePrediction(scores(vars, rows, fs), OrderConstraints.none(5), 1000);
            for (int[] x : new int[][] {{0, 0, 0, 0, 0}, {1, 2, 1, 0, 2}, {0, 1, 1, 1, 0}}) {
                assertEquals(ref.probability(x), Math.exp(sm.logProbability(x)), 1e-9, kind + " complete case");
            }
            int[] withHidden = {1, h, 0, h, 2};
            assertEquals(ref.probability(withHidden), Math.exp(sm.logProbability(withHidden)), 1e-9, kind + " hidden v1, v3");
            int[] target = {h, h, 1, h, h};
            int[] given = {0, h, h, 1, h};
            double cond = ref.probability(new int[] {0, h, 1, 1, h}) / ref.probability(given);
            assertEquals(cond, Math.exp(sm.logConditional(target, given)), 1e-9, kind + " P(v2 | v0, v3)");
        }
    }

    /** A predictive distribution sums to 1 over the 2·3·2·2·3 = 72 joint states (common practice). */
    @Test
    void sumsToOne() {
        List<Variable> vars = HeldOutData.variables(ARITIES);
        StructureCasePrediction sm = new StructureCasePrediction(scores(vars, HeldOutData.table(88_002L, 40, ARITIES),
                FamilyScore.of(ScoreKind.BDEU, 1.0)), OrderConstraints.none(5), 1000);
        double[] lp = new double[72];
        for (int code = 0; code < 72; code++) {
            lp[code] = sm.logProbability(ExactCasePredictionTest.decode(code, ARITIES));
        }
        assertEquals(0.0, LogSum.of(lp), 1e-9);
        int h = CaseParser.HIDDEN;
        assertEquals(0.0, sm.logProbability(new int[] {h, h, h, h, h}), 0.0, "the empty case");
    }

    @Test
    void refusesTooManyHiddenStates() {
        List<Variable> vars = HeldOutData.variables(ARITIES);
        StructureCasePrediction sm = new StructureCasePrediction(scores(vars, HeldOutData.table(88_003L, 30, ARITIES),
                FamilyScore.of(ScoreKind.BDEU, 1.0)), OrderConstraints.none(5), 5);
        int h = CaseParser.HIDDEN;
        UserError e = assertThrows(UserError.class, () -> sm.logProbability(new int[] {0, h, 1, 0, h}));
        assertEquals("summing out hidden variables v1, v4 would enumerate 9 joint states (limit 5); "
                + "observe some of them or raise maxHiddenStates", e.getMessage());
    }

    /** The best network of {@link BestDagOrder}'s order is the highest-scoring DAG of the enumeration. */
    @Test
    void bestDagOrderGivesTheHighestScoringDag() {
        List<Variable> vars = HeldOutData.variables(ARITIES);
        int[][] rows = HeldOutData.table(88_004L, 80, ARITIES);
        FamilyScore fs = FamilyScore.of(ScoreKind.BDEU, 1.0);
        Reference ref = Reference.of(vars, rows, false, 1.0);
        int best = 0;
        for (int g = 1; g < ref.dags().size(); g++) {
            best = ref.logPost()[g] > ref.logPost()[best] ? g : best;
        }
        LocalScores ls = scores(vars, rows, fs);
        OrderPosterior op = OrderPosterior.of(ls, BestDagOrder.of(ls, OrderConstraints.none(5)));
        double lpBest = BruteForce.logLik(vars, rows, ref.dags().get(best), false, 1.0);
        int[][] mine = new int[5][];
        for (int v = 0; v < 5; v++) {
            mine[v] = ls.parents(v, op.bestSets()[v]);
        }
        assertEquals(lpBest, BruteForce.logLik(vars, rows, mine, false, 1.0), 1e-9);
    }
}
