package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.DataType;
import org.apache.spark.sql.types.DataTypes;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreFormat;
import org.edgewise.job.CountTables.Counts;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.ExtendWith;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code tally --weight COL}, a table of counts: the store equals the one written for the table
 * expanded to one row per unit — the independent method here is the expansion itself, tallied
 * without {@code --weight}. Equal means: both Parquet parts byte for byte, and the manifest the
 * same but for when it was written, the input paths and the weight column it names.
 */
@ExtendWith(SharedSpark.class)
class WeightTest {
    static SparkSession spark;
    @TempDir
    static Path dir;
    static int stores;
    static final ObjectMapper JSON = new ObjectMapper();

    @BeforeAll
    static void start(SparkSession session) {
        spark = session;
    }

    /** Where the refused runs would have written (TestTables numbers its own stores). */
    static Path refusals() throws IOException {
        return Files.createDirectories(dir.resolve("refused"));
    }

    /** Writes {@code text} to the file {@code name} and checks tally with {@code args} refuses it with "tally: input &lt;file&gt;" + {@code after}. */
    static void refusedFile(String name, String text, String after, String... args) throws IOException {
        Path input = TestTables.write(dir.resolve(name), text);
        TestTables.assertRefused(refusals(), "tally: input " + input + after, input, args);
    }

    static Path tally(Path input, String... extra) {
        Path out = dir.resolve("store" + (stores++));
        List<String> args = new ArrayList<>(List.of("--input", input.toString(), "--out", out.toString()));
        args.addAll(List.of(extra));
        TestTables.Run r = TestTables.tally(spark, args.toArray(String[]::new));
        assertEquals(0, r.status(), r.err());
        return out;
    }

    static JsonNode manifest(Path store) {
        try {
            return JSON.readTree(store.resolve(StoreFormat.MANIFEST).toFile());
        } catch (IOException e) {
            throw new AssertionError(e);
        }
    }

    /** Byte-identical Parquet parts; manifests equal once createdAt, input.paths and input.weight are set aside. */
    static void sameStore(Path weighted, Path expanded, String weight) throws IOException {
        sameParts(expanded, weighted);
        ObjectNode a = (ObjectNode) manifest(weighted);
        ObjectNode b = (ObjectNode) manifest(expanded);
        assertEquals(weight, a.path("input").path("weight").asText(null), "the manifest names the weight column");
        assertFalse(b.path("input").has("weight"), "no weight column, no input.weight");
        for (ObjectNode m : List.of(a, b)) {
            m.remove("createdAt");
            ((ObjectNode) m.get("input")).remove(List.of("paths", "weight"));
        }
        assertEquals(b, a);
        for (JsonNode v : a.get("variables")) {
            assertFalse(v.get("name").asText().equals(weight), "the weight column is no variable");
        }
    }

    /** Byte-identical Parquet parts: the counts and the scores of {@code got} are those of {@code expected}. */
    static void sameParts(Path expected, Path got) throws IOException {
        for (String part : List.of(StoreFormat.COUNTS, StoreFormat.SCORES)) {
            assertArrayEquals(Files.readAllBytes(expected.resolve(part)), Files.readAllBytes(got.resolve(part)), part);
        }
    }

    /** The table of counts {@code t} (written as {@link #csv}) read back by Spark, its Freq column as {@code type}. */
    static Dataset<Row> freqTable(String name, Counts t, DataType type) {
        return spark.read().option("header", "true").csv(csv(name, t).toString())
                .withColumn("Freq", org.apache.spark.sql.functions.col("Freq").cast(type));
    }

    static Path csv(String name, Counts t) {
        return TestTables.csv(dir.resolve(name + "-counts.csv"), t.names(), t.lines());
    }

    static Path expandedCsv(String name, Counts t) {
        return TestTables.csv(dir.resolve(name + "-rows.csv"), t.names().subList(0, t.names().size() - 1), t.expanded());
    }

