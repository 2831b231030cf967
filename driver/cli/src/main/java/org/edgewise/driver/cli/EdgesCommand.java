package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.edgewise.driver.ErrorReport;
import org.edgewise.driver.UserError;
import org.edgewise.driver.analysis.Averaging;
import org.edgewise.driver.analysis.EdgeAnalysis;
import org.edgewise.driver.analysis.Scoring;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.Fragility;
import org.edgewise.driver.result.ResultJson;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code edges}: model-averaged edge posteriors from {@link EdgeAnalysis}, over every DAG
 * consistent with a given order or over unknown orders; prints the result as a table or JSON.
 */
@Command(name = "edges", mixinStandardHelpOptions = true,
        description = {"Model-averaged edge posteriors, most probable parent sets and the best network, from a score store.",
                "An edge posterior is evidence of statistical dependence under the stated assumptions "
                        + "(order, in-degree bound, score, prior), not proof of causation; interpret it with domain experts."})
public final class EdgesCommand implements Callable<Integer> {
    /** Edges shown in the terminal table; JSON lists every ordered pair. */
    static final int TABLE_EDGES = 40;

    @Spec
    CommandSpec spec;

    @Mixin
    AveragingOptions averaging = new AveragingOptions();

    @Option(names = "--top-parents", paramLabel = "K", defaultValue = "5", description = "most probable parent sets listed per variable (default ${DEFAULT-VALUE})") int topParents;

    @Mixin
    OutputOptions output = new OutputOptions();


    @Option(names = "--format", paramLabel = "table|json", description = "standard output as a table (default) or JSON") String format;

    @Override
    public Integer call() {
        output.check();
        String fmt = format == null ? (output.out != null ? "json" : "table") : format.toLowerCase(Locale.ROOT);
        if (!fmt.equals("json") && !fmt.equals("table")) {
            throw new UserError("--format must be table or json, got '" + format + "'");
        }
        if (topParents < 0) {
            throw new UserError("--top-parents must be 0 or more, got " + topParents);
        }
        Scoring scoring = averaging.scoring();
        averaging.unknown.bothAllowed = true;
        Averaging what = averaging.averaging("averaging", true, false);
        PrintWriter err = spec.commandLine().getErr();
        boolean allow = averaging.unknown.allowUnconverged;
        java.util.function.Consumer<EdgeResult> warn = r -> {
            if (r.diagnostics() != null && !r.diagnostics().converged()) {
                err.println(UnknownOrderEdges.notConverged("edges", r.diagnostics(), allow));
            }
        };
        EdgeResult result = averaging.unknown.bothPriors()
                ? EdgeAnalysis.runBothPriors(scoring, what, topParents, ProgressBars.onTerminal(), warn)
                : EdgeAnalysis.run(scoring, what, topParents, ProgressBars.onTerminal(), warn);
        int status = ErrorReport.finished(result.diagnostics() == null ? null : result.diagnostics().converged(), allow);
        if (output.out != null) {
            output.writeJson(result);
            if (format == null) {
                // nothing goes to standard output: what the pruned candidates leave unsettled is said beside the file
                spec.commandLine().getErr().print(UnknownOrderEdges.candidates(result).stripLeading());
                spec.commandLine().getErr().println("edges: wrote " + output.out);
                return status;
            }
        }
        PrintWriter w = spec.commandLine().getOut();
        if (fmt.equals("json")) {
            w.println(ResultJson.toJson(result));
        } else {
            w.print(table(result, scoring.ess().size() > 1));
        }
        w.flush();
        return status;
    }

