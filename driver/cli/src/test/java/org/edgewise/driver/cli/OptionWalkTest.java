package org.edgewise.driver.cli;

import static org.edgewise.driver.OptionWalk.failOn;
import static org.edgewise.driver.OptionWalk.judge;
import static org.edgewise.driver.OptionWalk.pick;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;
import org.edgewise.driver.ErrorReport;
import org.edgewise.driver.OptionWalk.Refused;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;
import picocli.CommandLine.Model.OptionSpec;

/**
 * Every accepted option matters (issue 18, point 5). The options are read from picocli's model of
 * {@link EdgewiseCli}, so an option added later is walked too: the walk fails until someone says
 * here which value to try. For every driver command, every visible option and every baseline of
 * the command (given order, exact, sampled, …), the command runs once as the baseline and once with
 * the option set to a non-default valid value; then either the output (standard output, the
 * {@code --out} file and the warnings on standard error, run-dependent parts masked) changes, or the command is refused with one line
 * and exit status 2. Where an option cannot change an output on this tiny store, {@link #UNCHANGED}
 * says why. Hidden options are renamed ones: each is refused with a hint naming its new name.
 */
class OptionWalkTest extends StoreFixture {
    @Override
    long seed() {
        return 18_005L;
    }

    /** A truth network over the store's variables (v0 … v4, arities 2, 3, 2, 2, 3): v0 -> v1 -> v2. */
    static final String TRUTH = "{\"edgewiseNetwork\":1,\"variables\":["
            + "{\"name\":\"v0\",\"states\":[\"s0\",\"s1\"],\"cpt\":[[0.4,0.6]]},"
            + "{\"name\":\"v1\",\"states\":[\"s0\",\"s1\",\"s2\"],\"parents\":[\"v0\"],\"cpt\":[[0.7,0.2,0.1],[0.1,0.2,0.7]]},"
            + "{\"name\":\"v2\",\"states\":[\"s0\",\"s1\"],\"parents\":[\"v1\"],\"cpt\":[[0.9,0.1],[0.5,0.5],[0.2,0.8]]},"
            + "{\"name\":\"v3\",\"states\":[\"s0\",\"s1\"],\"cpt\":[[0.5,0.5]]},"
            + "{\"name\":\"v4\",\"states\":[\"s0\",\"s1\",\"s2\"],\"cpt\":[[0.3,0.3,0.4]]}]}";

    /** Another one: v3 -> v4, v3 -> v0, the rest independent. */
    static final String TRUTH2 = "{\"edgewiseNetwork\":1,\"variables\":["
            + "{\"name\":\"v3\",\"states\":[\"s0\",\"s1\"],\"cpt\":[[0.3,0.7]]},"
            + "{\"name\":\"v4\",\"states\":[\"s0\",\"s1\",\"s2\"],\"parents\":[\"v3\"],\"cpt\":[[0.8,0.1,0.1],[0.1,0.1,0.8]]},"
            + "{\"name\":\"v0\",\"states\":[\"s0\",\"s1\"],\"parents\":[\"v3\"],\"cpt\":[[0.9,0.1],[0.2,0.8]]},"
            + "{\"name\":\"v1\",\"states\":[\"s0\",\"s1\",\"s2\"],\"cpt\":[[0.2,0.3,0.5]]},"
            + "{\"name\":\"v2\",\"states\":[\"s0\",\"s1\"],\"cpt\":[[0.6,0.4]]}]}";

    /** A baseline of a command: a label for messages and its arguments (placeholders like {@code @STORE} resolved per run). */
    record Baseline(String label, List<String> args) {
    }

    static Baseline base(String label, String... args) {
        return new Baseline(label, List.of(args));
    }

    static final String[] MCMC_FIXED = {"--method", "mcmc", "--steps", "400", "--draws", "100", "--chains", "2"};
    /** Until converged, first checked after 200 steps, stopped by the step cap. */
    static final String[] MCMC_UNTIL = {"--method", "mcmc", "--chains", "2", "--steps", "200", "--rhat-target", "1.05",
        "--max-steps", "400"};

