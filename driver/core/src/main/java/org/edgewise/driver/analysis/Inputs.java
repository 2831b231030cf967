package org.edgewise.driver.analysis;

import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.VariableOrder;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.store.MissingValues;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreReader;

/**
 * A request's inputs, read and checked once for every service: the store, the given order (null
 * over unknown orders), a saved sample (null when none), and the scoring options each run uses —
 * the sample's own when one is given, else the request's (several ESS values: a sweep).
 *
 * <p>A store whose missing values were averaged over ({@link MissingValues}) answers from the sample
 * of DAGs it holds whenever the request names no sample itself: its one completed table alone would
 * be a single imputation. A given order does not apply to it (its DAGs were drawn over all orders).
 *
 * @param averaging the request's averaging, naming the store's own sample when it answers from it; null
 *                  for a request answered from a saved sample alone ({@link #ofSample})
 */
record Inputs(ScoreStore store, int[] order, SampleFile.Loaded saved, List<ScoringOptions> options, Averaging averaging) {
    static Inputs of(Scoring scoring, Averaging averaging) {
        return of(scoring, averaging, true);
    }

    /**
     * As {@link #of(Scoring, Averaging)}; without {@code counts} a request answered from a saved sample
     * under the stored scoring reads only the store's families and scores ({@link StoreReader#readScores}):
     * it weighs the saved DAGs and needs no counts. Anything else (sampling, rescoring) reads them.
     */
    static Inputs of(Scoring scoring, Averaging averaging, boolean counts) {
        if (!counts && averaging.sample() != null) {
            Inputs light = of(scoring, averaging, StoreReader.readScores(scoring.store()));
            if (!rescores(light.store().manifest(), light.options())) {
                return light;
            }
        }
        return of(scoring, averaging, scoring.read());
    }

    /** Whether any of {@code options} scores families otherwise than the store did (then its counts are needed). */
    private static boolean rescores(Manifest m, List<ScoringOptions> options) {
        ScoreKind stored = ScoreKind.parse(m.score());
        for (ScoringOptions o : options) {
            ScoreKind kind = o.score() == null ? stored : o.score();
            if (kind.rescores(stored, m.ess(), Double.isNaN(o.ess()) ? m.ess() : o.ess())) {
                return true;
            }
        }
        return false;
    }

    private static Inputs of(Scoring scoring, Averaging averaging, ScoreStore store) {
        MissingValues mv = store.manifest().missingValues();
        if (mv != null && averaging.sample() == null) {
            if (averaging.order() != null) {
                throw new UserError("store " + scoring.store() + " is " + mv.describe() + "; its structure posterior is"
                        + " the sample of DAGs it holds, drawn over all orders, so a given order (" + scoring.names().order()
                        + ") does not apply");
            }
            averaging = averaging.withSample(scoring.store().resolve(mv.sample()));
        }
        int[] order = averaging.order() == null ? null
                : VariableOrder.parse(store.manifest(), averaging.order(), scoring.names().order());
        SampleFile.Loaded saved = averaging.saved(store, scoring.store());
        List<ScoringOptions> options = saved == null ? scoring.options()
                : List.of(saved.info().scoring().options(scoring.names()));
        return new Inputs(store, order, saved, options, averaging);
    }

    /** The inputs of a request that answers from the saved sample {@code sample} alone (its scoring, no order). */
    static Inputs ofSample(Scoring scoring, java.nio.file.Path sample) {
        ScoreStore store = scoring.read();
        SampleFile.Loaded saved = SampleFile.read(sample, store.manifest(), scoring.store());
        return new Inputs(store, null, saved, List.of(saved.info().scoring().options(scoring.names())), null);
    }

    /** The local scores under the first scoring options (the only ones where no sweep applies). */
    LocalScores scores() {
        return LocalScores.build(store, options.get(0));
    }

    /** The settings over unknown orders of this request ({@link Averaging#settings}). */
    UnknownOrderSettings settings(int topParents) {
        return averaging.settings(topParents);
    }
}
