package org.edgewise.driver.analysis;

import java.util.List;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.VariableOrder;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.store.ScoreStore;

/**
 * A request's inputs, read and checked once for every service: the store, the given order (null
 * over unknown orders), a saved sample (null when none), and the scoring options each run uses —
 * the sample's own when one is given, else the request's (several ESS values: a sweep).
 */
record Inputs(ScoreStore store, int[] order, SampleFile.Loaded saved, List<ScoringOptions> options) {
    static Inputs of(Scoring scoring, Averaging averaging) {
        ScoreStore store = scoring.read();
        int[] order = averaging.order() == null ? null
                : VariableOrder.parse(store.manifest(), averaging.order(), scoring.names().order());
        SampleFile.Loaded saved = averaging.saved(store, scoring.store());
        List<ScoringOptions> options = saved == null ? scoring.options()
                : List.of(saved.info().scoring().options(scoring.names()));
        return new Inputs(store, order, saved, options);
    }

    /** The inputs of a request that answers from the saved sample {@code sample} alone (its scoring, no order). */
    static Inputs ofSample(Scoring scoring, java.nio.file.Path sample) {
        ScoreStore store = scoring.read();
        SampleFile.Loaded saved = SampleFile.read(sample, store.manifest(), scoring.store());
        return new Inputs(store, null, saved, List.of(saved.info().scoring().options(scoring.names())));
    }

    /** The local scores under the first scoring options (the only ones where no sweep applies). */
    LocalScores scores() {
        return LocalScores.build(store, options.get(0));
    }
}