    /** The published margins (see CountTables) match what was typed in. */
    @Test
    void publishedTotals() {
        assertEquals(4526, CountTables.ucbAdmissions().total()); // Bickel, Hammel & O'Connell 1975
        assertEquals(2201, CountTables.titanic().total()); // Dawson 1995
        assertEquals(592, CountTables.hairEyeColor().total()); // Snee 1974
        long admitted = CountTables.ucbAdmissions().lines().stream().filter(l -> l[0].equals("Admitted"))
                .mapToLong(l -> Long.parseLong(l[3])).sum();
        assertEquals(1755, admitted);
        long survived = CountTables.titanic().lines().stream().filter(l -> l[3].equals("Yes"))
                .mapToLong(l -> Long.parseLong(l[4])).sum();
        assertEquals(711, survived);
        long blond = CountTables.hairEyeColor().lines().stream().filter(l -> l[0].equals("Blond"))
                .mapToLong(l -> Long.parseLong(l[3])).sum();
        assertEquals(127, blond);
    }

    /** The three public tables in their aggregated form (R datasets) beside their expansion. */
    @Test
    void publicTablesGiveTheStoreOfTheirExpansion() throws IOException {
        Map<String, Counts> tables = new LinkedHashMap<>();
        tables.put("ucb", CountTables.ucbAdmissions());
        tables.put("titanic", CountTables.titanic());
        tables.put("haireye", CountTables.hairEyeColor());
        for (Map.Entry<String, Counts> e : tables.entrySet()) {
            Counts t = e.getValue();
            Path w = tally(csv(e.getKey(), t), "--weight", "Freq", "--max-parents", "3");
            Path x = tally(expandedCsv(e.getKey(), t), "--max-parents", "3");
            sameStore(w, x, "Freq");
            assertEquals(t.total(), manifest(w).path("input").path("rows").asLong(), e.getKey());
        }
    }

    /** A random table's cells, with a weight column in the middle, a cell split over two lines and lines of weight 0. */
    static Counts randomCounts(boolean blanks) {
        int[][] rows = TestTables.sample(new int[] {2, 3, 2, 4}, 3000, 2201L);
        String[][] labels = {{"lo", "hi"}, {"1", "2", "10"}, {"x", "y"}, {"p", "q", "r", "s"}};
        Map<String, Long> cells = new LinkedHashMap<>();
        java.util.Random rnd = new java.util.Random(7);
        for (int[] r : rows) {
            String[] s = new String[4];
            for (int v = 0; v < 4; v++) {
                s[v] = labels[v][r[v]];
            }
            if (blanks && rnd.nextDouble() < 0.05) {
                s[rnd.nextInt(4)] = "";
            }
            cells.merge(String.join(",", s), 1L, Long::sum);
        }
        List<String[]> lines = new ArrayList<>();
        boolean split = false;
        for (Map.Entry<String, Long> c : cells.entrySet()) {
            String[] s = c.getKey().split(",", -1);
            long n = c.getValue();
            if (!split && n >= 2) { // one cell on two lines: 1 + (n − 1)
                lines.add(new String[] {s[0], "1", s[1], s[2], s[3]});
                n--;
                split = true;
            }
            lines.add(new String[] {s[0], Long.toString(n), s[1], s[2], s[3]});
        }
        // weight 0: counted as if absent; 'zz' appears nowhere else, so it must not become a state
        lines.add(new String[] {"lo", "0", "zz", "x", "p"});
        lines.add(new String[] {"hi", "0", "1", "y", "q"});
        List<String[]> moved = new ArrayList<>();
        for (String[] l : lines) { // Counts keeps the count last; the CSV below puts it second
            moved.add(new String[] {l[0], l[2], l[3], l[4], l[1]});
        }
        return new Counts(List.of("a", "b", "c", "d", "n"), moved);
    }

    static Path weightSecond(String name, Counts t) {
        List<String[]> lines = new ArrayList<>();
        for (String[] l : t.lines()) {
            lines.add(new String[] {l[0], l[4], l[1], l[2], l[3]});
        }
        return TestTables.csv(dir.resolve(name), List.of("a", "n", "b", "c", "d"), lines);
    }

