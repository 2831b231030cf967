package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.edgewise.driver.Checks;
import org.edgewise.driver.ErrorReport;
import org.edgewise.driver.UserError;
import org.edgewise.driver.analysis.Averaging;
import org.edgewise.driver.analysis.PredictionAnalysis;
import org.edgewise.driver.analysis.Scoring;
import org.edgewise.driver.result.ResultJson;
import org.edgewise.driver.result.TargetPredictions;
import org.edgewise.driver.score.DagPrior;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code predict}: probability of a new case (or of a table of cases) given the data and an
 * order, averaged over every DAG consistent with the order, and under the single best network.
 */
@Command(name = "predict", mixinStandardHelpOptions = true,
        description = {"P(case | D, order) averaged over every network consistent with a given order (--order), or also over unknown orders (--method exact|mcmc), and under the single best network.",
                "Variables left out of a case are hidden and summed out; --given makes it a conditional P(case | given, D, order).",
                "--method exact with the default --dag-prior structure-modular is exact over every DAG, as Z(D + case) / Z(D): "
                        + "one exact structure-modular sum (3^n terms) per case and per joint state of its hidden variables "
                        + "(fast for n <= ~16). --method mcmc samples partitions (structure-modular, the default) or orders "
                        + "(--dag-prior order-modular) and mixes the sampled ones, each averaged over its DAGs in closed form: "
                        + "sampled, with a Monte Carlo standard error.",
                "--cases FILE --target VAR scores a table of held-out cases: per row P(VAR = each state | the row's other cells), "
                        + "with held-out log loss, Brier score, AUC and calibration where the rows carry the truth (--truth-column, "
                        + "or VAR's own column), and an --interval over draws of a network and its parameters."})
