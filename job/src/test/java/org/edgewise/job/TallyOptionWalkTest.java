package org.edgewise.job;

import static org.edgewise.driver.OptionWalk.failOn;
import static org.edgewise.driver.OptionWalk.judge;
import static org.edgewise.driver.OptionWalk.pick;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.apache.spark.sql.SparkSession;
import org.edgewise.driver.OptionWalk.Refused;
import org.edgewise.driver.store.StoreFormat;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;
import picocli.CommandLine.Model.OptionSpec;

/**
 * Every option {@code tally} accepts matters, the rule {@code OptionWalkTest} applies to the driver's
 * commands. The options are read from picocli's model of {@link TallyMain}, so an option added later is
 * walked too and the walk fails until a value to try is named here. For each baseline (a CSV table, the
 * same table as Parquet) tally runs once as the baseline and once with the option set to a non-default
 * valid value; then either the output changes (standard output with the timing masked, standard error,
 * the store's manifest.json with createdAt and the input paths set aside, and the bytes of its Parquet
 * parts), or tally refuses with one line and exit status 2. Where an option cannot change a tiny
 * store, {@link #UNCHANGED} says why.
 */
class TallyOptionWalkTest {
    private static final ObjectMapper JSON = new ObjectMapper();

    @TempDir
    static Path dir;
    static SparkSession spark;
    static int runs;

    /** A baseline: a label and its arguments ({@code @IN}, {@code @IN2}, {@code @OUT}, … resolved per run). */
    record Baseline(String label, List<String> args) {
    }

    /**
     * The baselines. Both drop the few rows with an empty field of {@code b}; the Parquet one names its
     * format, so that {@code --format} has a value to change to.
     */
    static final List<Baseline> BASELINES = List.of(
            new Baseline("csv", List.of("--input", "@IN", "--out", "@OUT", "--missing", "drop")),
            new Baseline("parquet", List.of("--input", "@PARQUET", "--format", "parquet", "--out", "@OUT", "--missing", "drop")));

    /** The non-default values tried per option; the first that differs from the baseline's own value is used; null: a flag. */
    static final Map<String, List<String>> VALUES = new LinkedHashMap<>();

    static void value(String name, String... values) {
        VALUES.put(name, values.length == 0 ? java.util.Collections.singletonList(null) : List.of(values));
    }

    static {
        value("--input", "@IN2");
        value("--format", "parquet", "csv");
        value("--delimiter", ";");
        value("--encoding", "ISO-8859-1"); // the table has a label outside ASCII
        value("--out", "@OUT2");
        value("--overwrite");
        value("--max-parents", "1");
        value("--master", "local[1]");
        value("--columns", "a,b,c");
        value("--exclude", "x");
        value("--candidates", "1");
        value("--reserve", "1"); // refused on both baselines: no --candidates
        value("--forbid", "a->b");
        value("--require", "a->c");
        value("--tiers", "a,b;c");
        value("--missing", "drop", "state", "average");
        value("--seed", "2"); // refused under the baselines' --missing drop; walked under average below
        value("--rounds", "3");
        value("--weight", "n");
        value("--max-states", "4"); // below x's 8 states
        value("--discretize", "x=3");
        value("--score", "k2");
        value("--ess", "5");
        value("--partitions", "3");
        value("--memory-budget", "1k");
        value("--conf", "spark.sql.shuffle.partitions=3");
        value("--verbose");
    }

    /**
     * The options that may leave a baseline's output unchanged, by "option baseline", each with the
     * reason it cannot change this output. Keep it small: an entry is a claim that the option acts
     * elsewhere. A listed option that does change the output fails the walk too (the entry is stale).
     */
    static final Map<String, String> UNCHANGED = new LinkedHashMap<>();

    static {
        for (Baseline b : BASELINES) {
            String l = " " + b.label();
            UNCHANGED.put("--overwrite" + l, "each run writes a new store; --overwrite lets one replace an existing store "
                    + "(TallyJobTest, BadInputTest)");
            UNCHANGED.put("--master" + l, "the walk runs on the shared local[2] session, which a run's --master does not "
                    + "replace; a command-line run starts its session on it (ClusterIT)");
            UNCHANGED.put("--conf" + l, "a performance setting of the session; the walk runs on the shared session, which a "
                    + "run's --conf does not reconfigure");
            UNCHANGED.put("--verbose" + l, "where the log of a session the command starts goes; the walk runs on the shared "
                    + "session, whose log is the tests' (SparkScratchTest runs tally in a child JVM with and without it)");
            UNCHANGED.put("--partitions" + l, "the store does not depend on how the rows are split, by design "
                    + "(QuotedLinesTest and WeightTest compare 1 and 3 partitions)");
        }
    }

