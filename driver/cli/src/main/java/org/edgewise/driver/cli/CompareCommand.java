package org.edgewise.driver.cli;

import java.nio.file.Path;
import org.edgewise.driver.UserError;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.NetworkReader;
import org.edgewise.driver.report.EdgeMatrix;
import org.edgewise.driver.report.EdgeRecovery;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.ResultJson;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code compare}: how well a result's edge posteriors recover a known network. */
@Command(name = "compare", mixinStandardHelpOptions = true,
        description = "Score a result's edge posteriors against a known network: AUROC and average precision "
                + "(directed and skeleton), structural Hamming distance, precision and recall of the consensus graph.")
final class CompareCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Option(names = "--result", required = true, paramLabel = "FILE", description = "result JSON of edges") Path result;

    @Option(names = "--truth", required = true, paramLabel = "FILE", description = "the known network (network JSON)") Path truth;

    @Option(names = "--threshold", defaultValue = "0.5", paramLabel = "T",
            description = "consensus graph: edges with posterior > T (default ${DEFAULT-VALUE})")
    double threshold;

    @Option(names = "--format", defaultValue = "table", paramLabel = "table|json", description = "output format (default ${DEFAULT-VALUE})") String format;

    @Mixin
    OutputOptions output = new OutputOptions();


    @Override
    public Integer call() {
        output.check();
        String fmt = Output.format(format, "table", "json");
        checkThreshold(threshold);
        EdgeResult r = ResultJson.readEdges(result);
        Network net = NetworkReader.read(truth);
        EdgeRecovery rec = EdgeRecovery.of(EdgeMatrix.of(r), net, truth.toString(), threshold);
        String text = fmt.equals("json") ? ResultJson.toJson(rec) + "\n" : table(rec);
        output.write(spec, text);
        return 0;
    }

    static void checkThreshold(double t) {
        if (!(t >= 0 && t < 1)) {
            throw new UserError("--threshold must be in [0, 1), got " + t);
        }
    }

    /** The figures as a table for people. */
    static String table(EdgeRecovery r) {
        StringBuilder sb = new StringBuilder();
        sb.append(String.format(Locale.ROOT, "%d variables, %d true edges; consensus graph: posterior > %s%n%n",
                r.variables(), r.trueEdges(), num(r.threshold())));
        sb.append(String.format(Locale.ROOT, "%-10s %9s %9s %8s %8s%n", "", "AUROC", "avg prec", "pos", "neg"));
        row(sb, "directed", r.directed());
        row(sb, "skeleton", r.skeleton());
        sb.append("(skeleton: unordered pairs scored ").append(r.skeletonScore()).append(")\n");
        EdgeRecovery.Consensus c = r.consensus();
        sb.append(String.format(Locale.ROOT, "%nconsensus edges %d, correctly directed %d%n", c.edges(), c.correct()));
        sb.append(String.format(Locale.ROOT, "precision %s  recall %s  (skeleton: precision %s  recall %s)%n",
                fig(c.precision()), fig(c.recall()), fig(c.skeletonPrecision()), fig(c.skeletonRecall())));
        sb.append(String.format(Locale.ROOT, "SHD %d = missing %d + extra %d + reversed %d%n",
                c.shd(), c.missing().size(), c.extra().size(), c.reversed().size()));
        list(sb, "missing", c.missing());
        list(sb, "extra", c.extra());
        list(sb, "reversed (true direction shown)", c.reversed());
        if (!r.truthOnly().isEmpty()) {
            sb.append("truth variables not in the result (left out): ").append(String.join(", ", r.truthOnly())).append('\n');
        }
        return sb.toString();
    }

    private static void row(StringBuilder sb, String name, EdgeRecovery.Ranking k) {
        sb.append(String.format(Locale.ROOT, "%-10s %9s %9s %8d %8d%n", name, fig(k.auroc()), fig(k.averagePrecision()),
                k.positives(), k.negatives()));
    }

    private static void list(StringBuilder sb, String name, List<String> edges) {
        if (!edges.isEmpty()) {
            sb.append("  ").append(name).append(": ").append(String.join(", ", edges)).append('\n');
        }
    }

    static String fig(Double v) {
        return v == null ? "n/a" : String.format(Locale.ROOT, "%.3f", v);
    }

    private static String num(double v) {
        return v == Math.rint(v) ? String.valueOf((long) v) : String.valueOf(v);
    }
}