    static String[] with(String[] a, String... b) {
        String[] all = new String[a.length + b.length];
        System.arraycopy(a, 0, all, 0, a.length);
        System.arraycopy(b, 0, all, a.length, b.length);
        return all;
    }

    /** The baselines of every driver command; each option is tried against each of its command's baselines. */
    static final Map<String, List<Baseline>> BASELINES = new LinkedHashMap<>();

    static {
        String[] st = {"--store", "@STORE"};
        for (String cmd : List.of("edges", "predict", "effect")) {
            String[] q = switch (cmd) {
                case "predict" -> with(st, "--format", "json", "--case", "v2=s1,v0=s0");
                case "effect" -> with(st, "--format", "json", "--do", "v3=s1", "--target", "v2=s0", "--effect-draws", "200");
                default -> with(st, "--format", "json");
            };
            List<Baseline> bs = new ArrayList<>();
            bs.add(base("order", with(q, "--order", ORDER)));
            bs.add(base("exact", with(q, "--method", "exact")));
            bs.add(base("exact order-modular", with(q, "--method", "exact", "--dag-prior", "order-modular")));
            bs.add(base("mcmc --steps", with(q, MCMC_FIXED)));
            if (cmd.equals("edges")) {
                bs.add(base("mcmc until converged", with(q, MCMC_UNTIL)));
            }
            bs.add(base("saved sample", with(q, "--sample", "@SAMPLE")));
            if (cmd.equals("predict")) {
                // a table of cases scored for a target, with its interval: the scoring options act here
                bs.add(base("scoring cases", with(st, "--format", "json", "--order", ORDER, "--cases", "@SCORED", "--target", "v2",
                        "--truth-column", "y", "--interval", "0.9", "--interval-draws", "40")));
            }
            BASELINES.put(cmd, bs);
        }
        BASELINES.put("scores", List.of(base("stored", st)));
        BASELINES.put("sample", List.of(base("exact", with(st, "--out", "@OUT", "--method", "exact", "--dags", "200")),
                base("order", with(st, "--out", "@OUT", "--order", ORDER, "--dags", "200"))));
        BASELINES.put("report", List.of(base("edges result", "--result", "@RESULT"),
                base("prediction result", "--result", "@PREDICTION")));
        BASELINES.put("compare", List.of(base("edges result", "--result", "@RESULT", "--truth", "@TRUTH")));
        BASELINES.put("simulate", List.of(base("truth", "--network", "@TRUTH", "--rows", "5")));
        BASELINES.put("export", List.of(base("best of a sample", "--store", "@STORE", "--sample", "@SAMPLE")));
    }

    /**
     * The non-default values tried for each option, by "command option" or by option alone; the
     * first one that differs from the baseline's own value is used; {@code null} marks a flag.
     */
    static final Map<String, List<String>> VALUES = new LinkedHashMap<>();

    static void value(String key, String... values) {
        VALUES.put(key, values.length == 0 ? java.util.Collections.singletonList(null) : List.of(values));
    }