    @BeforeAll
    static void tables() throws Exception {
        spark = SharedSpark.session();
        table(dir.resolve("in.csv"), 300, 41L);
        table(dir.resolve("in2.csv"), 300, 42L);
        // the same table as Parquet, empty fields as nulls (one file, so the part's name does not matter)
        spark.read().option("header", "true").option("encoding", "UTF-8").csv(dir.resolve("in.csv").toString())
                .coalesce(1).write().parquet(dir.resolve("in.parquet").toString());
    }

    /**
     * A table of 5 columns: a, b (three fields empty), c (one label outside ASCII), x (a number, 8
     * values), n (1 to 3: a count for --weight), each depending on the one before through a fixed rule.
     */
    static void table(Path file, int rows, long seed) throws IOException {
        Random r = new Random(seed);
        StringBuilder sb = new StringBuilder("a,b,c,x,n\n");
        String[] cs = {"lo", "mid", "hé"};
        for (int i = 0; i < rows; i++) {
            int a = r.nextInt(2);
            int b = r.nextDouble() < 0.8 ? a : r.nextInt(3);
            int c = r.nextDouble() < 0.7 ? b : r.nextInt(3);
            int x = Math.min(7, 2 * c + r.nextInt(3));
            int n = 1 + (x + r.nextInt(2)) % 3;
            sb.append(a == 0 ? "no" : "yes").append(',').append(i % 97 == 5 ? "" : "b" + b).append(',').append(cs[c])
                    .append(',').append(x).append(',').append(n).append('\n');
        }
        Files.writeString(file, sb.toString());
    }

    /** The options of tally as picocli sees them. */
    static List<OptionSpec> options() {
        return new CommandLine(new TallyMain(null)).getCommandSpec().options();
    }

    @Test
    void everyOptionChangesTheOutputOrIsRefused() throws Exception {
        List<String> problems = new ArrayList<>();
        for (Baseline b : BASELINES) {
            String before = output(b.args(), null, null);
            assertEquals(before, output(b.args(), null, null), b.label() + ": the baseline is not reproducible (mask what varies)");
            for (OptionSpec o : options()) {
                if (o.usageHelp() || o.versionHelp() || o.hidden()) {
                    continue;
                }
                String name = o.longestName();
                List<String> values = VALUES.get(name);
                if (values == null) {
                    problems.add(name + ": no value to try (add one to TallyOptionWalkTest.VALUES)");
                    continue;
                }
                String value = pick(b.args(), name, values);
                String what = name + (value == null ? "" : " " + value) + " [" + b.label() + "]";
                judge(problems, what, before, UNCHANGED.get(name + " " + b.label()), () -> output(b.args(), name, value));
            }
        }
        failOn(problems);
    }

    /**
     * The options of data augmentation, walked from a baseline that averages over the missing cells of
     * b: each changes the store (its manifest records it, and the draws differ), and without
     * {@code --missing average} each is refused (the walk above).
     */
    @Test
    void augmentationOptionsChangeTheStore() throws Exception {
        List<String> base = List.of("--input", "@IN", "--out", "@OUT", "--missing", "average", "--rounds", "4",
                "--max-parents", "2");
        String before = output(base, null, null);
        assertEquals(before, output(base, null, null), "the same seed gives the same store");
        List<String> problems = new ArrayList<>();
        for (String[] nv : new String[][] {{"--seed", "2"}, {"--rounds", "6"}, {"--missing", "state"}}) {
            judge(problems, nv[0] + " " + nv[1] + " [average]", before, null, () -> output(base, nv[0], nv[1]));
        }
        failOn(problems);
        Refused r = org.junit.jupiter.api.Assertions.assertThrows(Refused.class, () -> output(List.of("--input", "@IN", "--out", "@OUT",
                "--missing", "drop"), "--seed", "2"));
        assertTrue(r.problem == null, "refused in one line: " + r.problem);
    }

