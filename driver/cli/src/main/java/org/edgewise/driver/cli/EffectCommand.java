package org.edgewise.driver.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.edgewise.driver.UserError;
import org.edgewise.driver.analysis.EffectAnalysis;
import org.edgewise.driver.average.DagPrior;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.TooLargeForExact;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.VariableOrder;
import org.edgewise.driver.effect.EffectEngine;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.result.ResultJson;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreReader;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code effect}: P(target | do(x = a), D) averaged over structures and parameters, with the cautions. */
@Command(name = "effect", mixinStandardHelpOptions = true,
        description = {"P(target | do(x = a), D): what setting variables would do, averaged over structures (given order, or unknown orders with --method exact|mcmc) and parameters.",
                "Prints the probability, the reference intervention (--versus) and the difference, the probability of no effect, a 95% credible interval, the observational P(target | x = a) beside it, and the assumptions."})
public final class EffectCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Mixin
    AveragingOptions averaging = new AveragingOptions();

    @Option(names = "--do", paramLabel = "x=a[,z=c]", description = "the intervention: variables set to states") String doText;

    @Option(names = "--target", paramLabel = "y=b", description = "the outcome whose probability is asked") String targetText;

    @Option(names = "--given", paramLabel = "w=e", description = "evidence observed after the intervention (a ratio of truncated joints; may be a descendant of x)") String givenText;

    @Option(names = "--versus", paramLabel = "x=a0", description = "the reference intervention on the same variables: adds difference and ratio") String versusText;

    @Option(names = "--cases", paramLabel = "FILE", description = "CSV with columns do,target[,given][,versus]: one question per row") Path casesFile;

    @Option(names = "--effect-draws", paramLabel = "N", defaultValue = "" + EffectEngine.DEFAULT_DRAWS,
            description = "(DAG, parameter) draws for the effect's credible interval and histogram (default ${DEFAULT-VALUE})") int effectDraws;

    @Option(names = "--max-hidden-states", paramLabel = "N", defaultValue = "1000000",
            description = "refuse when the hidden ancestors of the target need more joint states than this (default ${DEFAULT-VALUE})") long maxHiddenStates;

    @Option(names = "--out", paramLabel = "FILE", description = "write the JSON result here") Path out;

    @Option(names = "--overwrite", description = "replace an existing --out file") boolean overwrite;

    @Option(names = "--format", paramLabel = "table|json", defaultValue = "table", description = "standard output: readable lines (default) or JSON") String format;

    @Override
    public Integer call() {
        String fmt = Output.format(format, "table", "json");
        Output.check(out, overwrite);
        if (averaging.scoring.ess.size() > 1) {
            throw new UserError("effect takes one --ess value, got " + averaging.scoring.ess.size());
        }
        if (casesFile != null && (doText != null || targetText != null || givenText != null || versusText != null)) {
            throw new UserError("--cases excludes --do, --target, --given and --versus: put them in the file's columns");
        }
        String meth = averaging.method.resolve("effect");
        UnknownOrderSettings settings = meth.equals("order") ? null
                : averaging.unknown.settings(UnknownOrderSettings.Method.valueOf(meth.toUpperCase(Locale.ROOT)), 0);
        DagPrior prior = settings != null ? settings.dagPrior() : DagPrior.parse(averaging.unknown.dagPrior, "--dag-prior");
        EffectEngine.Settings engine = new EffectEngine.Settings(effectDraws, averaging.unknown.seed, maxHiddenStates);
        ScoreStore store = StoreReader.read(averaging.scoring.store);
        int[] ord = averaging.method.order == null ? null : VariableOrder.parse(store.manifest(), averaging.method.order, "--order");
        List<EffectAnalysis.Question> qs = casesFile == null
                ? List.of(new EffectAnalysis.Question(doText, targetText, givenText, versusText, ""))
                : questions(casesFile);
        LocalScores ls = LocalScores.build(store, averaging.scoring.options());
        List<EffectResult> rs;
        try {
            rs = EffectAnalysis.run(new EffectAnalysis.Request(ls, ord, settings, prior, qs, engine), ProgressBars.onTerminal());
        } catch (TooLargeForExact e) {
            throw UnknownOrderEdges.tooLarge(e);
        }
        for (EffectResult r : rs) {
            if (Boolean.FALSE.equals(r.converged())) {
                spec.commandLine().getErr().println(String.format(Locale.ROOT,
                        "effect: WARNING: the chains have not converged (largest split-R-hat %.3f, target < %.2f; and every edge "
                                + "posterior needs MCSE <= its target): the effect is not reliable; " + UnknownOrderEdges.runLonger(settings),
                        r.maxRhat(), UnknownOrderEdges.RHAT_WARN));
                break;
            }
        }
        Object json = casesFile == null ? rs.get(0) : new EffectResult.Batch(rs);
        if (out != null) {
            ResultJson.write(out, json);
        }
        PrintWriter w = spec.commandLine().getOut();
        if (fmt.equals("json")) {
            if (out == null) {
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

    /** The questions of a CSV: header with {@code do} and {@code target}, optionally {@code given} and {@code versus}. */
    static List<EffectAnalysis.Question> questions(Path file) {
        if (!Files.isRegularFile(file)) {
            throw new UserError("--cases: file " + file + " does not exist");
        }
        List<String> lines;
        try {
            lines = Files.readAllLines(file, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UserError("--cases: cannot read " + file + ": " + e.getMessage());
        }
        if (lines.isEmpty()) {
            throw new UserError(file + ": empty file; the first line must be do,target[,given][,versus]");
        }
        List<String> head = CaseCsv.fields(file, 1, lines.get(0).replace("\uFEFF", ""));
        int[] col = {-1, -1, -1, -1};
        String[] names = {"do", "target", "given", "versus"};
        for (int c = 0; c < head.size(); c++) {
            String h = head.get(c).trim().toLowerCase(Locale.ROOT);
            int k = List.of(names).indexOf(h);
            if (k < 0 || col[k] >= 0) {
                throw new UserError(file + ": line 1, column " + (c + 1) + ": expected do, target, given or versus (once each), got '"
                        + head.get(c).trim() + "'");
            }
            col[k] = c;
        }
        if (col[0] < 0 || col[1] < 0) {
            throw new UserError(file + ": line 1: the header must name the columns do and target");
        }
        List<EffectAnalysis.Question> out = new ArrayList<>();
        for (int i = 1; i < lines.size(); i++) {
            if (lines.get(i).isBlank()) {
                continue;
            }
            List<String> f = CaseCsv.fields(file, i + 1, lines.get(i));
            if (f.size() != head.size()) {
                throw new UserError(file + ": line " + (i + 1) + " has " + f.size() + " fields, the header has " + head.size());
            }
            out.add(new EffectAnalysis.Question(f.get(col[0]), f.get(col[1]), col[2] < 0 ? null : f.get(col[2]),
                    col[3] < 0 ? null : f.get(col[3]), file + ": line " + (i + 1) + ": "));
        }
        if (out.isEmpty()) {
            throw new UserError(file + ": no questions after the header");
        }
        return out;
    }
}