    /** The result for people: edges by posterior, top parent sets, best network, the caution. */
    static String table(EdgeResult r, boolean sweep) {
        StringBuilder sb = new StringBuilder();
        EdgeResult.Settings s = r.settings();
        sb.append(String.format(Locale.ROOT, "Edge posteriors (%s; DAG prior %s; score %s%s, prior %s, d = %d)%n",
                r.order() == null ? r.method() : "order " + String.join(" < ", r.order()),
                r.dagPrior() + (r.priorComparison() == null ? "" : ", compared with " + r.priorComparison().dagPrior()),
                s.score(), s.ess() == null ? "" : ", ESS " + num(s.ess()), s.prior(), s.maxParents()));
        if (r.logEvidence() != null) {
            if (r.logEvidenceNormalized() != null) {
                sb.append(String.format(Locale.ROOT, "log evidence %.6f (%s); with the prior renormalised per order %.6f%n",
                        r.logEvidence(), r.evidenceConvention(), r.logEvidenceNormalized()));
            } else {
                sb.append(String.format(Locale.ROOT, "log evidence %.6f (%s)%n", r.logEvidence(),
                        "structure-modular".equals(r.evidenceConvention())
                                ? "structure-modular: prior over the admitted DAGs, each counted once"
                                : r.evidenceConvention() + ", uniform prior over the allowed orders"));
            }
        }
        List<EdgeResult.Edge> sorted = new ArrayList<>(r.edges());
        sorted.sort(Comparator.comparingDouble(EdgeResult.Edge::posterior).reversed());
        int width = 4;
        for (String v : r.variables()) {
            width = Math.max(width, v.length());
        }
        if (r.order() == null) {
            sb.append(UnknownOrderEdges.adjacencies(r, width));
            sb.append(UnknownOrderEdges.compelled(r, width));
            sb.append(String.format(Locale.ROOT, "%nDirected edges P(a -> b): their directions depend on the DAG prior (%s) "
                    + "and are identifiable from the data only where compelled%n", r.dagPrior()));
        } else {
            sb.append(String.format(Locale.ROOT, "%nDirected edges P(a -> b) given the order: the order fixes every direction "
                    + "(an assumption you made, not learned from the data)%n"));
        }
        sb.append(String.format(Locale.ROOT, "  %-" + width + "s    %-" + width + "s  %9s", "from", "to", "posterior"));
        if (sweep) {
            for (EdgeResult.Sensitivity x : r.sensitivity()) {
                sb.append(String.format(Locale.ROOT, "  %9s", "ESS " + num(x.ess())));
            }
        }
        sb.append('\n');
        int shown = 0;
        for (EdgeResult.Edge e : sorted) {
            if (shown == TABLE_EDGES || e.posterior() < 0.001) {
                break;
            }
            sb.append(String.format(Locale.ROOT, "  %-" + width + "s -> %-" + width + "s  %9.4f", e.from(), e.to(), e.posterior()));
            if (sweep) {
                for (EdgeResult.Sensitivity x : r.sensitivity()) {
                    sb.append(String.format(Locale.ROOT, "  %9.4f", find(x.edges(), e.from(), e.to())));
                }
            }
            sb.append('\n');
            shown++;
        }
        sb.append(String.format(Locale.ROOT, "  (%d of %d ordered pairs shown: posterior >= 0.001, at most %d; the JSON lists every pair)%n",
                shown, sorted.size(), TABLE_EDGES));
        sb.append(fragility(r));
        sb.append(priorFragility(r));
        if (r.parentSets() != null) {
            sb.append("\nMost probable parent sets\n");
            for (EdgeResult.VariableParents vp : r.parentSets()) {
                List<String> parts = new ArrayList<>();
                for (EdgeResult.ParentSet ps : vp.top()) {
                    parts.add("{" + String.join(", ", ps.parents()) + "} " + String.format(Locale.ROOT, "%.4f", ps.posterior()));
                }
                sb.append(String.format(Locale.ROOT, "  %-" + width + "s  %s%n", vp.variable(), String.join("   ", parts)));
            }
        }
        sb.append(UnknownOrderEdges.summary(r));
        if (r.bestNetwork() != null) {
            sb.append(String.format(Locale.ROOT, "%nBest single network under the order (log score %.6f)%n", r.bestNetwork().logScore()));
            for (Map.Entry<String, List<String>> e : r.bestNetwork().parents().entrySet()) {
                sb.append(String.format(Locale.ROOT, "  %-" + width + "s  <- {%s}%n", e.getKey(), String.join(", ", e.getValue())));
            }
        }
        sb.append(r.order() != null
                ? "\nAn edge posterior is evidence of statistical dependence under the stated assumptions (this order,\n"
                        + "d, score and prior), not proof of causation. Interpret it with domain experts.\n"
                : "\nAn edge posterior is evidence of statistical dependence under the stated assumptions (d, score,\n"
                        + "prior and DAG prior), not proof of causation; even a compelled direction is causal only under\n"
                        + "further assumptions (no hidden common causes, no selection). Interpret it with domain experts.\n");
        return sb.toString();
    }

    /**
     * The fragility lines of a swept result: one line per headline edge or compelled direction whose
     * posterior crosses 0.5 within the ESS sweep, or a line saying none does; nothing without a sweep.
     */
    static String fragility(EdgeResult r) {
        List<EdgeResult.Fragile> fragile = r.fragile() != null ? r.fragile() : Fragility.of(r);
        if (fragile == null) {
            return "";
        }
        StringBuilder sb = new StringBuilder("\n");
        if (fragile.isEmpty()) {
            List<Double> ess = new ArrayList<>();
            ess.add(r.settings().ess());
            for (EdgeResult.Sensitivity x : r.sensitivity()) {
                ess.add(x.ess());
            }
            ess.sort(null);
            List<String> words = new ArrayList<>();
            for (double e : ess) {
                words.add(num(e));
            }
            return sb.append(String.format(Locale.ROOT, "no headline edge%s crosses 0.5 under the ESS sweep (ESS %s)%n",
                    r.essentialGraph() != null ? " or compelled direction" : "", String.join(", ", words))).toString();
        }
        for (EdgeResult.Fragile f : fragile) {
            sb.append("fragile under the ESS sweep: ").append(Fragility.words(f, "->")).append('\n');
        }
        return sb.append("  (a headline posterior >= 0.5 that falls below 0.5 at another ESS: the choice of ESS, not the data, settles it)\n")
                .toString();
    }

    /**
     * The lines of a result computed under both DAG priors: one per headline edge or compelled direction
     * that crosses 0.5 between them, or a line saying none does; nothing otherwise.
     */
    static String priorFragility(EdgeResult r) {
        EdgeResult.PriorComparison c = r.priorComparison();
        if (c == null) {
            return "";
        }
        StringBuilder sb = new StringBuilder("\n");
        if (c.fragile().isEmpty()) {
            return sb.append(String.format(Locale.ROOT, "no headline edge%s crosses 0.5 between the DAG priors (%s and %s)%n",
                    r.essentialGraph() != null ? " or compelled direction" : "", r.dagPrior(), c.dagPrior())).toString();
        }
        for (EdgeResult.PriorFragile f : c.fragile()) {
            sb.append("fragile between the DAG priors: ").append(Fragility.words(f, "->")).append('\n');
        }
        return sb.append("  (a posterior >= 0.5 under one DAG prior and below 0.5 under the other: the choice of prior, not the data, "
                + "settles it)\n").toString();
    }

    private static double find(List<EdgeResult.Edge> edges, String from, String to) {
        for (EdgeResult.Edge e : edges) {
            if (e.from().equals(from) && e.to().equals(to)) {
                return e.posterior();
            }
        }
        return Double.NaN;
    }

    static String num(double x) {
        return x == Math.rint(x) && Math.abs(x) < 1e15 ? Long.toString((long) x) : Double.toString(x);
    }
}
