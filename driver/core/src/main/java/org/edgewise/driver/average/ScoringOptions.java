package org.edgewise.driver.average;

import java.util.List;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.score.StructurePrior;
import org.edgewise.driver.store.EdgeRule;

/**
 * How a query scores families: score kind and ESS (null / NaN = as stored; anything else
 * rescored from the stored counts), the structure prior, and edges forbidden or required at
 * query time on top of what the store was tallied with; and how the caller names these inputs in
 * messages ({@link InputNames}; null: {@link InputNames#API}), which travel with the options into
 * every engine.
 */
public record ScoringOptions(ScoreKind score, double ess, StructurePrior prior,
                             List<EdgeRule> forbid, List<EdgeRule> require, InputNames names) {
    public ScoringOptions {
        prior = prior == null ? StructurePrior.UNIFORM : prior;
        forbid = forbid == null ? List.of() : List.copyOf(forbid);
        require = require == null ? List.of() : List.copyOf(require);
        names = names == null ? InputNames.API : names;
    }

    /** Named as in the Java API ({@link InputNames#API}). */
    public ScoringOptions(ScoreKind score, double ess, StructurePrior prior, List<EdgeRule> forbid, List<EdgeRule> require) {
        this(score, ess, prior, forbid, require, InputNames.API);
    }

    /** Stored score and ESS, uniform prior, no extra constraints. */
    public static ScoringOptions asStored() {
        return new ScoringOptions(null, Double.NaN, StructurePrior.UNIFORM, List.of(), List.of());
    }

    public ScoringOptions withEss(double newEss) {
        return new ScoringOptions(score, newEss, prior, forbid, require, names);
    }

    public ScoringOptions withPrior(StructurePrior newPrior) {
        return new ScoringOptions(score, ess, newPrior, forbid, require, names);
    }

    /** The same options, named in messages as {@code newNames}. */
    public ScoringOptions withNames(InputNames newNames) {
        return new ScoringOptions(score, ess, prior, forbid, require, newNames);
    }
}
