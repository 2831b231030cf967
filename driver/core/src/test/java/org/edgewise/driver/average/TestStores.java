package org.edgewise.driver.average;

import java.util.List;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;

/** Small stores for the unknown-order tests, tallied with the reference {@link InMemoryTally}. */
final class TestStores {
    private TestStores() {
    }

    static ScoreStore random(int n, int arity, int d, int rows, long seed) {
        Network net = RandomNetwork.generate("v", n, arity, 2, n, 1.5, 0, seed);
        return InMemoryTally.tally(RandomNetwork.variables(net), new ForwardSampler(net).sample(rows, seed + 1), d,
                FamilyScore.withDefaults());
    }

    /** The same store with every stored score multiplied by {@code factor} (e.g. to reach −10⁶). */
    static ScoreStore scaled(ScoreStore s, double factor) {
        double[] sc = s.logScores();
        for (int k = 0; k < sc.length; k++) {
            sc[k] *= factor;
        }
        return new ScoreStore(s.manifest(), s.families(), sc);
    }

    static LocalScores scores(ScoreStore s) {
        return LocalScores.build(s, ScoringOptions.asStored());
    }

    static LocalScores scores(ScoreStore s, List<EdgeRule> forbid, List<EdgeRule> require) {
        return LocalScores.build(s, new ScoringOptions(null, Double.NaN, null, forbid, require));
    }
}