public final class PredictCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Mixin
    AveragingOptions averaging = new AveragingOptions();

    @Option(names = "--case", paramLabel = "a=x,b=y", description = "one case; variables left out are hidden") String caseText;

    @Option(names = "--given", paramLabel = "c=z", description = "evidence: report P(case | given) (with --cases: for every row)") String givenText;

    @Option(names = "--cases", paramLabel = "FILE", description = "CSV of cases: header = variable names, blank cells hidden") Path casesFile;

    @Mixin
    OutputOptions output = new OutputOptions();


    @Option(names = "--format", paramLabel = "table|json|csv", description = "one case: readable lines (default) or JSON; "
            + "with --target: a readable table (default; with --out: csv), the JSON result, or the per-row CSV") String format;

    @Option(names = "--target", paramLabel = "VAR", description = "with --cases: per row P(VAR = each state | the row's other cells "
            + "and --given), averaged like every prediction; VAR's own column, when present, is never evidence (it is the truth)")
    String target;

    @Option(names = "--truth-column", paramLabel = "COL", description = "with --target: the column of --cases holding the true "
            + "states of the target (default: the target's own column when present); adds held-out log loss, Brier score, AUC "
            + "and calibration tables over the rows that have one")
    String truthColumn;

    @Option(names = "--interval", paramLabel = "LEVEL", description = "with --target: per probability a central LEVEL interval "
            + "(e.g. 0.95) over draws of a DAG and its parameters from their posteriors (sampled)")
    Double interval;

    /** Default of {@code --interval-draws}. */
    static final int DEFAULT_INTERVAL_DRAWS = 400;

    @Option(names = "--interval-draws", paramLabel = "N", description = "draws of a DAG and its parameters the --interval is taken "
            + "over (default " + DEFAULT_INTERVAL_DRAWS + ")")
    Integer intervalDraws;

    /** Default of {@code --tail-mass}. */
    static final double DEFAULT_TAIL_MASS = 1e-12;

    @Option(names = "--tail-mass", paramLabel = "E",
            description = "per variable, skip the least probable parent sets whose combined posterior is at most E and renormalise (default "
                    + DEFAULT_TAIL_MASS + "; 0 = exact; not with --method exact --dag-prior structure-modular, exact over every DAG)")
    Double tailMass;

    @Option(names = "--max-hidden-states", paramLabel = "N", defaultValue = "1000000",
            description = "refuse a case whose hidden variables need more joint states than this to sum out (default ${DEFAULT-VALUE})")
    long maxHiddenStates;

    @Option(names = "--exact-cases", description = "with --method exact: each complete case exactly, as Z(D + case) / Z(D) "
            + "(one exact sum over all orders per case, --dag-prior order-modular) instead of mixing sampled orders when n >= 8")
    boolean exactCases;

    @Override
    public Integer call() {
        output.check();
        if ((caseText == null) == (casesFile == null)) {
            throw new UserError("give exactly one of --case a=x,b=y or --cases FILE");
        }
        if (averaging.scoring.ess.size() > 1) {
            throw new UserError("predict takes one --ess value, got " + averaging.scoring.ess.size());
        }
        String fmt = format == null ? "table" : format.toLowerCase(Locale.ROOT);
        if (!fmt.equals("json") && !fmt.equals("table") && !(fmt.equals("csv") && target != null)) {
            throw new UserError("--format must be table or json" + (target != null ? " or csv" : " (csv: with --cases --target)")
                    + ", got '" + format + "'");
        }
        Checks.notApplicable(target != null && casesFile == null, "--target", "without --cases",
                "it predicts the target for every row of a table of cases");
        Checks.notApplicable(truthColumn != null && target == null, "--truth-column", "without --target",
                "it names the column of the target's true states");
        Checks.notApplicable(interval != null && target == null, "--interval", "without --target",
                "it is an interval of each row's predicted probabilities of the target");
        Checks.notApplicable(intervalDraws != null && interval == null, "--interval-draws", "without --interval",
                "it sets how many draws the interval is taken over");
        Checks.notApplicable(exactCases && target != null, "--exact-cases", "with --target",
                "it computes the joint probability of complete cases; a prediction of the target conditions on the rest of each row");
        if (interval != null && !(interval > 0 && interval < 1)) {
            throw new UserError("--interval must be a probability strictly between 0 and 1 (e.g. 0.95), got " + interval);
        }
        int draws = intervalDraws == null ? DEFAULT_INTERVAL_DRAWS : intervalDraws;
        if (draws < 10 || draws > Checks.MAX_EFFECT_DRAWS) {
            throw new UserError("--interval-draws must be between 10 and " + Checks.MAX_EFFECT_DRAWS + ", got " + draws);
        }
        double tail = tailMass == null ? DEFAULT_TAIL_MASS : tailMass;
        if (!(tail >= 0 && tail < 1)) {
            throw new UserError("--tail-mass must be in [0, 1), got " + tailMass);
        }
        if (maxHiddenStates < 1) {
            throw new UserError("--max-hidden-states must be at least 1, got " + maxHiddenStates);
        }
        Scoring scoring = averaging.scoring();
        Averaging what = averaging.averaging("prediction", false, interval != null);
        String meth = what.method().name().toLowerCase(Locale.ROOT);
        Checks.notApplicable(exactCases && what.method() != Averaging.Method.EXACT, "--exact-cases", "with --method " + meth,
                "it computes the exact sum over all orders (--method exact)");
        Checks.notApplicable(exactCases && givenText != null, "--exact-cases", "with --given",
                "a conditional needs P(given | D), a sum over the hidden variables");
        Checks.notApplicable(exactCases && what.dagPrior() == DagPrior.STRUCTURE_MODULAR, "--exact-cases", "with --dag-prior structure-modular",
                "every case is already exact there, Z(D + case) / Z(D) over all DAGs");
        Checks.notApplicable(tailMass != null && what.method() == Averaging.Method.EXACT && what.dagPrior() == DagPrior.STRUCTURE_MODULAR,
                "--tail-mass", "with --method exact --dag-prior structure-modular", "no parent set is skipped in the exact sum over every DAG");
        Checks.notApplicable(tailMass != null && what.sample() != null, "--tail-mass", "with --sample",
                "each saved DAG is used with its own parents; no parent set is skipped");
        PredictionAnalysis.Target scoring0 = target == null ? null
                : new PredictionAnalysis.Target(target, truthColumn, interval, draws);
        PredictionAnalysis.Answer a = PredictionAnalysis.run(new PredictionAnalysis.Request(scoring, what, caseText, casesFile,
                givenText, tail, maxHiddenStates, exactCases, scoring0), ProgressBars.onTerminal());
        PrintWriter err = spec.commandLine().getErr();
        boolean allow = averaging.unknown.allowUnconverged;
        if (a.diagnostics() != null && !a.diagnostics().converged()) {
            err.println(UnknownOrderEdges.notConverged("predict", a.diagnostics(), allow));
        }
        int status = ErrorReport.finished(a.diagnostics() == null ? null : a.diagnostics().converged(), allow);
        if (a.scored() != null) {
            String as = format == null && output.out != null ? "csv" : fmt;
            String text = switch (as) {
                case "json" -> ResultJson.toJson(a.scored()) + "\n";
                case "csv" -> a.csv();
                default -> String.join("\n", a.lines()) + "\n";
            };
            output.write(spec, text);
            if (output.out != null) {
                TargetPredictions t = a.scored();
                err.println("predict: wrote " + output.out + " (" + as + ", " + t.rows() + " rows" + (t.scores() == null ? ""
                        : String.format(Locale.ROOT, "; over %d rows with a truth: log loss %.4f, Brier %.4f, AUC %s", t.scoredRows(),
                        t.scores().logLoss(), t.scores().brier(), t.scores().auc() == null ? "undefined"
                                : String.format(Locale.ROOT, "%.4f", t.scores().auc()))) + ")");
            }
            return status;
        }
        if (a.csv() != null) {
            for (String line : a.lines()) {
                err.println("predict: " + line + (what.method() == Averaging.Method.EXACT
                        ? "; --exact-cases computes complete cases exactly" : ""));
            }
            output.write(spec, a.csv());
            return status;
        }
        if (output.out != null) {
            output.writeJson(a.prediction());
            if (format == null) {
                return status;
            }
        }
        PrintWriter w = spec.commandLine().getOut();
        if (fmt.equals("json")) {
            w.println(ResultJson.toJson(a.prediction()));
        } else {
            for (String line : a.lines()) {
                w.println(line);
            }
        }
        w.flush();
        return status;
    }
}