    @Test
    void refusalsSayWhyTheOptionCannotAct() {
        String in = dir.resolve("in.parquet").toString();
        String out = dir.resolve("refused").resolve("store").toString();
        TestTables.Run d = TestTables.tally(spark, "--input", in, "--out", out, "--delimiter", ";");
        assertEquals(2, d.status(), d.err());
        assertEquals("tally: --delimiter does not apply to Parquet input: it splits the fields of CSV text; "
                + "Parquet stores its columns apart", d.err());
        TestTables.Run e = TestTables.tally(spark, "--input", in, "--out", out, "--encoding", "UTF-8");
        assertEquals(2, e.status(), e.err());
        assertEquals("tally: --encoding does not apply to Parquet input: it decodes the bytes of CSV text; "
                + "Parquet stores its strings as UTF-8", e.err());
    }

    @Test
    void helpAndVersionExitZeroWithAnEmptyStandardError() {
        for (String ask : List.of("--help", "--version")) {
            TestTables.Run r = TestTables.tally(null, ask);
            assertEquals(0, r.status(), ask + ": " + r.err());
            assertEquals("", r.err(), ask + " writes to standard error");
            assertTrue(r.out().contains(ask.equals("--help") ? "Usage:" : "edgewise tally"), ask + ": " + r.out());
        }
    }

    /**
     * Runs tally with the baseline's arguments and {@code name} set to {@code value} (replacing the
     * baseline's own; {@code name} null: the baseline alone) into a fresh folder, and returns what it
     * printed and the store it wrote, masked; a refusal is thrown as {@link Refused}.
     */
    static String output(List<String> baseline, String name, String value) throws Exception {
        Path run = Files.createDirectories(dir.resolve("run" + (runs++)));
        List<String> args = new ArrayList<>(baseline);
        int at = name == null ? -1 : args.indexOf(name);
        if (at >= 0) {
            args.remove(at + 1);
            args.remove(at);
        }
        if (name != null) {
            args.add(name);
            if (value != null) {
                args.add(value);
            }
        }
        List<String> resolved = args.stream().map(a -> switch (a) {
            case "@IN" -> dir.resolve("in.csv").toString();
            case "@IN2" -> dir.resolve("in2.csv").toString();
            case "@PARQUET" -> dir.resolve("in.parquet").toString();
            case "@OUT" -> run.resolve("store").toString();
            case "@OUT2" -> run.resolve("elsewhere").toString();
            default -> a;
        }).toList();
        TestTables.Run r = TestTables.tally(spark, resolved.toArray(String[]::new));
        if (r.status() == 2) {
            String line = r.err();
            if (line.isEmpty() || line.contains("\n")) {
                throw new Refused("refused, but not in one line: " + r.err());
            }
            if (!line.startsWith("tally: ")) {
                throw new Refused("refused without the command's name: " + line);
            }
            throw new Refused(null);
        }
        if (r.status() != 0) {
            throw new Refused("exit status " + r.status() + ": " + r.err());
        }
        Path store = Path.of(resolved.get(resolved.indexOf("--out") + 1));
        StringBuilder sb = new StringBuilder();
        sb.append("out: ").append(mask(r.out(), run)).append('\n');
        sb.append("err: ").append(mask(r.err(), run)).append('\n');
        ObjectNode m = (ObjectNode) JSON.readTree(store.resolve(StoreFormat.MANIFEST).toFile());
        m.remove("createdAt");
        ((ObjectNode) m.get("input")).remove("paths");
        sb.append("manifest: ").append(JSON.writerWithDefaultPrettyPrinter().writeValueAsString(m)).append('\n');
        for (String part : List.of(StoreFormat.COUNTS, StoreFormat.SCORES)) {
            byte[] bytes = Files.readAllBytes(store.resolve(part));
            sb.append(part).append(": ").append(HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(bytes)))
                    .append('\n');
        }
        return sb.toString();
    }

    /** The run's folder as RUN, the seconds a run took as S. */
    static String mask(String text, Path run) {
        return text.replace(run.toString(), "RUN").replaceAll("\\d+\\.\\d+ s\\b", "S s");
    }
}
