package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.score.StructurePrior;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreReader;

/**
 * Which store a request reads and how its families are scored: the score kind and ESS values
 * (null and empty: as stored; several ESS values make a sensitivity sweep where supported), the
 * structure prior on parent sets, query-time forbidden and required edges, and how the caller
 * names its inputs in messages.
 */
public record Scoring(Path store, ScoreKind score, List<Double> ess, StructurePrior prior, List<EdgeRule> forbid,
                      List<EdgeRule> require, InputNames names) {
    public Scoring {
        ess = ess == null ? List.of() : List.copyOf(ess);
        forbid = forbid == null ? List.of() : List.copyOf(forbid);
        require = require == null ? List.of() : List.copyOf(require);
        names = names == null ? InputNames.API : names;
    }

    /** The scoring options of every ESS value asked for (one, as stored, when none is). */
    public List<ScoringOptions> options() {
        List<ScoringOptions> out = new ArrayList<>();
        for (double e : ess.isEmpty() ? List.of(Double.NaN) : ess) {
            out.add(new ScoringOptions(score, e, prior, forbid, require, names));
        }
        return out;
    }

    /** The scoring options of the first ESS value (or the stored one). */
    public ScoringOptions first() {
        return options().get(0);
    }

    /** The store, with every integrity check ({@link StoreReader}). */
    public ScoreStore read() {
        return StoreReader.read(store);
    }
}