    @Test
    void randomTableGivesTheStoreOfItsExpansion() throws IOException {
        Counts t = randomCounts(false);
        Path counts = weightSecond("random-counts.csv", t);
        Path rows = expandedCsv("random", t);
        sameStore(tally(counts, "--weight", "n", "--max-parents", "2"), tally(rows, "--max-parents", "2"), "n");
        // with the pairwise candidate pass as well
        Path w = tally(counts, "--weight", "n", "--max-parents", "2", "--candidates", "2");
        sameStore(w, tally(rows, "--max-parents", "2", "--candidates", "2"), "n");
        ScoreStore s = TestTables.read(w);
        assertEquals(List.of("a", "b", "c", "d"), s.variables().stream().map(v -> v.name()).toList());
        assertEquals(List.of("1", "2", "10"), s.variables().get(1).states(), "no state from a line of weight 0");
        assertEquals(3000, s.manifest().input().rows());
        assertEquals("n", s.manifest().input().weight());
    }

    @Test
    void missingValuesDroppedOrAStateAsInTheExpansion() throws IOException {
        Counts t = randomCounts(true);
        Path counts = weightSecond("blank-counts.csv", t);
        Path rows = expandedCsv("blank", t);
        for (String policy : List.of("drop", "state")) {
            Path w = tally(counts, "--weight", "n", "--max-parents", "2", "--missing", policy);
            sameStore(w, tally(rows, "--max-parents", "2", "--missing", policy), "n");
            if (policy.equals("drop")) {
                assertTrue(manifest(w).path("input").path("droppedRows").asLong() > 0);
            }
        }
    }

    /** Partition invariance (1 vs 3): the same store, the same fingerprint. */
    @Test
    void partitionsOneAndThreeGiveTheSameStore() throws IOException {
        Path counts = weightSecond("part-counts.csv", randomCounts(false));
        Path one = tally(counts, "--weight", "n", "--max-parents", "2", "--partitions", "1");
        Path three = tally(counts, "--weight", "n", "--max-parents", "2", "--partitions", "3");
        sameParts(one, three);
        ObjectNode a = (ObjectNode) manifest(one);
        ObjectNode b = (ObjectNode) manifest(three);
        a.remove("createdAt");
        b.remove("createdAt");
        assertEquals(a, b);
    }

    /** Parquet input: the weight as a long column beside the string columns; its expansion as Parquet too. */
    @Test
    void parquetTableOfCounts() throws IOException {
        Counts t = CountTables.titanic();
        Dataset<Row> lines = freqTable("titanic-pq", t, DataTypes.LongType);
        Path counts = dir.resolve("titanic-counts.parquet");
        lines.coalesce(1).write().parquet(counts.toString());
        Path rows = dir.resolve("titanic-rows.parquet");
        spark.read().option("header", "true").csv(expandedCsv("titanic-pq", t).toString()).write().parquet(rows.toString());
        sameStore(tally(counts, "--weight", "Freq"), tally(rows), "Freq");
    }

    /** --discretize: the bins of a weighted numeric column are those of its expansion. */
    @Test
    void discretisedColumnBinnedAsInTheExpansion() throws IOException {
        List<String[]> lines = new ArrayList<>();
        java.util.Random rnd = new java.util.Random(3);
        for (int i = 0; i < 200; i++) {
            lines.add(new String[] {Integer.toString(rnd.nextInt(50)), rnd.nextBoolean() ? "u" : "v",
                Integer.toString(rnd.nextInt(6))});
        }
        Counts t = new Counts(List.of("x", "g", "n"), lines);
        sameStore(tally(csv("binned", t), "--weight", "n", "--discretize", "x=3"),
                tally(expandedCsv("binned", t), "--discretize", "x=3"), "n");
    }

    /** The Java API: Tally.weight on a Dataset gives the counts, scores and fingerprint of the expansion. */
    @Test
    void javaApi() throws IOException {
        Counts t = CountTables.ucbAdmissions();
        Dataset<Row> d = freqTable("ucb-api", t, DataTypes.IntegerType);
        Path w = dir.resolve("api-store");
        Tally.of(d).weight("Freq").writeTo(w.toString());
        Path x = tally(expandedCsv("ucb-api", t));
        sameParts(x, w);
        assertEquals(manifest(x).path("input").path("fingerprint"), manifest(w).path("input").path("fingerprint"));
        assertEquals("Freq", manifest(w).path("input").path("weight").asText());
        UserError e = assertThrows(UserError.class,
                () -> Tally.of(d).weight("Freq").columns("Admit", "Freq").writeTo(dir.resolve("api-bad").toString()));
        assertEquals("weight(\"Freq\"): the weight column counts rows and is never a variable, but columns names it",
                e.getMessage());
    }