    static {
        value("--store", "@STORE2");
        value("--score", "k2");
        value("--ess", "5");
        value("--prior", "size");
        value("--forbid", "v3->v2");
        value("--require", "v0->v2");
        value("--order", "v0,v1,v2,v3,v4");
        value("--method", "mcmc", "exact");
        value("--tiers", "v0;v1");
        value("--seed", "7");
        value("--chains", "3");
        value("--steps", "100");
        value("--burn-in", "20");
        // above the draws an until-converged run keeps anyway (max(1000, 1/(chains x 0.01^2)) per chain)
        value("--draws", "6000");
        value("--rhat-target", "1.05", "1.2");
        value("--mcse-target", "0.05");
        value("--max-steps", "800");
        value("--max-time", "60");
        value("--allow-unconverged");
        value("--features", "ancestors");
        value("--dag-samples", "500");
        value("--dag-prior", "order-modular", "structure-modular");
        value("--top-parents", "2");
        value("--out", "@OUT");
        value("--overwrite");
        value("--format", "json", "table");
        value("scores --format", "csv");
        value("predict --format", "json", "table", "csv");
        value("report --format", "dot");
        value("simulate --format", "tsv");
        value("--case", "v2=s0");
        value("--given", "v1=s0");
        value("--cases", "@CASES");
        value("--tail-mass", "0.3");
        value("predict --max-hidden-states", "2");
        value("effect --max-hidden-states", "1");
        value("--exact-cases");
        value("--do", "v3=s0");
        value("--target", "v2=s1");
        value("predict --target", "v4", "v1");
        // on the scoring baseline (truths in y) the target's own column instead: then y is an unknown column, refused
        // (ScoringCasesTest shows a truth column changing the scores)
        value("--truth-column", "v2");
        value("--interval", "0.8");
        value("--interval-draws", "30");
        value("--versus", "v3=s0");
        value("--questions", "@QUESTIONS");
        value("--effect-draws", "50");
        // refused on the baselines (no --versus; no --design): each is walked with its partners in EffectCommandTest
        value("--measure", "odds-ratio");
        value("--design", "case-control");
        value("--outcome", "v2");
        value("--prevalence", "v2=0.1");
        value("--result", "@RESULT2");
        value("--effect", "@EFFECT");
        value("report --truth", "@TRUTH");
        value("compare --truth", "@TRUTH2");
        value("--threshold", "0.2");
        value("--network", "@TRUTH2");
        value("--rows", "7");
        value("--sample", "@SAMPLE", "@SAMPLE2");
        value("--dags", "300");
        value("sample --out", "@OUTDIR");
        value("--structure", "consensus");
        value("export --format", "json");
    }

    /**
     * The options that may leave an output unchanged, by "command option baseline", each with the
     * reason it cannot change this output on the tiny store. Keep it small: an entry is a claim
     * that the option acts elsewhere. A listed option that does change the output fails the walk too
     * (the entry is stale).
     */
    static final Map<String, String> UNCHANGED = new LinkedHashMap<>();

    static {
        for (String b : List.of("exact", "order")) {
            UNCHANGED.put("sample --overwrite " + b, "each run writes a new directory; --overwrite lets it replace an existing "
                    + "sample (SavedSampleTest)");
        }
        for (String c : List.of("edges", "effect", "predict")) {
            UNCHANGED.put(c + " --allow-unconverged saved sample", "the walk's sample was drawn exactly, with no verdict; over a "
                    + "sample drawn by MCMC that ended unconverged it turns exit status 3 into 0 (UnconvergedExitTest: effect; "
                    + "SavedSampleTest: edges and predict)");
        }
        UNCHANGED.put("edges --max-time mcmc until converged", "the run stops at --max-steps within a second; a budget that "
                + "binds would make the output depend on the machine's speed (it acts through ChainRunner's deadline)");
    }

    Path store2;
    Path result;
    Path result2;
    Path effectResult;
    Path truth;
    Path truth2;
    Path cases;
    Path scored;
    Path prediction;
    Path questions;
    Path sample;
    Path sample2;
    int runs;

    @BeforeEach
    void files() throws Exception {
        store2 = dir.resolve("store2");
        CliRun.store(store2, 77L, 2);
        truth = Files.writeString(dir.resolve("truth.json"), TRUTH);
        truth2 = Files.writeString(dir.resolve("truth2.json"), TRUTH2);
        cases = Files.writeString(dir.resolve("cases.csv"), "v0,v2\ns0,s1\ns1,s0\n");
        questions = Files.writeString(dir.resolve("questions.csv"), "do,target\nv3=s1,v2=s0\n");
        // v2's own column is the truth; y another truth column; the last row has no truth of v2
        scored = Files.writeString(dir.resolve("scored.csv"), "v0,v2,v4,y\ns0,s1,s2,s0\ns1,s0,s0,s0\ns1,s1,s1,s1\ns0,,s0,s1\n");
        prediction = dir.resolve("prediction.json");
        result = dir.resolve("result.json");
        result2 = dir.resolve("result2.json");
        effectResult = dir.resolve("effect.json");
        ok(CliRun.of("edges", "--store", store.toString(), "--order", ORDER, "--out", result.toString()));
        sample = dir.resolve("sample");
        ok(CliRun.of("sample", "--store", store.toString(), "--out", sample.toString(), "--method", "exact", "--dags", "500"));
        sample2 = dir.resolve("sample2");
        ok(CliRun.of("sample", "--store", store.toString(), "--out", sample2.toString(), "--order", ORDER, "--dags", "500"));
        ok(CliRun.of("edges", "--store", store.toString(), "--method", "exact", "--out", result2.toString()));
        ok(CliRun.of("predict", "--store", store.toString(), "--order", ORDER, "--cases", scored.toString(), "--target", "v2",
                "--truth-column", "y", "--format", "json", "--out", prediction.toString()));
        ok(CliRun.of("effect", "--store", store.toString(), "--order", ORDER, "--do", "v0=s1", "--target", "v2=s0",
                "--effect-draws", "200", "--format", "json", "--out", effectResult.toString()));
    }

