package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.edgewise.driver.UserError;
import org.edgewise.driver.analysis.ExportAnalysis;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/** {@code export}: one network from a saved posterior sample, with posterior-mean tables, as network JSON. */
@Command(name = "export", mixinStandardHelpOptions = true,
        description = {"Writes one network taken from a saved posterior sample — its highest-posterior DAG, or the consensus "
                + "graph (edges of posterior above 0.5) when it is acyclic — with posterior-mean probability tables from the "
                + "store's counts, as network JSON: what simulate, compare and report --truth read.",
                "The averaged edges themselves: edges --sample DIR --out result.json (JSON), then report --result result.json "
                        + "--format dot (DOT)."})
public final class ExportCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Mixin
    ScoringMixin scoring = new ScoringMixin();

    @Mixin
    SampleOption saved = new SampleOption();

    @Option(names = "--structure", paramLabel = "best|consensus", defaultValue = "best",
            description = "best: the sample's DAG of highest posterior score; consensus: every edge of posterior above 0.5, "
                    + "refused when that graph has a cycle (default ${DEFAULT-VALUE})")
    String structure;

    @Option(names = "--format", paramLabel = "network-json", defaultValue = "network-json",
            description = "output format (default ${DEFAULT-VALUE}; the averaged edges as JSON or DOT come from edges and report)")
    String format;

    @Mixin
    OutputOptions output = new OutputOptions();

    @Override
    public Integer call() {
        output.check();
        if (saved.sample == null) {
            throw new UserError("export needs --sample DIR: the network is taken from a posterior sample saved by the sample command");
        }
        scoring.refuseWithSample("the saved DAGs were drawn once, with the scoring the sample records; the tables use it too");
        String f = format.toLowerCase(Locale.ROOT);
        if (f.equals("json") || f.equals("dot")) {
            throw new UserError("--format " + f + ": export writes a network (network-json); the averaged edges come from edges "
                    + "--sample DIR --out result.json, and as DOT from report --result result.json --format dot");
        }
        if (!f.equals("network-json")) {
            throw new UserError("--format must be network-json, got '" + format + "'");
        }
        ExportAnalysis.Exported e = ExportAnalysis.run(scoring.scoring(), saved.sample,
                ExportAnalysis.Structure.parse(structure, "--structure"));
        output.write(spec, e.json());
        if (output.out != null) {
            PrintWriter w = spec.commandLine().getOut();
            w.println("export: wrote " + output.out + ": " + e.network().size() + " variables, " + e.network().edges().size()
                    + " edges; " + e.summary());
            w.flush();
        }
        return 0;
    }
}
