package org.edgewise.driver.average;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ParentSets;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * Issue 20, point 3: a store tallied with pruned candidates where the true parent of b (a) was pruned
 * away and a noisier copy of a (c) kept in its place. Variables a, b, c, e (binary): b copies a with
 * probability 0.9, c copies a with probability 0.8, e is independent; 2,000 rows, seed 20.
 */
class CandidateBoundaryTest {
    static final int A = 0;
    static final int B = 1;
    static final int C = 2;
    static final int E = 3;
    static final List<String> NAMES = List.of("v0", "v1", "v2", "v3");

    static int[][] rows() {
        Random r = new Random(20);
        int[][] rows = new int[2000][];
        for (int k = 0; k < rows.length; k++) {
            int a = r.nextInt(2);
            int b = r.nextDouble() < 0.9 ? a : 1 - a;
            int c = r.nextDouble() < 0.8 ? a : 1 - a;
            rows[k] = new int[] {a, b, c, r.nextInt(2)};
        }
        return rows;
    }

    /**
     * A store holding, per child, every subset of its candidates up to size d (as a pruned tally
     * stores) and the extra single-parent families {@code extra[child]}; the manifest lists the candidates.
     */
    static ScoreStore store(int[][] cand, int[][] extra, int d) {
        List<Variable> vars = HeldOutData.variables(2, 2, 2, 2);
        int[][] data = rows();
        FamilyScore fs = FamilyScore.withDefaults();
        List<FamilyCounts> fams = new ArrayList<>();
        List<Double> sc = new ArrayList<>();
        Map<String, List<String>> names = new java.util.LinkedHashMap<>();
        for (int child = 0; child < 4; child++) {
            List<int[]> sets = new ArrayList<>();
            for (int size = 0; size <= Math.min(d, cand[child].length); size++) {
                sets.addAll(ParentSets.subsets(cand[child], size));
            }
            for (int x : extra[child]) {
                sets.add(new int[] {x});
            }
            for (int[] ps : sets) {
                FamilyCounts fc = InMemoryTally.count(vars, data, child, ps);
                fams.add(fc);
                sc.add(fs.logScore(fc.counts(), 2, Math.pow(2, ps.length)));
            }
            List<String> cn = new ArrayList<>();
            for (int c : cand[child]) {
                cn.add(NAMES.get(c));
            }
            names.put(NAMES.get(child), cn);
        }
        Manifest m0 = InMemoryTally.tally(vars, data, d, fs).manifest();
        Manifest m = Manifest.of(m0.program(), m0.programVersion(), m0.createdAt(), m0.input(), vars, d, names, List.of(),
                List.of(), List.of(), m0.score(), m0.ess());
        return new ScoreStore(m, fams, sc.stream().mapToDouble(Double::doubleValue).toArray());
    }

    /**
     * Each child's parent-set posterior with the child last in the order, where the closed form
     * (Buntine 1991; OrderSum) makes P(U) proportional to the set's weight — enough for a function
     * that reads set posteriors, whatever produced them.
     */
    static double[][] lastInOrder(LocalScores ls) {
        double[][] p = new double[ls.variableCount()][];
        for (int i = 0; i < p.length; i++) {
            double[] w = ls.weights(i);
            double max = java.util.Arrays.stream(w).max().orElseThrow();
            double z = 0;
            p[i] = new double[w.length];
            for (int s = 0; s < w.length; s++) {
                p[i][s] = Math.exp(w[s] - max);
                z += p[i][s];
            }
            for (int s = 0; s < w.length; s++) {
                p[i][s] /= z;
            }
        }
        return p;
    }

