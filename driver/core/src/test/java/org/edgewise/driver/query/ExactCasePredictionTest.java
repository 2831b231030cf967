package org.edgewise.driver.query;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * Exact single-case prediction over unknown orders, Z(D ∪ x) / Z(D), checked against two
 * independent computations: (1) the mixture over every one of the n! orders enumerated, each
 * order's predictive in closed form ({@link OrderMixture#exact} on {@link UnknownOrderPrediction#allowedOrders},
 * no tail skipped) — brute force over orders; (2) the predictive recount identity
 * P(x | D) = P(D, x) / P(D) (Bayes' rule): the case appended to the table, the table tallied again
 * by the reference {@link InMemoryTally}, and both exact order sums taken ({@link ExactOrderSum}).
 * And (3) normalisation: the probabilities of all joint states sum to 1.
 */
class ExactCasePredictionTest {
    static final int[] ARITIES = {2, 3, 2, 2, 3};

    static int[] decode(int code, int[] arities) {
        int[] x = new int[arities.length];
        for (int v = arities.length - 1; v >= 0; v--) {
            x[v] = code % arities[v];
            code /= arities[v];
        }
        return x;
    }

    @Test
    void equalsBruteForceOverOrdersAndTheRecount() {
        for (String kind : new String[] {"bdeu", "k2"}) {
            FamilyScore fs = FamilyScore.of(ScoreKind.parse(kind), kind.equals("bdeu") ? 2.5 : 1.0);
            List<Variable> vars = HeldOutData.variables(ARITIES);
            int[][] rows = HeldOutData.table(77_001L, 60, ARITIES);
            ScoreStore store = InMemoryTally.tally(vars, rows, 2, fs);
            LocalScores ls = LocalScores.build(store, ScoringOptions.asStored());
            OrderConstraints oc = OrderConstraints.none(ARITIES.length);
            ExactCasePrediction exact = new ExactCasePrediction(ls, oc);
            OrderMixture all = OrderMixture.exact(ls, org.edgewise.driver.posterior.ExactOrders.allowedOrders(oc, ARITIES.length), 0, 1_000_000);
            assertEquals(120, all.size(), "5! orders");
            double logZ = ExactOrderSum.run(ls, oc).logOrderSum();
            for (int[] x : new int[][] {{0, 0, 0, 0, 0}, {1, 2, 1, 0, 2}, {0, 1, 1, 1, 0}, {1, 0, 0, 1, 1}}) {
                double lp = exact.logProbability(x);
                assertEquals(all.logProbability(x), lp, 1e-9, kind + " brute force over orders");
                ScoreStore plus = InMemoryTally.tally(vars, HeldOutData.plus(rows, x), 2, fs);
                double logZplus = ExactOrderSum.run(LocalScores.build(plus, ScoringOptions.asStored()), oc).logOrderSum();
                assertEquals(logZplus - logZ, lp, 1e-9, kind + " recount P(D, x) / P(D)");
            }
        }
    }

    /** With tiers (v3 before everything else): the same identities over the allowed orders only. */
    @Test
    void respectsTiers() {
        List<Variable> vars = HeldOutData.variables(ARITIES);
        int[][] rows = HeldOutData.table(77_002L, 50, ARITIES);
        FamilyScore fs = FamilyScore.of(ScoreKind.BDEU, 1.0);
        LocalScores ls = LocalScores.build(InMemoryTally.tally(vars, rows, 2, fs), ScoringOptions.asStored());
        OrderConstraints oc = OrderConstraints.of(ls, List.of(List.of("v3"), List.of("v0", "v1", "v2", "v4")));
        ExactCasePrediction exact = new ExactCasePrediction(ls, oc);
        OrderMixture all = OrderMixture.exact(ls, org.edgewise.driver.posterior.ExactOrders.allowedOrders(oc, ARITIES.length), 0, 1_000_000);
        assertEquals(24, all.size(), "4! orders with v3 first");
        int[] x = {1, 1, 0, 1, 2};
        assertEquals(all.logProbability(x), exact.logProbability(x), 1e-9);
        LocalScores plus = LocalScores.build(InMemoryTally.tally(vars, HeldOutData.plus(rows, x), 2, fs), ScoringOptions.asStored());
        assertEquals(ExactOrderSum.run(plus, OrderConstraints.of(plus, List.of(List.of("v3"), List.of("v0", "v1", "v2", "v4"))))
                .logOrderSum() - exact.logZ(), exact.logProbability(x), 1e-9);
    }

    /** The exact predictor (structure-modular, no constraints) over a held-out table of {@code rows} rows, BDeu ESS 1, d = 2. */
    private static ExactCasePrediction predictor(long seed, int rows) {
        List<Variable> vars = HeldOutData.variables(ARITIES);
        LocalScores ls = LocalScores.build(InMemoryTally.tally(vars, HeldOutData.table(seed, rows, ARITIES), 2,
                FamilyScore.of(ScoreKind.BDEU, 1.0)), ScoringOptions.asStored());
        return new ExactCasePrediction(ls, OrderConstraints.none(ARITIES.length));
    }

    /** A predictive distribution sums to 1 over the 2·3·2·2·3 = 72 joint states. */
    @Test
    void sumsToOne() {
        ExactCasePrediction exact = predictor(77_003L, 40);
        double[] lp = new double[72];
        for (int code = 0; code < 72; code++) {
            lp[code] = exact.logProbability(decode(code, ARITIES));
        }
        assertEquals(0.0, LogSum.of(lp), 1e-9);
    }

    @Test
    void refusesHiddenVariables() {
        ExactCasePrediction exact = predictor(77_004L, 30);
        UserError e = assertThrows(UserError.class, () -> exact.logProbability(new int[] {0, CaseParser.HIDDEN, 1, 0, 0}));
        assertEquals("ExactCasePrediction needs every variable observed; v1 is hidden", e.getMessage());
    }
}
