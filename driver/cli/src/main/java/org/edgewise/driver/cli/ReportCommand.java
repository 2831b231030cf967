package org.edgewise.driver.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.NetworkReader;
import org.edgewise.driver.Checks;
import org.edgewise.driver.report.CalibrationSection;
import org.edgewise.driver.report.DotWriter;
import org.edgewise.driver.report.EdgeMatrix;
import org.edgewise.driver.report.EdgeRecovery;
import org.edgewise.driver.report.EffectSection;
import org.edgewise.driver.report.HtmlReport;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.UserError;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.ResultJson;
import org.edgewise.driver.result.TargetPredictions;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code report}: a self-contained HTML report (or the consensus graph as DOT) from a result. */
@Command(name = "report", mixinStandardHelpOptions = true,
        description = "Write a self-contained HTML report of an edges result (heatmap, consensus graph, parent sets, "
                + "convergence and chain traces, ESS sensitivity, provenance, cautions), or the consensus graph as DOT; "
                + "of a predict --target result, its held-out scores and calibration curves.")
final class ReportCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Option(names = "--result", paramLabel = "FILE", description = "result JSON of edges, or of predict --target "
            + "(then a page of held-out scores and calibration curves)") Path result;

    @Option(names = "--effect", paramLabel = "FILE", description = "result JSON of effect: adds an interventions section (alone: a page of its own)") Path effect;

    @Option(names = "--truth", paramLabel = "FILE", description = "a known network (network JSON) to mark and compare against") Path truth;

    @Mixin
    OutputOptions output = new OutputOptions();


    @Option(names = "--threshold", defaultValue = "0.5", paramLabel = "T",
            description = "consensus graph: edges with posterior > T (default ${DEFAULT-VALUE})")
    double threshold;

    @Option(names = "--format", defaultValue = "html", paramLabel = "html|dot", description = "output format (default ${DEFAULT-VALUE})") String format;

    @Override
    public Integer call() {
        String fmt = Output.format(format, "html", "dot");
        CompareCommand.checkThreshold(threshold);
        if (result == null && effect == null) {
            throw new UserError("give --result FILE (an edges result), --effect FILE (an effect result), or both");
        }
        output.check();
        if (result != null && TargetPredictions.KIND.equals(ResultJson.kind(result))) {
            String why = "a " + TargetPredictions.KIND + " result has no edges";
            Checks.notApplicable(fmt.equals("dot"), "--format dot", "with a " + TargetPredictions.KIND + " result", why + " to draw");
            Checks.notApplicable(effect != null, "--effect", "with a " + TargetPredictions.KIND + " result", "give it with an edges result");
            Checks.notApplicable(truth != null, "--truth", "with a " + TargetPredictions.KIND + " result", why + " to compare");
            Checks.notApplicable(spec.commandLine().getParseResult().hasMatchedOption("--threshold"), "--threshold", "with a " + TargetPredictions.KIND + " result",
                    why + " to draw a consensus graph from");
            output.write(spec, CalibrationSection.page(ResultJson.readTargetPredictions(result), result.getFileName().toString()));
            if (output.out != null) {
                spec.commandLine().getErr().println("report: wrote " + output.out);
            }
            return 0;
        }
        if (result == null) {
            if (fmt.equals("dot")) {
                throw new UserError("--format dot needs --result (an edges result)");
            }
            output.write(spec, EffectSection.page(EffectResult.read(effect), effect.getFileName().toString()));
            return 0;
        }
        // planned before the whole result is read: reading and rendering grow as n × n
        org.edgewise.driver.report.TooLargeToReport.check(Math.max(0, ResultJson.variableCount(result)),
                Runtime.getRuntime().maxMemory());
        EdgeResult r = ResultJson.readEdges(result);
        Network net = truth == null ? null : NetworkReader.read(truth);
        String name = result.getFileName().toString();
        String text;
        if (fmt.equals("dot")) {
            EdgeMatrix m = EdgeMatrix.of(r);
            text = DotWriter.write(r, threshold, net == null ? null : EdgeRecovery.truthMatrix(m, net, truth.toString()), CliNames.ASSESS);
        } else {
            text = HtmlReport.render(r, name, net, truth == null ? null : truth.getFileName().toString(), threshold, CliNames.ASSESS, CliNames.RUN,
                    effect == null ? null : EffectResult.read(effect));
        }
        output.write(spec, text);
        if (output.out != null) {
            spec.commandLine().getErr().println("report: wrote " + output.out);
        }
        return 0;
    }
}