    static void ok(CliRun r) {
        assertEquals(0, r.status(), r.err());
    }

    /** The driver's commands as picocli sees them ({@code help} aside). */
    static Map<String, CommandLine> commands() {
        Map<String, CommandLine> all = new LinkedHashMap<>(
                EdgewiseCli.commandLine(new PrintWriter(new StringWriter()), new PrintWriter(new StringWriter())).getSubcommands());
        all.remove("help");
        return all;
    }

    @Test
    void everyCommandHasBaselines() {
        assertEquals(new TreeSet<>(commands().keySet()), new TreeSet<>(BASELINES.keySet()),
                "a new command needs its baselines in OptionWalkTest");
    }

    @Test
    void everyOptionChangesTheOutputOrIsRefused() throws Exception {
        List<String> problems = new ArrayList<>();
        for (Map.Entry<String, CommandLine> c : commands().entrySet()) {
            String cmd = c.getKey();
            for (Baseline b : BASELINES.get(cmd)) {
                String before = output(cmd, b.args(), null, "base");
                String again = output(cmd, b.args(), null, "again");
                assertEquals(before, again, cmd + " " + b.label() + ": the baseline is not reproducible (mask what varies)");
                for (OptionSpec o : c.getValue().getCommandSpec().options()) {
                    if (o.usageHelp() || o.versionHelp() || o.hidden()) {
                        continue;
                    }
                    String name = o.longestName();
                    List<String> values = VALUES.getOrDefault(cmd + " " + name, VALUES.get(name));
                    if (values == null) {
                        problems.add(cmd + " " + name + ": no value to try (add one to OptionWalkTest.VALUES)");
                        continue;
                    }
                    String value = pick(b.args(), name, values);
                    String key = cmd + " " + name + " " + b.label();
                    String what = cmd + " " + name + (value == null ? "" : " " + value) + " [" + b.label() + "]";
                    judge(problems, what, before, UNCHANGED.get(key), () -> output(cmd, b.args(), name, value));
                }
            }
        }
        failOn(problems);
    }

