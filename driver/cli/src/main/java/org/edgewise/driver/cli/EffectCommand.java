package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.edgewise.driver.Checks;
import org.edgewise.driver.UserError;
import org.edgewise.driver.analysis.Averaging;
import org.edgewise.driver.analysis.EffectAnalysis;
import org.edgewise.driver.analysis.EffectQuestions;
import org.edgewise.driver.analysis.Scoring;
import org.edgewise.driver.report.ConvergenceAdvice;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.result.ResultJson;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code effect}: P(target | do(x = a), D) averaged over structures and parameters, with the cautions. */
@Command(name = "effect", mixinStandardHelpOptions = true,
        description = {"P(target | do(x = a), D): what setting variables would do, averaged over structures (given order, or unknown orders with --method exact|mcmc) and parameters.",
                "Prints the probability, the reference intervention (--versus) and the difference, the probability of no effect, a 95%% credible interval, the observational P(target | x = a) beside it, and the assumptions."})
public final class EffectCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Mixin
    AveragingOptions averaging = new AveragingOptions();

    @Option(names = "--do", paramLabel = "x=a[,z=c]", description = "the intervention: variables set to states") String doText;

    @Option(names = "--target", paramLabel = "y=b", description = "the outcome whose probability is asked") String targetText;

    @Option(names = "--given", paramLabel = "w=e", description = "evidence observed after the intervention (a ratio of truncated joints; may be a descendant of x)") String givenText;

    @Option(names = "--versus", paramLabel = "x=a0", description = "the reference intervention on the same variables: adds difference and ratio") String versusText;

    @Option(names = "--questions", paramLabel = "FILE", description = "CSV with columns do,target[,given][,versus]: one question per row") Path questionsFile;

    @Option(names = "--cases", hidden = true, paramLabel = "FILE", description = "renamed --questions")
    String oldCases;

    @Option(names = "--effect-draws", paramLabel = "N", defaultValue = "" + EffectAnalysis.DEFAULT_DRAWS,
            description = "(DAG, parameter) draws for the effect's credible interval and histogram (default ${DEFAULT-VALUE})") int effectDraws;

    @Option(names = "--max-hidden-states", paramLabel = "N", defaultValue = "1000000",
            description = "refuse when the hidden ancestors of the target need more joint states than this (default ${DEFAULT-VALUE})") long maxHiddenStates;

    @Mixin
    OutputOptions output = new OutputOptions();


    @Option(names = "--format", paramLabel = "table|json", defaultValue = "table", description = "standard output: readable lines (default) or JSON") String format;

    @Override
    public Integer call() {
        if (oldCases != null) {
            throw new UserError("effect's file of questions is --questions FILE (--cases is predict's file of cases): "
                    + "give --questions " + oldCases);
        }
        String fmt = Output.format(format, "table", "json");
        output.check();
        if (averaging.scoring.ess.size() > 1) {
            throw new UserError("effect takes one --ess value, got " + averaging.scoring.ess.size());
        }
        if (questionsFile != null && (doText != null || targetText != null || givenText != null || versusText != null)) {
            throw new UserError("--questions excludes --do, --target, --given and --versus: put them in the file's columns");
        }
        Checks.atMost(effectDraws, Checks.MAX_EFFECT_DRAWS, "--effect-draws", "each draw is kept in memory");
        Scoring scoring = averaging.scoring();
        Averaging what = averaging.averaging("effect", false, true);
        // a fixed run's length is set; the target would only judge a verdict, and effect's verdict is R-hat's alone
        Checks.notApplicable(what.mcseTarget() != null && what.steps() != null && what.rhatTarget() == null, CliNames.MCSE_TARGET,
                "to a fixed run in effect (--steps without --rhat-target)", "it sets when a run until converged stops");
        List<EffectAnalysis.Question> qs = questionsFile == null
                ? List.of(new EffectAnalysis.Question(doText, targetText, givenText, versusText, ""))
                : EffectQuestions.read(questionsFile, "--questions");
        List<EffectResult> rs = EffectAnalysis.run(scoring, what, qs, effectDraws, maxHiddenStates, ProgressBars.onTerminal());
        for (EffectResult r : rs) {
            if (Boolean.FALSE.equals(r.converged())) {
                spec.commandLine().getErr().println(String.format(Locale.ROOT,
                        "effect: WARNING: the chains have not converged (largest split-R-hat %.3f, target < 1.01; and every edge "
                                + "posterior needs MCSE <= its target): the effect is not reliable; "
                                + ConvergenceAdvice.runLonger(what.steps() != null && what.rhatTarget() == null ? "steps" : null,
                                CliNames.RUN), r.maxRhat()));
                break;
            }
        }
        Object json = questionsFile == null ? rs.get(0) : new EffectResult.Batch(rs);
        if (output.out != null) {
            output.writeJson(json);
        }
        PrintWriter w = spec.commandLine().getOut();
        if (fmt.equals("json")) {
            if (output.out == null) {
                w.println(ResultJson.toJson(json));
            }
        } else {
            for (EffectResult r : rs) {
                table(w, r);
            }
            w.println("Assumptions: " + String.join("; ", EffectAnalysis.ASSUMPTIONS) + ".");
            w.println(EffectAnalysis.NOTE);
        }
        w.flush();
        return 0;
    }

    private static void table(PrintWriter w, EffectResult r) {
        String y = text(r.target()) + (r.given() == null ? "" : " | " + text(r.given()));
        String sep = r.given() == null ? " | " : ", ";
        w.printf(Locale.ROOT, "P(%s%sdo(%s)) = %.4f  (%s%s; method %s, %s)%n", y, sep, text(r.intervention()), r.probability(),
                r.estimate(), r.estimate().equals("exact") ? "" : String.format(Locale.ROOT, ", MCSE %.2g", r.mcse()),
                r.method(), r.dagPrior() == null ? "given order" : r.dagPrior() + " DAG prior");
        if (r.versus() != null) {
            w.printf(Locale.ROOT, "P(%s%sdo(%s)) = %.4f%n", y, sep, text(r.versus().intervention()), r.versus().probability());
            w.printf(Locale.ROOT, "difference %.4f, ratio %.4f; %.0f%% credible interval of the difference [%.4f, %.4f]%n",
                    r.difference(), r.ratio(), 100 * r.interval().level(), r.interval().lower(), r.interval().upper());
            w.printf(Locale.ROOT, "observational (conditioning, not setting): P(%s | %s) - P(%s | %s) = %.4f%n", y,
                    text(r.intervention()), y, text(r.versus().intervention()), r.observational().difference());
        } else {
            w.printf(Locale.ROOT, "%.0f%% credible interval [%.4f, %.4f]; observational P(%s | %s) = %.4f%n",
                    100 * r.interval().level(), r.interval().lower(), r.interval().upper(), y, text(r.intervention()),
                    r.observational().probability());
        }
        w.printf(Locale.ROOT, "probability of no effect (no directed path from %s to the outcome): %.4f (%s)%n",
                String.join(",", r.intervention().keySet()), r.noPathProbability(), r.noPathEstimate());
    }

    private static String text(Map<String, String> m) {
        List<String> parts = new ArrayList<>();
        m.forEach((k, v) -> parts.add(k + "=" + v));
        return String.join(",", parts);
    }
}
