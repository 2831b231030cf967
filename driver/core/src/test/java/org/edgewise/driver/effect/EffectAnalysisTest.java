package org.edgewise.driver.effect;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.analysis.EffectAnalysis;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.query.OrderMixture;
import org.edgewise.driver.posterior.ExactOrders;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/** The effect service over unknown orders and with constraints, against brute force and a hand computation. */
class EffectAnalysisTest {
    static final EffectEngine.Settings ENGINE = new EffectEngine.Settings(300, 5L, 1_000_000L);

    static UnknownOrderSettings exact() {
        return new UnknownOrderSettings(UnknownOrderSettings.Method.EXACT, null, 1L, 4, 1000L, null, 100, null, null, null,
                false, false, 1000, 0, DagPrior.ORDER_MODULAR, false);
    }

    static EffectResult one(LocalScores ls, int[] order, UnknownOrderSettings s, DagPrior prior, String set,
                            String target, String given, String versus) {
        UnknownOrderSettings withPrior = s == null ? null : new UnknownOrderSettings(s.method(), s.tiers(), s.seed(), s.chains(),
                s.steps(), s.burnIn(), s.draws(), s.untilRhat(), s.maxSteps(), s.maxSeconds(), s.ancestors(), s.markovBlanket(),
                s.orderSamples(), s.topParents(), prior, s.essentialGraph(), s.mcseTarget());
        return EffectAnalysis.run(new EffectAnalysis.Request(ls, order, withPrior,
                List.of(new EffectAnalysis.Question(set, target, given, versus, "")), ENGINE), ProgressListener.NONE).get(0);
    }

    @Test
    void overUnknownOrdersEqualsTheBruteForceOverAllDagsUnderTheOrderModularPrior() {
        // Every DAG on 5 nodes with in-degree ≤ 2, weighted by P(D | G) (sequential predictive) × its
        // number of linear extensions: the order-modular prior with ρ = 1 (Koivisto & Sood 2004;
        // DESIGN.md, "DAG priors over unknown orders").
        EffectEngineTest.Fixture f = EffectEngineTest.Fixture.of(77_077L, 150, 2, 2, 2, 3, 2, 2);
        List<int[][]> dags = EffectBruteForce.allDags(5, 2);
        double[] logW = new double[dags.size()];
        for (int g = 0; g < dags.size(); g++) {
            logW[g] = EffectBruteForce.logLik(f.vars(), f.rows(), dags.get(g), 1.0)
                    + Math.log(EffectBruteForce.linearExtensions(dags.get(g)));
        }
        String[][] questions = {{"v1=s1", "v4=s0", null, "v1=s0"}, {"v2=s2", "v0=s1", "v3=s1", "v2=s0"}};
        for (String[] t : questions) {
            EffectQuery q = f.query(t[0], t[1], t[2], t[3]);
            EffectEngineTest.Expected e = EffectEngineTest.bruteForce(f, dags, logW, q);
            EffectResult r = one(f.ls(), null, exact(), DagPrior.ORDER_MODULAR, t[0], t[1], t[2], t[3]);
            assertEquals(e.p(), r.probability(), 1e-9);
            assertEquals(e.pv(), r.versus().probability(), 1e-9);
            assertEquals(e.p() - e.pv(), r.difference(), 1e-9);
            assertEquals(e.noPath(), r.noPathProbability(), 1e-9);
            assertEquals(e.obs(), r.observational().probability(), 1e-9);
            assertEquals("exact", r.estimate());
            assertEquals("exact", r.noPathEstimate());
            assertEquals("order-modular", r.dagPrior());
            assertEquals(0.0, r.mcse());
        }
    }

    static UnknownOrderSettings structure(UnknownOrderSettings.Method m) {
        return new UnknownOrderSettings(m, null, 3L, 4, 20_000L, null, 100, null, null, null,
                false, false, 1000, 0, DagPrior.STRUCTURE_MODULAR, false);
    }

    @Test
    void structureModularIsWithinFourMcseOfTheBruteForceOverAllDags() {
        // Every DAG on 5 nodes with in-degree ≤ 2, weighted by P(D | G) alone (sequential predictive):
        // the structure-modular prior with ρ = 1, uniform over DAGs (Tian & He 2009; DESIGN.md). The
        // engine draws DAGs (exact draws; partition-MCMC DAGs), so it is sampled:
        // within 4 MCSE (common practice), and the MCSE must be small enough to make that a test.
        EffectEngineTest.Fixture f = EffectEngineTest.Fixture.of(77_077L, 150, 2, 2, 2, 3, 2, 2);
        List<int[][]> dags = EffectBruteForce.allDags(5, 2);
        double[] logW = new double[dags.size()];
        for (int g = 0; g < dags.size(); g++) {
            logW[g] = EffectBruteForce.logLik(f.vars(), f.rows(), dags.get(g), 1.0);
        }
        String[][] questions = {{"v1=s1", "v4=s0", null, "v1=s0"}, {"v2=s2", "v0=s1", "v3=s1", "v2=s0"}};
        for (UnknownOrderSettings.Method m : UnknownOrderSettings.Method.values()) {
            for (String[] t : questions) {
                EffectQuery q = f.query(t[0], t[1], t[2], t[3]);
                EffectEngineTest.Expected e = EffectEngineTest.bruteForce(f, dags, logW, q);
                EffectResult r = one(f.ls(), null, structure(m), DagPrior.STRUCTURE_MODULAR, t[0], t[1], t[2], t[3]);
                String what = m + " " + String.join(" ", t[0], t[1]);
                assertTrue(r.mcse() > 0 && r.mcse() < 0.01, what + " mcse " + r.mcse());
                assertEquals(e.p(), r.probability(), 4 * r.mcse(), what);
                assertEquals(e.pv(), r.versus().probability(), 4 * r.versus().mcse(), what + " versus");
                assertEquals(e.p() - e.pv(), r.difference(), 4 * r.differenceMcse(), what + " difference");
                assertEquals(e.noPath(), r.noPathProbability(), Math.max(4 * r.noPathMcse(), 1e-9), what + " noPath");
                assertEquals("sampled", r.estimate());
                assertEquals("structure-modular", r.dagPrior());
            }
        }
    }

