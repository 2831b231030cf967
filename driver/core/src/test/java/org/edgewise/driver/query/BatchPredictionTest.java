package org.edgewise.driver.query;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;

/** The parallel batch predictor against one-by-one prediction (an independent loop over the same cases). */
class BatchPredictionTest {
    static final int[] ARITIES = {2, 3, 2, 3};
    static final int[] ORDER = {1, 3, 0, 2};
    static final int H = CaseParser.HIDDEN;

    static OrderPosterior posterior() {
        ScoreStore s = InMemoryTally.tally(HeldOutData.variables(ARITIES), HeldOutData.table(7, 200, ARITIES), 2,
                FamilyScore.withDefaults());
        return OrderPosterior.of(LocalScores.build(s, ScoringOptions.asStored()), ORDER);
    }

    /** 3,000 random cases, about a third of the cells hidden. */
    static int[][] cases(long seed) {
        Random r = new Random(seed);
        int[][] out = new int[3000][ARITIES.length];
        for (int[] c : out) {
            for (int v = 0; v < c.length; v++) {
                c[v] = r.nextInt(3) == 0 ? H : r.nextInt(ARITIES[v]);
            }
        }
        return out;
    }

    @Test
    void everyCaseEqualsItsOneByOnePrediction() {
        OrderPosterior op = posterior();
        CasePredictor avg = CasePredictor.averaged(op, 0);
        CasePredictor best = CasePredictor.bestNetwork(op);
        int[][] cases = cases(11);
        int[] given = {H, H, H, 1};
        for (int[] g : new int[][] {null, given}) {
            BatchPrediction.Result r = BatchPrediction.run(avg, best, cases, g, ProgressListener.NONE);
            for (int i = 0; i < cases.length; i++) {
                double a = g == null ? avg.logProbability(cases[i]) : avg.logConditional(cases[i], g);
                double b = g == null ? best.logProbability(cases[i]) : best.logConditional(cases[i], g);
                assertEquals(a, r.averaged()[i], 0.0, "case " + i);
                assertEquals(b, r.best()[i], 0.0, "case " + i);
            }
        }
    }

    @Test
    void progressCountsEveryCase() {
        OrderPosterior op = posterior();
        List<Long> seen = new ArrayList<>();
        String[] task = new String[1];
        long[] total = new long[1];
        ProgressListener p = new ProgressListener() {
            @Override
            public void start(String t, long n) {
                task[0] = t;
                total[0] = n;
            }

            @Override
            public synchronized void done(long done) {
                seen.add(done);
            }
        };
        BatchPrediction.run(CasePredictor.averaged(op, 0), CasePredictor.bestNetwork(op), cases(3), null, p);
        assertEquals("predict", task[0]);
        assertEquals(3000, total[0]);
        assertEquals(3000L, seen.get(seen.size() - 1));
        assertEquals(4, seen.size(), "every 1,000 cases, then the end");
    }

    @Test
    void aUserMistakeNamesTheCase() {
        OrderPosterior op = posterior();
        CasePredictor avg = CasePredictor.averaged(op, 0).withMaxHiddenStates(2);
        int[][] cases = {{0, 0, 0, 0}, {H, H, 0, 0}};
        UserError e = assertThrows(UserError.class,
                () -> BatchPrediction.run(avg, CasePredictor.bestNetwork(op), cases, null, ProgressListener.NONE));
        assertTrue(e.getMessage().startsWith("case 2: summing out hidden variables "), e.getMessage());
    }
}
