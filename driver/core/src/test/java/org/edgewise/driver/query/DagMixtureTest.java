package org.edgewise.driver.query;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import org.edgewise.driver.BruteForce;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.average.dag.ParentListDraws;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * A case's probability averaged over a weighted list of DAGs, where DAGs that agree on the ancestral subgraph of
 * the observed cells are computed once ({@link DagInference.Subgraph}). Source: brute force — per DAG, the joint of
 * every completion of the case under posterior-mean parameters counted from the rows ({@link BruteForce#logPredictive},
 * sharing no code with the store or the elimination), summed over the completions, then the weighted average.
 * Every DAG on 4 nodes with in-degree ≤ 2 (DagEnumeration; OEIS A003024 counts), with random weights.
 */
class DagMixtureTest {
    static final int[] ARITIES = {2, 3, 2, 3};
    final List<Variable> vars = HeldOutData.variables(ARITIES);
    final int[][] rows = HeldOutData.table(19_031L, 50, ARITIES);
    final ScoreStore store = InMemoryTally.tally(vars, rows, 2, FamilyScore.of(ScoreKind.parse("bdeu"), 1.0));

    @Test
    void averageOverDagsSharingSubgraphsEqualsBruteForce() {
        List<int[]> all = DagEnumeration.allDags(4, 2);
        int k = all.size();
        int[][][] dags = new int[k][][];
        double[] w = new double[k];
        SplittableRandom rng = new SplittableRandom(31);
        for (int g = 0; g < k; g++) {
            dags[g] = ParentListDraws.parentLists(all.get(g));
            w[g] = 0.1 + rng.nextDouble();
        }
        DagMixture mix = new DagMixture(store, FamilyScore.of(ScoreKind.parse("bdeu"), 1.0), dags, w, 0, 1 << 20,
                InputNames.API, "test");
        int h = CaseParser.HIDDEN;
        int[][] cases = {{1, h, h, h}, {h, 2, h, h}, {h, h, 0, 1}, {0, h, 1, h}, {1, 0, h, 2}, {0, 1, 1, 0}};
        boolean grouped = false;
        for (int[] x : cases) {
            Set<DagInference.Subgraph> groups = new HashSet<>();
            for (int[][] g : dags) {
                groups.add(DagInference.Subgraph.observed(g, x));
            }
            grouped |= groups.size() < k;
            double num = 0;
            double den = 0;
            for (int g = 0; g < k; g++) {
                num += w[g] * completions(dags[g], x, 0);
                den += w[g];
            }
            assertEquals(Math.log(num / den), mix.logProbability(x), 1e-12, java.util.Arrays.toString(x));
        }
        assertTrue(grouped, "some cases leave DAGs that share their relevant subgraph");
    }

    /** Σ over the completions of the hidden cells from variable {@code v} on of the brute-force joint. */
    double completions(int[][] parents, int[] x, int v) {
        if (v == x.length) {
            return Math.exp(BruteForce.logPredictive(vars, rows, parents, false, 1.0, x));
        }
        if (x[v] != CaseParser.HIDDEN) {
            return completions(parents, x, v + 1);
        }
        double s = 0;
        for (int k = 0; k < ARITIES[v]; k++) {
            int[] y = x.clone();
            y[v] = k;
            s += completions(parents, y, v + 1);
        }
        return s;
    }
}
