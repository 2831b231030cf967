package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.edgewise.driver.Checks;
import org.edgewise.driver.ErrorReport;
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
                "Prints the probability, the reference intervention (--versus) with the risk difference, risk ratio and odds ratio (each with a 95%% credible interval), the probability of no effect, the model's conditional P(target | x = a) and the raw frequencies from the counts beside it, and the assumptions.",
                "A case-control sample (--design case-control --outcome y): only the odds ratio for effects on y, unless --prevalence gives y's population prevalence."})
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
            description = "the closed-form sum over an order's DAGs enumerates at most this many joint states of hidden "
                    + "ancestors (beyond it, DAGs are drawn from the same posterior and each answered exactly: sampled); one DAG's "
                    + "elimination builds no table larger than this, else it is refused (default ${DEFAULT-VALUE})") long maxHiddenStates;

    @Option(names = "--measure", paramLabel = "risk-difference|risk-ratio|odds-ratio",
            description = "the measure the text leads with when --versus is given (default risk-difference; odds-ratio under --design case-control without --prevalence)") String measure;

    @Option(names = "--design", paramLabel = "case-control",
            description = "the sample was drawn on the outcome (--outcome): effects on it are reported as odds ratios only, unless --prevalence") String design;

    @Option(names = "--outcome", paramLabel = "y", description = "with --design case-control: the variable the cases and controls were sampled on") String outcome;

    @Option(names = "--prevalence", paramLabel = "y=state:p",
            description = "with --design case-control: the outcome's population prevalence (y=p for a binary outcome: of the target's state); re-weights cases by p/p^ and controls by (1-p)/(1-p^)") String prevalence;

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
        EffectAnalysis.CaseControl cc = caseControl();
        String lead = measure == null ? null : measure.toLowerCase(Locale.ROOT);
        if (lead != null) {
            if (!EffectAnalysis.MEASURE_WORDS.contains(lead)) {
                throw new UserError("--measure must be risk-difference, risk-ratio or odds-ratio, got '" + measure + "'");
            }
            if (questionsFile == null && versusText == null) {
                throw new UserError("--measure picks among the measures that compare two interventions: give --versus x=a0");
            }
            if (cc != null && prevalence == null && !lead.equals("odds-ratio")) {
                throw new UserError("--measure " + lead + " needs --prevalence under --design case-control: risks are not estimable "
                        + "from a sample drawn on " + outcome + " (give --prevalence " + outcome + "=p, or --measure odds-ratio)");
            }
        }
        Scoring scoring = averaging.scoring();
        Averaging what = averaging.averaging("effect", false, true);
        // a fixed run's length is set; the target would only judge a verdict, and effect's verdict is R-hat's alone
        Checks.notApplicable(what.mcseTarget() != null && what.steps() != null && what.rhatTarget() == null, CliNames.MCSE_TARGET,
                "to a fixed run in effect (--steps without --rhat-target)", "it sets when a run until converged stops");
        List<EffectAnalysis.Question> qs = questionsFile == null
                ? List.of(new EffectAnalysis.Question(doText, targetText, givenText, versusText, ""))
                : EffectQuestions.read(questionsFile, "--questions");
        List<EffectResult> rs = EffectAnalysis.run(scoring, what, qs, effectDraws, maxHiddenStates, cc, lead,
                ProgressBars.onTerminal());
        boolean allow = averaging.unknown.allowUnconverged;
        Boolean converged = null;
        for (EffectResult r : rs) {
            if (Boolean.FALSE.equals(r.converged())) {
                spec.commandLine().getErr().println(String.format(Locale.ROOT,
                        "effect: WARNING: the chains have not converged (largest split-R-hat %.3f, target < 1.01; and every edge "
                                + "posterior needs MCSE <= its target): the effect is not reliable; "
                                + ConvergenceAdvice.runLonger(what.steps() != null && what.rhatTarget() == null ? "steps" : null,
                                CliNames.RUN) + ". " + UnknownOrderEdges.exitSentence(allow), r.maxRhat()));
                converged = false;
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
            w.println("Assumptions: " + String.join("; ", rs.get(0).assumptions()) + ".");
            w.println(EffectAnalysis.NOTE);
        }
        w.flush();
        return ErrorReport.finished(converged, allow);
    }

    /** The design from --design, --outcome and --prevalence, or null; refuses a partial one. */
    private EffectAnalysis.CaseControl caseControl() {
        if (design == null) {
            if (outcome != null) {
                throw new UserError("--outcome names the variable a case-control sample was drawn on: give --design case-control");
            }
            if (prevalence != null) {
                throw new UserError("--prevalence re-weights a case-control sample: give --design case-control --outcome y");
            }
            return null;
        }
        if (!design.equals("case-control")) {
            throw new UserError("--design must be case-control (a sample drawn on the outcome), got '" + design + "'");
        }
        if (outcome == null) {
            throw new UserError("--design case-control needs --outcome y: the variable the cases and controls were sampled on");
        }
        return new EffectAnalysis.CaseControl(outcome, prevalence, "--outcome", "--prevalence");
    }

    private static void table(PrintWriter w, EffectResult r) {
        String y = text(r.target()) + (r.given() == null ? "" : " | " + text(r.given()));
        String sep = r.given() == null ? " | " : ", ";
        String how = String.format(Locale.ROOT, "%s; method %s, %s", r.estimate().equals("exact") ? "exact"
                        : "from networks drawn from the posterior" + (r.probability() == null ? "" : ", Monte Carlo error " + error(r.mcse())),
                r.method(), r.dagPrior() == null ? "given order" : r.dagPrior() + " DAG prior");
        if (r.probability() != null) {
            w.printf(Locale.ROOT, "P(%s%sdo(%s)) = %.4f  (model; %s)%n", y, sep, text(r.intervention()), r.probability(), how);
            if (r.versus() != null) {
                w.printf(Locale.ROOT, "P(%s%sdo(%s)) = %.4f%n", y, sep, text(r.versus().intervention()), r.versus().probability());
            }
        } else {
            w.printf(Locale.ROOT, "effect of do(%s) versus do(%s) on %s  (model; %s)%n", text(r.intervention()),
                    text(r.versus().intervention()), y, how);
        }
        if (r.design() != null) {
            w.println(r.design().note());
        }
        if (r.versus() != null) {
            List<String[]> ms = new ArrayList<>();
            ms.add(new String[] {"riskDifference", "risk difference"});
            ms.add(new String[] {"riskRatio", "risk ratio"});
            ms.add(new String[] {"oddsRatio", "odds ratio"});
            ms.sort((a, b) -> Boolean.compare(!a[0].equals(r.leadingMeasure()), !b[0].equals(r.leadingMeasure())));
            List<String> rest = new ArrayList<>();
            for (String[] m : ms) {
                EffectResult.Measure x = switch (m[0]) {
                    case "riskDifference" -> r.riskDifference();
                    case "riskRatio" -> r.riskRatio();
                    default -> r.oddsRatio();
                };
                if (x == null) {
                    continue;
                }
                String t = measureText(m[1], x);
                if (m[0].equals(r.leadingMeasure())) {
                    w.println(t);
                } else {
                    rest.add(t);
                }
            }
            if (!rest.isEmpty()) {
                w.println("  also: " + String.join("; ", rest));
            }
            if (r.measures() != null) {
                w.println("  (" + r.measures() + ")");
            }
            if (r.observational().probability() != null) {
                w.printf(Locale.ROOT, "the model's conditional (conditioning, not setting): P(%s | %s) = %.4f, P(%s | %s) = %.4f%n",
                        text(r.target()), condition(r, r.intervention()), r.observational().probability(), text(r.target()),
                        condition(r, r.versus().intervention()), r.observational().versusProbability());
            } else if (r.observational().oddsRatio() != null) {
                w.printf(Locale.ROOT, "the model's conditional odds ratio (conditioning, not setting): %s%n",
                        num(r.observational().oddsRatio()));
            }
        } else {
            w.printf(Locale.ROOT, "%.0f%% credible interval [%.4f, %.4f]%n", 100 * r.interval().level(), r.interval().lower(),
                    r.interval().upper());
            if (r.observational().probability() != null) {
                w.printf(Locale.ROOT, "the model's conditional (conditioning, not setting): P(%s | %s) = %.4f%n", text(r.target()),
                        condition(r, r.intervention()), r.observational().probability());
            }
        }
        w.println(observedText(r));
        if (r.given() == null) {
            w.printf(Locale.ROOT, "probability of no effect (no directed path from %s to the outcome): %.4f (%s)%n",
                    String.join(",", r.intervention().keySet()), r.noPathProbability(), r.noPathEstimate());
        } else {
            // a path into the evidence counts too, so "no effect" would overstate what a path means here
            w.printf(Locale.ROOT, "probability of no directed path from %s to the outcome or to the evidence %s (then the effect "
                    + "is exactly zero): %.4f (%s); with a path, the effect within the evidence can still be near zero%n",
                    String.join(",", r.intervention().keySet()), text(r.given()), r.noPathProbability(),
                    r.noPathEstimate().equals("exact") ? "exact" : "from drawn networks, Monte Carlo error " + error(r.noPathMcse()));
        }
        if (r.split() != null) {
            w.println("why conditioning and setting differ: " + r.split().words());
        }
    }

    /** A Monte Carlo standard error in words: below 0.0001 when it is, else two significant digits. */
    private static String error(double mcse) {
        return mcse < 1e-4 ? "below 0.0001" : String.format(Locale.ROOT, "%.2g", mcse);
    }

    /** The condition of a conditional: the variable's value, then the evidence given (one bar in P(y | …)). */
    private static String condition(EffectResult r, Map<String, String> x) {
        return text(x) + (r.given() == null ? "" : "," + text(r.given()));
    }

    static String measureText(String name, EffectResult.Measure x) {
        String iv = String.format(Locale.ROOT, "%.0f%% credible interval [%s, %s]", 100 * x.interval().level(),
                num(x.interval().lower()), num(x.interval().upper()));
        if (x.noEffectProbability() != null) {
            return String.format(Locale.ROOT, "%s: probability of no effect %.4f; given an effect, median %s, %s (model's overall %s)",
                    name, x.noEffectProbability(), num(x.estimate()), iv, num(x.overallEstimate()));
        }
        return name + " " + num(x.estimate()) + (x.estimateOf().equals("model") ? "" : " (" + x.estimateOf() + ")") + ", " + iv;
    }

    private static String observedText(EffectResult r) {
        String y = text(r.target());
        EffectResult.Observed o = r.observed();
        if (o.probability() == null && o.events() == null) {
            return "raw frequencies: " + o.label();
        }
        StringBuilder s = new StringBuilder("raw frequencies from the counts (family " + o.family() + "): ");
        s.append(String.format(Locale.ROOT, "P(%s | %s) = %d/%d = %s", y, condition(r, r.intervention()), o.events(), o.rows(),
                o.probability() == null ? "undefined" : String.format(Locale.ROOT, "%.4f", o.probability())));
        if (o.versusRows() != null) {
            s.append(String.format(Locale.ROOT, ", P(%s | %s) = %d/%d = %s", y, condition(r, r.versus().intervention()), o.versusEvents(),
                    o.versusRows(), o.versusProbability() == null ? "undefined" : String.format(Locale.ROOT, "%.4f", o.versusProbability())));
        }
        if (o.oddsRatio() != null) {
            s.append(", crude odds ratio ").append(num(o.oddsRatio()));
        }
        if (o.reweighted() != null) {
            s.append(String.format(Locale.ROOT, "; re-weighted to the prevalence: %.4f", o.reweighted()));
            if (o.reweightedVersus() != null) {
                s.append(String.format(Locale.ROOT, " and %.4f", o.reweightedVersus()));
            }
        }
        if (r.design() != null && r.design().state() != null && o.reweighted() == null) {
            s.append(" (shares in the case-control sample, not population risks)");
        }
        return s.toString();
    }

    private static String num(double x) {
        // a value that rounds to zero prints as 0.0000, never "-0.0000"
        double v = Math.abs(x) < 5e-5 ? 0.0 : x;
        return String.format(Locale.ROOT, Math.abs(v) >= 100 ? "%.1f" : "%.4f", v);
    }

    private static String text(Map<String, String> m) {
        List<String> parts = new ArrayList<>();
        m.forEach((k, v) -> parts.add(k + "=" + v));
        return String.join(",", parts);
    }
}