    @Test
    void refusalsSayWhyTheOptionCannotAct() {
        String s = store.toString();
        assertEquals("edges: --chains does not apply with --order: it sets the sampling of --method mcmc; given an order every DAG "
                + "is summed exactly", CliRun.of("edges", "--store", s, "--order", ORDER, "--chains", "3").errLine());
        assertEquals("predict: --draws does not apply with --method exact: it sets the sampling of --method mcmc; the exact sum "
                + "samples nothing", CliRun.of("predict", "--store", s, "--method", "exact", "--case", "v0=s0", "--draws", "50").errLine());
        assertEquals("edges: --seed does not apply with --method exact without --features: nothing is drawn at random, the sums are exact",
                CliRun.of("edges", "--store", s, "--method", "exact", "--seed", "7").errLine());
        assertEquals("predict: --seed does not apply with --order: nothing is drawn at random, the sums are exact",
                CliRun.of("predict", "--store", s, "--order", ORDER, "--case", "v0=s0", "--seed", "7").errLine());
        assertEquals("edges: --dag-prior does not apply with --order: given an order both DAG priors coincide",
                CliRun.of("edges", "--store", s, "--order", ORDER, "--dag-prior", "order-modular").errLine());
        assertEquals("edges: --dag-samples does not apply without --features: it counts the DAGs drawn to estimate the features",
                CliRun.of("edges", "--store", s, "--method", "exact", "--dag-samples", "500").errLine());
        assertEquals("scores: --overwrite does not apply without --out: it lets --out replace an existing file; standard output "
                + "replaces nothing", CliRun.of("scores", "--store", s, "--overwrite").errLine());
        assertEquals("predict: --tail-mass does not apply with --method exact --dag-prior structure-modular: no parent set is skipped "
                + "in the exact sum over every DAG",
                CliRun.of("predict", "--store", s, "--method", "exact", "--case", "v0=s0", "--tail-mass", "0.3").errLine());
        assertEquals("effect: --mcse-target does not apply to a fixed run in effect (--steps without --rhat-target): it sets when a "
                + "run until converged stops", CliRun.of("effect", "--store", s, "--method", "mcmc", "--steps", "100", "--do", "v3=s1",
                "--target", "v2=s0", "--mcse-target", "0.05").errLine());
        assertEquals("edges: --max-steps 300 is below the first convergence check, after 20000 steps per chain: give at least 20000, "
                + "or --steps 300 for a fixed run", CliRun.of("edges", "--store", s, "--method", "mcmc", "--max-steps", "300").errLine());
        assertEquals("edges: --max-steps 300 is below the first convergence check, after 400 steps per chain (--steps): give at least "
                + "400, or fewer --steps", CliRun.of("edges", "--store", s, "--method", "mcmc", "--steps", "400", "--rhat-target", "1.05",
                "--max-steps", "300").errLine());
        // still accepted where they act: the seed of effect's own draws given an order, the DAG draws of --features
        assertEquals(0, CliRun.of("effect", "--store", s, "--order", ORDER, "--do", "v3=s1", "--target", "v2=s0", "--effect-draws",
                "50", "--seed", "7").status());
        assertEquals(0, CliRun.of("edges", "--store", s, "--method", "exact", "--features", "ancestors", "--dag-samples", "200",
                "--seed", "7").status());
    }

    @Test
    void hiddenOptionsAreRenamedOnesRefusedWithTheirNewName() throws Exception {
        Map<String, String> renamed = Map.of("--until-rhat", "--rhat-target", "--samples", "--dag-samples",
                "--order-samples", "--dag-samples", "effect --cases", "--questions");
        int seen = 0;
        for (Map.Entry<String, CommandLine> c : commands().entrySet()) {
            String cmd = c.getKey();
            for (OptionSpec o : c.getValue().getCommandSpec().options()) {
                if (!o.hidden()) {
                    continue;
                }
                for (String name : o.names()) {
                    String now = renamed.getOrDefault(cmd + " " + name, renamed.get(name));
                    assertTrue(now != null, cmd + " " + name + " is hidden: say in OptionWalkTest what it was renamed to");
                    Baseline b = BASELINES.get(cmd).get(0);
                    String value = name.equals("--until-rhat") ? "1.05" : name.equals("--cases") ? "@QUESTIONS" : "500";
                    List<String> args = new ArrayList<>(List.of(cmd));
                    args.addAll(resolve(b.args(), "unused"));
                    args.add(name);
                    args.add(resolve(List.of(value), "unused").get(0));
                    CliRun r = CliRun.of(args.toArray(String[]::new));
                    assertEquals(EdgewiseCli.USER_ERROR, r.status(), cmd + " " + name + ": " + r.err());
                    assertTrue(r.err().startsWith(cmd + ": ") && r.err().strip().lines().count() == 1,
                            cmd + " " + name + ": not one line: " + r.err());
                    assertTrue(r.err().contains(" " + now + " "), cmd + " " + name + ": no hint to " + now + ": " + r.err());
                    seen++;
                }
            }
        }
        // predict, edges, effect and sample share --until-rhat and --samples/--order-samples; effect has --cases
        assertEquals(4 * 3 + 1, seen);
    }

    @Test
    void everyHelpExitsZeroWithAnEmptyStandardError() {
        List<List<String>> asks = new ArrayList<>();
        asks.add(List.of("--help")); // no command at all is a mistake (exit 2, the usage line): PredictCommandTest
        for (String cmd : commands().keySet()) {
            asks.add(List.of(cmd, "--help"));
            asks.add(List.of("help", cmd));
        }
        for (List<String> a : asks) {
            CliRun r = CliRun.of(a.toArray(String[]::new));
            assertEquals(0, r.status(), a + ": " + r.err());
            assertEquals("", r.err(), a + " writes to standard error");
            assertTrue(r.out().contains("Usage:"), a + ": " + r.out());
        }
    }

