package org.edgewise.driver.query;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.commons.math3.distribution.BetaDistribution;
import org.edgewise.driver.BruteForce;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * P(target | a row's other cells) given an order, against brute force: every DAG consistent with the
 * order enumerated and weighted by its marginal likelihood ({@link BruteForce}, the sequential
 * predictive form, sharing no code with the family score), the joint of every complete case under
 * each, and the conditional as Σ over the completions with y = k over Σ over all completions (the
 * definition of a conditional probability). The interval over (DAG, θ) draws against the Beta
 * quantiles of a root's Dirichlet posterior (Commons Math).
 */
class TargetPredictionTest {
    static final int[] ARITIES = {2, 3, 2, 3};
    static final int[] ORDER = {1, 3, 0, 2};
    static final int H = CaseParser.HIDDEN;
    static final int TARGET = 1;

    final List<Variable> vars = HeldOutData.variables(ARITIES);
    final int[][] rows = HeldOutData.table(19_004L, 60, ARITIES);
    final ScoreStore store = InMemoryTally.tally(vars, rows, 2, FamilyScore.of(ScoreKind.parse("bdeu"), 1.0));
    final Manifest m = store.manifest();

    @TempDir
    Path dir;

    CasePredictor model() {
        return CasePredictor.averaged(OrderPosterior.of(LocalScores.build(store, ScoringOptions.asStored()), ORDER), 0);
    }

    /** Σ_G P(G | D, ≺) P(x | G, D) for every complete case x, by enumeration. */
    double[] bruteJoint() {
        List<BruteForce.Dag> dags = BruteForce.dags(vars, rows, ORDER, 2, false, 1.0, BruteForce.Prior.UNIFORM, null, null);
        double[] lw = new double[dags.size()];
        for (int g = 0; g < lw.length; g++) {
            lw[g] = dags.get(g).logWeight();
        }
        double z = BruteForce.logSumExp(lw);
        double[] joint = new double[36];
        for (int c = 0; c < joint.length; c++) {
            int[] x = decode(c);
            for (int g = 0; g < lw.length; g++) {
                joint[c] += Math.exp(lw[g] - z + BruteForce.logPredictive(vars, rows, dags.get(g).parents(), false, 1.0, x));
            }
        }
        return joint;
    }

    static int[] decode(int c) {
        int[] x = new int[ARITIES.length];
        for (int v = 0; v < x.length; v++) {
            x[v] = c % ARITIES[v];
            c /= ARITIES[v];
        }
        return x;
    }

    /** P(y = k | e) from the enumerated joint. */
    static double[] bruteConditional(double[] joint, int[] e) {
        double[] p = new double[ARITIES[TARGET]];
        double total = 0;
        for (int c = 0; c < joint.length; c++) {
            int[] x = decode(c);
            boolean ok = true;
            for (int v = 0; v < x.length; v++) {
                ok &= e[v] == H || e[v] == x[v];
            }
            if (ok) {
                p[x[TARGET]] += joint[c];
                total += joint[c];
            }
        }
        for (int k = 0; k < p.length; k++) {
            p[k] /= total;
        }
        return p;
    }

    TargetCases read(String text, int[] given, String truthColumn) throws Exception {
        Path f = Files.writeString(dir.resolve("cases.csv"), text);
        CaseTable t = CaseTable.read(f, m, "cases", truthColumn, true);
        return TargetCases.of(t, m, TARGET, given, f, truthColumn, InputNames.API);
    }

    static String[] where(int n) {
        String[] w = new String[n];
        java.util.Arrays.fill(w, "row");
        return w;
    }

    @Test
    void conditionalEqualsBruteForceAndTheTruthIsNotEvidence() throws Exception {
        TargetCases tc = read("v3,v1,v0\ns2,s0,s1\n,s1,s0\ns0,,\n,,s1\ns1,s2,\n,,\n", null, null);
        TargetPrediction.Result r = TargetPrediction.run(model(), tc, 3, where(6), ProgressListener.NONE);
        double[] joint = bruteJoint();
        int[][] evidence = {{1, H, H, 2}, {0, H, H, H}, {H, H, H, 0}, {1, H, H, H}, {H, H, H, 1}, {H, H, H, H}};
        for (int i = 0; i < evidence.length; i++) {
            assertArrayEquals(bruteConditional(joint, evidence[i]), r.probability()[i], 1e-9, "row " + (i + 1));
        }
        assertArrayEquals(new int[] {0, 1, -1, -1, 2, -1}, tc.truth(), "truths from the target's own column; blank: none");
        assertEquals(2, tc.scored() - 1, "three rows carry a truth");
        assertArrayEquals(new int[] {2, 3, 4, 5, 6, 7}, tc.lineNumbers());
        assertEquals(null, r.mcse(), "exact given an order: no Monte Carlo error");
        // the row's own cell of the target changes nothing: it is the truth, never evidence
        TargetCases same = read("v3,v1,v0\ns2,s0,s1\ns2,s2,s1\ns2,,s1\n", null, null);
        double[][] p = TargetPrediction.run(model(), same, 3, where(3), ProgressListener.NONE).probability();
        assertArrayEquals(p[0], p[1], 0.0);
        assertArrayEquals(p[0], p[2], 0.0);
    }

    /**
     * Over a list of DAGs (a saved sample's path): the one-pass conditional equals the brute-force
     * mixture (1/K) Σ_g P(x | G_g) of the enumerated joint per DAG, and each state's value and MCSE
     * equal the general conditional and MCSE of {@link DagMixture} (two computations of one formula).
     */
    @Test
    void overAListOfDagsEqualsTheMixtureOfTheirJoints() throws Exception {
        List<BruteForce.Dag> all = BruteForce.dags(vars, rows, ORDER, 2, false, 1.0, BruteForce.Prior.UNIFORM, null, null);
        int[][][] dags = {all.get(0).parents(), all.get(all.size() / 2).parents(), all.get(all.size() - 1).parents(),
                all.get(all.size() - 1).parents()};
        DagMixture mix = new DagMixture(store, FamilyScore.of(ScoreKind.parse("bdeu"), 1.0), dags, null, 0, 1 << 20,
                InputNames.API, "test");
        double[] joint = new double[36];
        for (int c = 0; c < joint.length; c++) {
            for (int[][] g : dags) {
                joint[c] += Math.exp(BruteForce.logPredictive(vars, rows, g, false, 1.0, decode(c))) / dags.length;
            }
        }
        TargetCases tc = read("v3,v1,v0\ns2,s0,s1\n,s1,s0\n,,\n", null, null);
        TargetPrediction.Result r = TargetPrediction.run(mix, tc, 3, where(3), ProgressListener.NONE);
        int[][] evidence = {{1, H, H, 2}, {0, H, H, H}, {H, H, H, H}};
        for (int i = 0; i < evidence.length; i++) {
            assertArrayEquals(bruteConditional(joint, evidence[i]), r.probability()[i], 1e-9, "row " + (i + 1));
            for (int k = 0; k < 3; k++) {
                int[] t = TargetPrediction.single(TARGET, k, 4);
                assertEquals(Math.exp(mix.logConditional(t, evidence[i])), r.probability()[i][k], 1e-12);
                assertEquals(mix.mcse(t, evidence[i]), r.mcse()[i][k], 1e-12);
            }
        }
        assertTrue(r.mcse()[0][0] > 0, "different DAGs disagree: a positive Monte Carlo error");
    }

    @Test
    void givenIsAddedToEveryRow() throws Exception {
        int[] given = {H, H, 1, H};
        TargetCases tc = read("v3,v1,v0\ns2,s0,s1\n,,\n", given, null);
        TargetPrediction.Result r = TargetPrediction.run(model(), tc, 3, where(2), ProgressListener.NONE);
        double[] joint = bruteJoint();
        assertArrayEquals(bruteConditional(joint, new int[] {1, H, 1, 2}), r.probability()[0], 1e-9);
        assertArrayEquals(bruteConditional(joint, new int[] {H, H, 1, H}), r.probability()[1], 1e-9);
    }

    @Test
    void truthColumnOfItsOwn() throws Exception {
        TargetCases tc = read("v0,truth,v1\ns1,s2,s0\ns0,,s1\n", null, "truth");
        assertArrayEquals(new int[] {2, -1}, tc.truth(), "the truth column wins over the target's own; blank: none");
        assertEquals("truth", tc.truthFrom());
        assertEquals(H, tc.evidence()[0][TARGET]);
    }

    @Test
    void refusals() throws Exception {
        Path f = dir.resolve("cases.csv");
        assertEquals(f + ": line 3, column 2 (truth): variable 'v1' has no state 's9' (valid states: s0, s1, s2)",
                assertThrows(UserError.class, () -> read("v0,truth\ns0,s1\ns1,s9\n", null, "truth")).getMessage());
        assertEquals(f + ": line 1: no column 'nope' (columns: v0, v1)",
                assertThrows(UserError.class, () -> read("v0,v1\ns0,s1\n", null, "nope")).getMessage());
        assertEquals("the truth column v0 is the variable v0, not the target v1; name the column that holds the true states of v1",
                assertThrows(UserError.class, () -> read("v0,v1\ns0,s1\n", null, "v0")).getMessage());
        assertEquals(f + ": line 3, column 1: v0=s1 contradicts given v0=s0",
                assertThrows(UserError.class, () -> read("v0,v1\ns0,s1\ns1,s0\n", new int[] {0, H, H, H}, null)).getMessage());
        assertEquals("given observes the target v1; a prediction of it cannot be conditioned on it",
                assertThrows(UserError.class, () -> read("v0\ns0\n", new int[] {H, 2, H, H}, null)).getMessage());
        assertEquals(f + ": line 2, column 1: variable 'v0' has no state 'x' (valid states: s0, s1)",
                assertThrows(UserError.class, () -> read("v0,v1\nx,s1\n", null, null)).getMessage());
        assertEquals(f + ": no row to predict (only the header)",
                assertThrows(UserError.class, () -> read("v0,v1\n", null, null)).getMessage());
    }

    /**
     * A root's probability under one DAG is its parameter, θ ~ Dirichlet(N_k + α): with two states,
     * P(y = s1 | θ) ~ Beta(N_1 + α, N_0 + α) (the Dirichlet's marginal). The interval's ends are its
     * quantiles (Commons Math's BetaDistribution) within four of their Monte Carlo errors.
     */
    @Test
    void intervalOfARootIsItsBetaPosterior() throws Exception {
        int[][] dag = {{}, {0}, {1}, {2}};
        Path f = Files.writeString(dir.resolve("root.csv"), "v0\ns1\n");
        CaseTable t = CaseTable.read(f, m, "cases", null, true);
        TargetCases tc = TargetCases.of(t, m, 0, null, f, null, InputNames.API);
        double level = 0.9;
        PredictionDraws.Interval iv = PredictionDraws.run(store, FamilyScore.of(ScoreKind.parse("bdeu"), 1.0), new int[][][] {dag},
                null, 4000, 7L, level, tc, 2, 1 << 20, where(1), "test", "limit");
        FamilyCounts root = InMemoryTally.count(vars, rows, 0, new int[0]);
        double alpha = 1.0 / 2; // BDeu: ESS / (q r) with q = 1, r = 2
        BetaDistribution beta = new BetaDistribution(root.counts()[1] + alpha, root.counts()[0] + alpha);
        double tol = 4 * iv.endpointMcse();
        assertTrue(iv.endpointMcse() > 0 && iv.endpointMcse() < 0.01, "mcse " + iv.endpointMcse());
        assertEquals(beta.inverseCumulativeProbability((1 - level) / 2), iv.lower()[0][1], tol);
        assertEquals(beta.inverseCumulativeProbability((1 + level) / 2), iv.upper()[0][1], tol);
        assertEquals(1 - iv.upper()[0][1], iv.lower()[0][0], 1e-9, "P(s0) = 1 − P(s1) in every draw");
    }
}