    @Test
    void forbiddingEveryEdgeOutOfTheInterventionGivesTheMarginal() {
        // With v2 → anything forbidden there is no path from v2, so P(v0 | do(v2)) = P(v0 | D)
        // averaged over the same orders (Pearl 2000, §3.2), and noPath = 1.
        EffectEngineTest.Fixture f = EffectEngineTest.Fixture.of(77_077L, 150, 2, 2, 2, 3, 2, 2);
        List<EdgeRule> forbid = new ArrayList<>();
        for (String to : new String[] {"v0", "v1", "v3", "v4"}) {
            forbid.add(EdgeRule.parse("v2->" + to, "--forbid"));
        }
        LocalScores ls = LocalScores.build(f.store(), new ScoringOptions(null, Double.NaN, null, forbid, List.of()));
        EffectResult r = one(ls, null, exact(), DagPrior.ORDER_MODULAR, "v2=s1", "v0=s1", null, null);
        OrderMixture mix = OrderMixture.exact(ls, ExactOrders.allowedOrders(OrderConstraints.none(5), 5), 0,
                1_000_000L);
        assertEquals(Math.exp(mix.logProbability(new int[] {1, -1, -1, -1, -1})), r.probability(), 1e-12);
        assertEquals(1.0, r.noPathProbability(), 1e-12); // a sum of normalised order weights: rounding only
    }

    @Test
    void backDoorAdjustmentByHand() {
        // Pearl 2000, §3.3: with z → x, z → y, x → y (z confounds x and y), the causal effect is the
        // back-door adjustment P(y | do(x)) = Σ_z P(y | x, z) P(z). The order z, x, y with every edge
        // required leaves one DAG, so the engine must give exactly the adjustment with posterior-mean
        // parameters (BDeu, ESS 1): θ̄(z) = (N_z + 1/2)/(N + 1), θ̄(y | x, z) = (N_zxy + 1/8)/(N_zx + 1/4).
        // Counts N[z][x][y] (invented, confounded: z raises both x and y):
        int[][][] counts = {{{40, 10}, {8, 2}}, {{3, 7}, {12, 28}}};
        List<int[]> rows = new ArrayList<>();
        for (int z = 0; z < 2; z++) {
            for (int x = 0; x < 2; x++) {
                for (int y = 0; y < 2; y++) {
                    for (int c = 0; c < counts[z][x][y]; c++) {
                        rows.add(new int[] {z, x, y});
                    }
                }
            }
        }
        List<Variable> vars = HeldOutData.variables(2, 2, 2); // v0 = z, v1 = x, v2 = y
        ScoreStore s = InMemoryTally.tally(vars, rows.toArray(new int[0][]), 2, FamilyScore.withDefaults());
        List<EdgeRule> req = List.of(EdgeRule.parse("v0->v1", "--require"), EdgeRule.parse("v0->v2", "--require"),
                EdgeRule.parse("v1->v2", "--require"));
        LocalScores ls = LocalScores.build(s, new ScoringOptions(null, Double.NaN, null, List.of(), req));
        EffectResult r = one(ls, new int[] {0, 1, 2}, null, DagPrior.STRUCTURE_MODULAR, "v1=s1", "v2=s1", null, "v1=s0");
        // N = 110, N_{z=0} = 60, N_{z=1} = 50; N_{z0,x1} = 10 (y1: 2), N_{z1,x1} = 40 (y1: 28);
        // N_{z0,x0} = 50 (y1: 10), N_{z1,x0} = 10 (y1: 7).
        double pz0 = 60.5 / 111;
        double pz1 = 50.5 / 111;
        double doX1 = pz0 * (2.125 / 10.25) + pz1 * (28.125 / 40.25);
        double doX0 = pz0 * (10.125 / 50.25) + pz1 * (7.125 / 10.25);
        assertEquals(doX1, r.probability(), 1e-12);
        assertEquals(doX0, r.versus().probability(), 1e-12);
        assertEquals(doX1 - doX0, r.difference(), 1e-12);
        assertEquals(0.0, r.noPathProbability());
        // The observational contrast is larger: conditioning on x also selects z.
        assertTrue(r.observational().difference() > r.difference() + 0.1, r.observational().toString());
        assertEquals(null, r.dagPrior()); // given an order the two DAG priors coincide
        assertTrue(r.assumptions().get(0).startsWith("causal sufficiency"));
    }
}
