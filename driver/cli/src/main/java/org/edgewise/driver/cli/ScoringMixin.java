package org.edgewise.driver.cli;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.Checks;
import org.edgewise.driver.analysis.Scoring;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.score.StructurePrior;
import org.edgewise.driver.store.EdgeRule;
import picocli.CommandLine.Option;

/** Options every averaging command shares: the store, score, ESS, prior and query-time constraints. */
public final class ScoringMixin {
    @Option(names = "--store", required = true, paramLabel = "DIR", description = "score store written by tally") public Path store;

    @Option(names = "--score", paramLabel = "bdeu|k2", description = "family score (default: as stored); another one is rescored from the stored counts") public String score;

    @Option(names = "--ess", paramLabel = "A[,B…]", split = ",", description = "BDeu equivalent sample size (default: as stored); several values run a sensitivity sweep where supported") public List<Double> ess = new ArrayList<>();

    @Option(names = "--prior", paramLabel = "uniform|size", defaultValue = "uniform", description = "structure prior on parent sets: uniform, or size = 1/C(n-1,|U|) (Koivisto & Sood 2004); default ${DEFAULT-VALUE}") public String prior;

    @Option(names = "--forbid", paramLabel = "a->b", split = ",", description = "edges to forbid at query time (comma-separated or repeated)") public List<String> forbid = new ArrayList<>();

    @Option(names = "--require", paramLabel = "a->b", split = ",", description = "edges to require at query time") public List<String> require = new ArrayList<>();

    /**
     * The store and scoring asked for. Every ESS value is checked first, so a typed {@code --ess NaN}
     * is refused like any other bad ESS, never read as "as stored".
     */
    public Scoring scoring() {
        for (double given : ess) {
            Checks.ess(given, "--ess");
        }
        return new Scoring(store, score == null ? null : ScoreKind.parse(score), ess, StructurePrior.parse(prior),
                rules(forbid, "--forbid"), rules(require, "--require"), CliNames.NAMES);
    }

    /** Refuses the scoring options with {@code --sample} (the sample records the scoring its DAGs were drawn under). */
    void refuseWithSample(String why) {
        refuseWithSample("with --sample", why);
    }

    /** As {@link #refuseWithSample(String)}, the situation worded by the caller ("on a store averaged over missing values"). */
    void refuseWithSample(String situation, String why) {
        Checks.notApplicable(score != null, "--score", situation, why);
        Checks.notApplicable(!ess.isEmpty(), "--ess", situation, why);
        Checks.notApplicable(!"uniform".equalsIgnoreCase(prior), "--prior", situation, why);
        Checks.notApplicable(!forbid.isEmpty(), "--forbid", situation, why);
        Checks.notApplicable(!require.isEmpty(), "--require", situation, why);
    }

    static List<EdgeRule> rules(List<String> texts, String option) {
        List<EdgeRule> out = new ArrayList<>();
        for (String t : texts) {
            out.add(EdgeRule.parse(t, option));
        }
        return out;
    }
}
