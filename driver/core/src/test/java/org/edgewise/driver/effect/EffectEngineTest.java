package org.edgewise.driver.effect;

import static org.edgewise.driver.effect.EffectBruteForce.H;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.BruteForce;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * The effect engine given an order, against {@link EffectBruteForce}: every DAG consistent with the
 * order (enumerated by {@link BruteForce#dags}, weighted by its sequential-predictive likelihood),
 * the truncated factorisation of each by enumerating every joint state, averaged — to 1e-9.
 */
class EffectEngineTest {
    static final EffectEngine.Settings SETTINGS = new EffectEngine.Settings(200, 7L, 1_000_000L);

    record Fixture(List<Variable> vars, int[][] rows, ScoreStore store, LocalScores ls) {
        static Fixture of(long seed, int rows, int d, int... arities) {
            List<Variable> vars = HeldOutData.variables(arities);
            int[][] table = HeldOutData.table(seed, rows, arities);
            ScoreStore s = InMemoryTally.tally(vars, table, d, FamilyScore.withDefaults());
            return new Fixture(vars, table, s, LocalScores.build(s, ScoringOptions.asStored()));
        }

        EffectQuery query(String set, String target, String given, String versus) {
            return EffectQuery.parse(store.manifest(), set, target, given, versus, "", org.edgewise.driver.InputNames.API);
        }
    }

    /** Brute-force figures of one query: probability, versus, noPath, observational. */
    record Expected(double p, double pv, double noPath, double obs) {
    }

    static Expected bruteForce(Fixture f, List<int[][]> dags, double[] logW, EffectQuery q) {
        int n = f.vars().size();
        boolean[] cut = EffectEngine.flags(n, q.setVariables());
        boolean[] none = new boolean[n];
        double z = LogSum.of(logW);
        double a = 0;
        double b = 0;
        double av = 0;
        double bv = 0;
        double oa = 0;
        double ob = 0;
        double np = 0;
        for (int g = 0; g < dags.size(); g++) {
            double w = Math.exp(logW[g] - z);
            int[][] pa = dags.get(g);
            a += w * EffectBruteForce.truncated(f.vars(), f.rows(), pa, cut, q.jointCase(q.set()), 1.0);
            b += w * EffectBruteForce.truncated(f.vars(), f.rows(), pa, cut, q.givenCase(q.set()), 1.0);
            oa += w * EffectBruteForce.truncated(f.vars(), f.rows(), pa, none, q.jointCase(q.set()), 1.0);
            ob += w * EffectBruteForce.truncated(f.vars(), f.rows(), pa, none, q.givenCase(q.set()), 1.0);
            if (q.versus() != null) {
                av += w * EffectBruteForce.truncated(f.vars(), f.rows(), pa, cut, q.jointCase(q.versus()), 1.0);
                bv += w * EffectBruteForce.truncated(f.vars(), f.rows(), pa, cut, q.givenCase(q.versus()), 1.0);
            }
            np += EffectBruteForce.path(pa, q.setVariables(), EffectEngine.outcomeVariables(q)) ? 0 : w;
        }
        return new Expected(a / b, q.versus() == null ? Double.NaN : av / bv, np, oa / ob);
    }

    static void check(Expected e, Effect got) {
        assertEquals(e.p(), got.probability(), 1e-9, "probability");
        assertEquals(e.obs(), got.observational(), 1e-9, "observational");
        assertEquals(e.noPath(), got.noPath(), 1e-9, "noPath");
        if (!Double.isNaN(e.pv())) {
            assertEquals(e.pv(), got.versusProbability(), 1e-9, "versus");
            assertEquals(e.p() - e.pv(), got.difference(), 1e-9, "difference");
            assertEquals(e.p() / e.pv(), got.ratio(), 1e-9, "ratio");
        }
    }

    static void givenOrder(Fixture f, int[] order, int d, List<EffectQuery> qs) {
        List<BruteForce.Dag> dags = BruteForce.dags(f.vars(), f.rows(), order, d, false, 1.0, BruteForce.Prior.UNIFORM,
                null, null);
        List<int[][]> graphs = dags.stream().map(BruteForce.Dag::parents).toList();
        double[] logW = dags.stream().mapToDouble(BruteForce.Dag::logWeight).toArray();
        List<Effect> got = EffectEngine.overOrders(f.ls(), EffectOrders.given(order), qs, SETTINGS);
        for (int i = 0; i < qs.size(); i++) {
            Effect e = got.get(i);
            check(bruteForce(f, graphs, logW, qs.get(i)), e);
            assertTrue(e.exact() && e.noPathExact());
            assertEquals(0, e.mcse());
        }
    }

    @Test
    void givenAnOrderEqualsTheBruteForceOverItsDagsForFourVariables() {
        Fixture f = Fixture.of(12_012L, 120, 3, 2, 3, 2, 2);
        givenOrder(f, new int[] {2, 0, 1, 3}, 3, List.of(
                f.query("v1=s2", "v3=s0", null, "v1=s0"),
                f.query("v0=s1", "v3=s1", null, null),
                // evidence that may be a descendant of the intervened variable: a ratio of truncated joints
                f.query("v0=s1", "v3=s1", "v1=s2", "v0=s0"),
                f.query("v2=s0,v0=s1", "v1=s1,v3=s0", null, "v2=s1,v0=s0")));
    }

    @Test
    void givenAnOrderEqualsTheBruteForceOverItsDagsForFiveVariables() {
        Fixture f = Fixture.of(55_055L, 150, 2, 2, 2, 3, 2, 2);
        givenOrder(f, new int[] {0, 3, 1, 2, 4}, 2, List.of(
                f.query("v1=s1", "v4=s0", null, "v1=s0"),
                f.query("v3=s1", "v2=s2", "v4=s1", "v3=s0")));
    }

    @Test
    void aWeightedListOfDagsGivesTheSameAsTheOrder() {
        // Independent paths: DagEffects (one DAG at a time, enumerating hidden ancestors) over the
        // enumerated DAGs with their posterior weights vs the order-factorised CasePredictor.
        Fixture f = Fixture.of(12_012L, 120, 3, 2, 3, 2, 2);
        int[] order = {2, 0, 1, 3};
        List<BruteForce.Dag> dags = BruteForce.dags(f.vars(), f.rows(), order, 3, false, 1.0, BruteForce.Prior.UNIFORM,
                null, null);
        WeightedDags list = new WeightedDags() {
            @Override
            public int size() {
                return dags.size();
            }

            @Override
            public int[][] parents(int g) {
                return dags.get(g).parents();
            }

            @Override
            public double weight(int g) {
                return Math.exp(dags.get(g).logWeight() - dags.get(0).logWeight());
            }

            @Override
            public boolean sampled() {
                return false;
            }
        };
        List<EffectQuery> qs = List.of(f.query("v0=s1", "v3=s1", "v1=s2", "v0=s0"), f.query("v1=s2", "v3=s0", null, null));
        List<Effect> a = EffectEngine.overDags(f.ls(), list, qs, SETTINGS);
        List<Effect> b = EffectEngine.overOrders(f.ls(), EffectOrders.given(order), qs, SETTINGS);
        for (int i = 0; i < qs.size(); i++) {
            assertEquals(b.get(i).probability(), a.get(i).probability(), 1e-9);
            assertEquals(b.get(i).noPath(), a.get(i).noPath(), 1e-9);
            assertEquals(b.get(i).observational(), a.get(i).observational(), 1e-9);
        }
        assertEquals(b.get(0).difference(), a.get(0).difference(), 1e-9);
    }

    @Test
    void noDirectedPathGivesTheMarginalExactly() {
        // The target comes first in the order: no DAG consistent with it has a path v2 ⇝ v0, so
        // P(v0 | do(v2)) = P(v0 | D, ≺), the predictive marginal (Pearl 2000, §3.2: intervening on a
        // non-ancestor leaves a variable's distribution unchanged).
        Fixture f = Fixture.of(12_012L, 120, 3, 2, 3, 2, 2);
        int[] order = {0, 1, 2, 3};
        Effect e = EffectEngine.overOrders(f.ls(), EffectOrders.given(order),
                List.of(f.query("v2=s1", "v0=s1", null, "v2=s0")), SETTINGS).get(0);
        double marginal = Math.exp(org.edgewise.driver.query.CasePredictor.averaged(OrderPosterior.of(f.ls(), order), 0)
                .logProbability(new int[] {1, H, H, H}));
        assertEquals(marginal, e.probability(), 1e-12);
        assertEquals(1.0, e.noPath());
        assertEquals(0.0, e.difference(), 1e-15);
        assertEquals(1.0, e.draws().noPathShare());
        assertEquals(0.0, e.draws().lower(), 1e-15);
        assertEquals(0.0, e.draws().upper(), 1e-15);
    }

    @Test
    void theDrawsOfTheEffectCentreOnTheExactProbability() {
        // Monte Carlo vs closed form: (DAG, θ) draws — θ from the Dirichlet posteriors — have mean
        // E[P(y | do(x), G, θ)] = the exact posterior mean, within 4 standard errors.
        Fixture f = Fixture.of(55_055L, 150, 2, 2, 2, 3, 2, 2);
        EffectQuery q = f.query("v1=s1", "v4=s0", null, null);
        Effect e = EffectEngine.overOrders(f.ls(), EffectOrders.given(new int[] {0, 3, 1, 2, 4}), List.of(q),
                new EffectEngine.Settings(4000, 11L, 1_000_000L)).get(0);
        EffectDraws d = e.draws();
        double se = (d.upper() - d.lower()) / (2 * 1.96) / Math.sqrt(d.count());
        assertEquals(e.probability(), d.mean(), 4 * se + 1e-4);
        assertTrue(d.lower() <= e.probability() && e.probability() <= d.upper());
        assertEquals(4000, Arrays.stream(d.counts()).sum());
    }

    @Test
    void gammaDrawsHaveTheGammaMeanAndVariance() {
        // Gamma(a, 1) has mean a and variance a (e.g. Johnson, Kotz & Balakrishnan 1994, ch. 17);
        // 200,000 draws, within 4 standard errors of the mean (sd sqrt(a/N)).
        SplittableRandom rng = new SplittableRandom(3);
        for (double a : new double[] {0.05, 0.3, 1.0, 4.5}) {
            int n = 200_000;
            double s = 0;
            double ss = 0;
            for (int i = 0; i < n; i++) {
                double x = Math.exp(Parameters.logGamma(a, rng));
                s += x;
                ss += x * x;
            }
            double mean = s / n;
            double var = ss / n - mean * mean;
            assertEquals(a, mean, 4 * Math.sqrt(a / n), "mean, shape " + a);
            assertEquals(a, var, 0.05 * a + 4 * Math.sqrt((6 * a * a + 2 * a * a) / n), "variance, shape " + a);
        }
    }
}
