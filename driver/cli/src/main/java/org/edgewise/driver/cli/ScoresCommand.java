package org.edgewise.driver.cli;

import java.nio.file.Path;
import org.edgewise.driver.Checks;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import org.edgewise.driver.CsvFields;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreReader;
import org.edgewise.driver.result.FamilyScores;
import org.edgewise.driver.result.ResultJson;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code scores}: export a store's family scores, optionally rescored from its counts. */
@Command(name = "scores", mixinStandardHelpOptions = true,
        description = "Export every family's log score (child, parents, logScore) as JSON or CSV, optionally rescored from the stored counts.")
final class ScoresCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Option(names = "--store", required = true, paramLabel = "DIR", description = "score store written by tally") Path store;

    @Option(names = "--format", defaultValue = "json", paramLabel = "json|csv", description = "output format (default ${DEFAULT-VALUE})") String format;

    @Option(names = "--score", paramLabel = "bdeu|k2", description = "rescore with this score (default: as stored)") String score;

    @Option(names = "--ess", paramLabel = "A", description = "rescore with this BDeu ESS (default: as stored)") Double ess;

    @Mixin
    OutputOptions output = new OutputOptions();


    @Override
    public Integer call() {
        output.check();
        String fmt = Output.format(format, "json", "csv");
        if (ess != null) {
            Checks.ess(ess, "--ess");
        }
        ScoreStore s = StoreReader.read(store);
        Manifest m = s.manifest();
        ScoreKind stored = ScoreKind.parse(m.score());
        ScoreKind kind = score == null ? stored : ScoreKind.parse(score);
        kind.checkEss(ess != null, "--ess");
        double e = ess == null ? m.ess() : ess;
        boolean rescore = kind.rescores(stored, m.ess(), e);
        FamilyScore fs = FamilyScore.of(kind, e);
        StringBuilder sb = new StringBuilder();
        List<FamilyScores.Family> rows = new ArrayList<>();
        if (fmt.equals("csv")) {
            sb.append("child,parents,logScore\n");
        }
        for (int f = 0; f < s.families().size(); f++) {
            FamilyCounts fc = s.family(f);
            double lp = rescore ? fs.logScore(fc.counts(), s.arity(fc.child()), s.configurations(fc.parents()))
                    : s.logScore(f);
            String child = m.variables().get(fc.child()).name();
            List<String> parents = new ArrayList<>();
            for (int p : fc.parents()) {
                parents.add(m.variables().get(p).name());
            }
            if (fmt.equals("csv")) {
                sb.append(CsvFields.quote(child)).append(',').append(CsvFields.quote(String.join(";", parents)))
                        .append(',').append(Double.toString(lp)).append('\n');
            } else {
                rows.add(new FamilyScores.Family(child, parents, lp));
            }
        }
        String text = fmt.equals("csv") ? sb.toString() : ResultJson.toJson(new FamilyScores(kind.label(), kind.reportedEss(e), rows)) + "\n";
        output.write(spec, text);
        return 0;
    }
}
