package org.edgewise.driver.average;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.query.CasePredictor;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.score.StructurePrior;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.edgewise.driver.average.givenorder.OrderPosterior;

/**
 * Rescoring from stored counts (DESIGN.md: "Rescoring under another ESS or score kind uses the
 * counts; no rescan of the data") must give what a store tallied with that score gives: evidence,
 * edge posteriors, parent-set posteriors and predictions, to 1e-9. The reference store is an
 * independent recount (InMemoryTally with that score).
 */
class RescoreTest {
    static final int[] ARITIES = {3, 2, 2, 3, 2};
    static final int[] ORDER = {4, 1, 0, 3, 2};

    @ParameterizedTest
    @CsvSource({"bdeu,1.0,bdeu,7.5,uniform", "bdeu,1.0,bdeu,0.05,size", "bdeu,4.0,k2,4.0,uniform", "k2,1.0,bdeu,2.0,size"})
    void rescoredEqualsTalliedWithThatScore(String storedKind, double storedEss, String kind, double ess, String prior) {
        List<Variable> vars = HeldOutData.variables(ARITIES);
        int[][] rows = HeldOutData.table(31_337_001L, 90, ARITIES);
        ScoreStore stored = InMemoryTally.tally(vars, rows, 3, FamilyScore.of(ScoreKind.parse(storedKind), storedEss));
        ScoreStore direct = InMemoryTally.tally(vars, rows, 3, FamilyScore.of(ScoreKind.parse(kind), ess));
        StructurePrior pr = StructurePrior.parse(prior);
        OrderPosterior a = OrderPosterior.of(LocalScores.build(stored,
                new ScoringOptions(ScoreKind.parse(kind), kind.equals("k2") ? Double.NaN : ess, pr, null, null)), ORDER);
        OrderPosterior b = OrderPosterior.of(LocalScores.build(direct, ScoringOptions.asStored().withPrior(pr)), ORDER);
        assertEquals(b.result().logEvidence(), a.result().logEvidence(), 1e-9);
        assertEquals(b.result().logEvidenceNormalized(), a.result().logEvidenceNormalized(), 1e-9);
        int n = vars.size();
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                assertEquals(b.result().edgePosterior()[i][j], a.result().edgePosterior()[i][j], 1e-9);
            }
            for (int s = 0; s < a.setPosteriors()[i].length; s++) {
                assertEquals(b.setPosteriors()[i][s], a.setPosteriors()[i][s], 1e-9);
            }
        }
        CasePredictor pa = CasePredictor.averaged(a, 0);
        CasePredictor pb = CasePredictor.averaged(b, 0);
        int h = -1;
        for (int[] x : new int[][] {{0, 1, 1, 2, 0}, {2, 0, 1, 0, 1}, {h, 1, h, 2, h}, {1, h, h, h, 0}}) {
            assertEquals(pb.logProbability(x), pa.logProbability(x), 1e-9);
        }
    }
}