    /** Refusals, word for word, exit status 2, nothing written. */
    @Test
    void badWeightsAreRefusedWithTheirLine() throws IOException {
        refusedFile("frac.csv", "a,n,b\nx,2,u\ny,2.5,v\ny,1.5,v\n", " line 3, column 'n': '2.5' is not a whole number;"
                + " --weight n needs a whole number of rows (0 or more) on every line (2 bad weights in all)",
                "--weight", "n");
        refusedFile("neg.csv", "a,n,b\nx,2,u\ny,3,v\nx,-1,v\n", " line 4, column 'n': '-1' is negative;"
                + " --weight n needs a whole number of rows (0 or more) on every line (1 bad weight in all)",
                "--weight", "n");
        refusedFile("blank.csv", "a,n,b\nx,2,u\ny, ,v\n", " line 3, column 'n': missing weight;"
                + " --weight n needs a whole number of rows (0 or more) on every line (1 bad weight in all)",
                "--weight", "n", "--missing", "drop");
        refusedFile("word.csv", "a,n,b\nx,two,u\n", " line 2, column 'n': 'two' is not a whole number;"
                + " --weight n needs a whole number of rows (0 or more) on every line (1 bad weight in all)",
                "--weight", "n");
        refusedFile("big.csv", "a,n,b\nx,99999999999999999999,u\n", " line 2, column 'n': '99999999999999999999' is more"
                + " than 9223372036854775807; --weight n needs a whole number of rows (0 or more) on every line"
                + " (1 bad weight in all)",
                "--weight", "n");
        refusedFile("sum.csv", "a,n,b\nx,9223372036854775807,u\ny,1,v\n", ", column 'n': the weights add up to more than"
                + " 9223372036854775807 rows",
                "--weight", "n");
        // a line of weight 0 stands for no row: its empty field is no missing value, and a refusal names a counted line
        refusedFile("gap.csv", "a,n,b\nx,0,\nx,2,u\ny,1,\n", " line 4, column 'b': missing value"
                + " (1 missing value in all); choose --missing drop or --missing state",
                "--weight", "n");
        Path gapOnly = TestTables.write(dir.resolve("gap-only.csv"), "a,n,b\nx,0,\nx,2,u\ny,1,v\n");
        assertEquals(3, TestTables.read(tally(gapOnly, "--weight", "n")).manifest().input().rows());
        refusedFile("zero.csv", "a,n,b\nx,0,u\ny,0,v\n", ", column 'n': every weight is 0; nothing is left"
                + " to count",
                "--weight", "n");
    }

    @Test
    void weightColumnUnknownOrAlsoAVariableIsRefused() throws IOException {
        Path f = TestTables.write(dir.resolve("names.csv"), "a,n,b\nx,2,u\ny,3,v\n");
        TestTables.assertRefused(refusals(), "tally: --weight: no column 'm' in " + f + " (columns: a, n, b)", f,
                "--weight", "m");
        TestTables.assertRefused(refusals(), "tally: --weight n: the weight column counts rows and is never a variable,"
                + " but --columns names it", f, "--weight", "n", "--columns", "a,n");
        TestTables.assertRefused(refusals(), "tally: --weight n: the weight column counts rows and is never a variable,"
                + " but --forbid names it", f, "--weight", "n", "--forbid", "n->a");
        TestTables.assertRefused(refusals(), "tally: --weight n: the weight column counts rows and is never a variable,"
                + " but --tiers names it", f, "--weight", "n", "--tiers", "a;n,b");
        TestTables.assertRefused(refusals(), "tally: --weight n: the weight column counts rows and is never a variable,"
                + " but --discretize names it", f, "--weight", "n", "--discretize", "n=2");
    }
}