    @Test
    void aPrunedTrueParentFillsItsChildsCandidateSet() {
        // b's candidates {c}: the proxy alone; the others keep the true structure's neighbours
        int[][] cand = {{B}, {C}, {A}, {A}};
        LocalScores ls = LocalScores.build(store(cand, new int[4][0], 1), ScoringOptions.asStored());
        List<CandidateBoundary.Finding> f = CandidateBoundary.find(ls, lastInOrder(ls));
        List<Integer> children = f.stream().map(CandidateBoundary.Finding::child).toList();
        assertTrue(children.contains(B), f.toString());
        CandidateBoundary.Finding b = f.get(children.indexOf(B));
        assertEquals(CandidateBoundary.Rule.FILLED, b.rule());
        assertTrue(b.filledMass() > 0.99, f.toString()); // {c} explains b far better than {} (a dependence of 0.9 × 0.8)
        assertEquals(-1, b.excluded(), "no excluded single-parent family is stored: the margin rule could not act");
        // e is independent of a: the empty set wins and e's candidate set does not bind it
        assertTrue(!children.contains(E), f.toString());
    }

    /**
     * The edges result of such a store names the bound children in {@code candidateBoundary} (JSON) —
     * exact over DAGs here, where b's {c} competes with orientations through a (a's candidates {b}):
     * the children whose single candidate the posterior uses (a and c) are named, the independent e is not.
     */
    @Test
    void theEdgesResultNamesTheBoundChild() {
        int[][] cand = {{B}, {C}, {A}, {A}};
        LocalScores ls = LocalScores.build(store(cand, new int[4][0], 1), ScoringOptions.asStored());
        UnknownOrderSettings exact = new UnknownOrderSettings(UnknownOrderSettings.Method.EXACT, null, 1L, 4, null, null, 100,
                null, null, null, false, false, 1, 0, null, false);
        org.edgewise.driver.result.EdgeResult r = org.edgewise.driver.analysis.EdgeAnalysis.edges(ls, null, exact,
                org.edgewise.driver.ProgressListener.NONE);
        assertEquals(List.of("v0", "v2"), r.candidateBoundary());
        assertTrue(!r.candidateBoundary().contains("v3"), String.valueOf(r.candidateBoundary()));
        assertTrue(org.edgewise.driver.result.ResultJson.toJson(r).contains("\"candidateBoundary\""));
    }

    @Test
    void anExcludedVariableScoringAboveTheWeakestCandidateIsNamed() {
        // b's candidates {c, e} cannot be filled with d = 1; a's single-parent family is stored beside them
        int[][] cand = {{B}, {C, E}, {A}, {A}};
        int[][] extra = {{}, {A}, {}, {}};
        LocalScores ls = LocalScores.build(store(cand, extra, 1), ScoringOptions.asStored());
        List<CandidateBoundary.Finding> f = CandidateBoundary.find(ls, lastInOrder(ls));
        CandidateBoundary.Finding b = f.stream().filter(x -> x.child() == B).findFirst().orElseThrow();
        assertEquals(CandidateBoundary.Rule.NEAR_EXCLUDED, b.rule());
        assertEquals(A, b.excluded());
        assertTrue(Double.isNaN(b.filledMass()), "two candidates, d = 1: the set cannot be filled");
        assertTrue(b.gap() < -CandidateBoundary.MARGIN_NATS, "a gains far more than e, the weakest candidate: " + b);
    }

    @Test
    void anUnprunedStoreHasNoBoundaryAndAWideEnoughOneAnEmptyList() {
        ScoreStore full = InMemoryTally.tally(HeldOutData.variables(2, 2, 2, 2), rows(), 2, FamilyScore.withDefaults());
        LocalScores ls = LocalScores.build(full, ScoringOptions.asStored());
        assertNull(CandidateBoundary.find(ls, lastInOrder(ls)));
        // every variable a candidate of every other (nothing pruned away), d = 1: a set of 3 cannot be filled, nothing excluded
        int[][] all = {{B, C, E}, {A, C, E}, {A, B, E}, {A, B, C}};
        LocalScores wide = LocalScores.build(store(all, new int[4][0], 1), ScoringOptions.asStored());
        assertEquals(List.of(), CandidateBoundary.find(wide, lastInOrder(wide)));
    }
}