    /**
     * Runs {@code cmd} with the baseline's arguments and {@code name} set to {@code value} (replacing
     * the baseline's own value; {@code name} null: the baseline alone) and returns standard output,
     * the {@code --out} file and standard error, masked; a refusal is thrown as {@link Refused}.
     */
    String output(String cmd, List<String> baseline, String name, String value) throws Exception {
        String tag = "run" + (runs++);
        List<String> args = new ArrayList<>(List.of(cmd));
        List<String> base = new ArrayList<>(baseline);
        int at = name == null ? -1 : base.indexOf(name);
        if (at >= 0) {
            base.remove(at + 1);
            base.remove(at);
        }
        args.addAll(resolve(base, tag));
        if (name != null) {
            args.add(name);
            if (value != null) {
                args.add(resolve(List.of(value), tag).get(0));
            }
        }
        CliRun r = CliRun.of(args.toArray(String[]::new));
        if (r.status() == EdgewiseCli.USER_ERROR) {
            String line = r.err().strip();
            if (line.lines().count() != 1 || !line.startsWith(cmd + ": ")) {
                throw new Refused("refused, but not in one line naming the command: " + r.err());
            }
            if (line.contains("--help)")) {
                throw new Refused("the value tried is invalid, pick a valid one: " + line);
            }
            throw new Refused(null);
        }
        if (r.status() != 0 && r.status() != ErrorReport.NOT_CONVERGED) {
            throw new Refused("exit " + r.status() + ": " + r.err());
        }
        if (name == null && !r.err().isEmpty() && !r.err().contains("WARNING") && !r.err().startsWith(cmd + ": wrote")) {
            // a baseline should run cleanly, so that a variant's warnings stand out
            throw new AssertionError(cmd + " " + baseline + ": " + r.err());
        }
        Path out = dir.resolve(tag + ".out");
        String file = Files.isDirectory(out) // a sample: its manifest and the DAGs' digest
                ? Files.readString(out.resolve("sample.json")).replace(dir.toString(), "@DIR") + "\n" + java.util.HexFormat.of()
                .formatHex(java.security.MessageDigest.getInstance("SHA-256").digest(Files.readAllBytes(out.resolve("dags.bin"))))
                : Files.exists(out) ? Files.readString(out) : "";
        return "exit status " + r.status() + "\n" + mask(r.out().replace(dir.toString(), "@DIR").replaceAll("run\\d+", "run#")) + "\n--- out file ---\n" + mask(file) + "\n--- standard error ---\n"
                + mask(r.err().replace(dir.toString(), "@DIR").replaceAll("run\\d+", "run#"));
    }

    /** The run-dependent parts blanked: timings, dates. */
    static String mask(String text) {
        return text.replaceAll("\"(\\w*Seconds|createdAt)\"\\s*:\\s*[^,}\\]]+", "\"$1\":#")
                .replaceAll("\\d+(\\.\\d+)? ?(s|seconds|ms)\\b", "# s");
    }

    List<String> resolve(List<String> args, String tag) {
        List<String> out = new ArrayList<>();
        for (String a : args) {
            out.add(switch (a) {
                case "@STORE" -> store.toString();
                case "@STORE2" -> store2.toString();
                case "@RESULT" -> result.toString();
                case "@RESULT2" -> result2.toString();
                case "@EFFECT" -> effectResult.toString();
                case "@TRUTH" -> truth.toString();
                case "@TRUTH2" -> truth2.toString();
                case "@CASES" -> cases.toString();
                case "@SCORED" -> scored.toString();
                case "@PREDICTION" -> prediction.toString();
                case "@QUESTIONS" -> questions.toString();
                case "@OUT" -> dir.resolve(tag + ".out").toString();
                case "@OUTDIR" -> dir.resolve(tag + ".dir").toString();
                case "@SAMPLE" -> sample.toString();
                case "@SAMPLE2" -> sample2.toString();
                default -> a;
            });
        }
        return out;
    }
}
