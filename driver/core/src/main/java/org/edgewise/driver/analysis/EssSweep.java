package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Consumer;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderPosterior;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.ResultBuilder;
import org.edgewise.driver.store.ScoreStore;

/**
 * A sensitivity sweep over the scoring options (in practice over ESS values, to which BDeu
 * results are known to be sensitive — Silander, Kontkanen &amp; Myllymäki 2007): the first options
 * give the primary result, every further one a {@link EdgeResult.Sensitivity} entry beside it.
 * One option is a plain run with no sensitivity list.
 */
public final class EssSweep {
    private EssSweep() {
    }

    /** Edge posteriors given {@code order} (variable indices, first to last) under each of {@code options}. */
    public static EdgeResult givenOrder(ScoreStore store, Path storePath, int[] order, List<ScoringOptions> options,
                                        int topParents) {
        OrderPosterior primary = null;
        List<EdgeResult.Sensitivity> sens = new ArrayList<>();
        for (ScoringOptions so : options) {
            OrderPosterior op = OrderPosterior.of(LocalScores.build(store, so), order);
            if (primary == null) {
                primary = op;
            } else {
                sens.add(ResultBuilder.sensitivity(op));
            }
        }
        return ResultBuilder.forOrder(primary, storePath, topParents, sens);
    }

    /**
     * Edge posteriors over unknown orders under each of {@code options}; {@code eachRun} sees the
     * result of every run (e.g. to warn about chains that disagree).
     */
    public static EdgeResult unknownOrder(ScoreStore store, Path storePath, List<ScoringOptions> options,
                                          UnknownOrderSettings settings, ProgressListener progress,
                                          Consumer<EdgeResult> eachRun) {
        EdgeResult primary = null;
        List<EdgeResult.Sensitivity> sens = new ArrayList<>();
        for (ScoringOptions so : options) {
            LocalScores ls = LocalScores.build(store, so);
            EdgeResult r = UnknownOrderAveraging.edges(ls, storePath, settings, progress);
            eachRun.accept(r);
            if (primary == null) {
                primary = r;
            } else {
                sens.add(new EdgeResult.Sensitivity(ls.familyScore().ess(), r.logEvidence(), r.edges()));
            }
        }
        if (sens.isEmpty()) {
            return primary;
        }
        return new EdgeResult(primary.method(), primary.variables(), primary.logEvidence(), null,
                primary.evidenceConvention(), null, primary.settings(), primary.store(), primary.edges(),
                primary.parentSets(), null, primary.diagnostics(), primary.features(), sens, primary.dagPrior(), primary.essentialGraph());
    }
}
