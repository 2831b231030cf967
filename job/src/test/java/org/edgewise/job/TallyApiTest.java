package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.RowFactory;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructType;
import org.edgewise.driver.UserError;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreFormat;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.ExtendWith;
import org.junit.jupiter.api.io.TempDir;

/** {@link Tally}, the Java API, on an in-memory Dataset: the same store as an independent recount and as the CLI. */
@ExtendWith(SharedSpark.class)
class TallyApiTest {
    static SparkSession spark;
    @TempDir
    static Path dir;
    static final List<String> NAMES = List.of("a", "b", "c", "d");
    static final String[][] LABELS = {{"lo", "hi"}, {"1", "2", "10"}, {"x", "y", "z"}, {"no", "yes"}};
    static int[][] rows;
    static Dataset<Row> data;

    @BeforeAll
    static void start(SparkSession session) {
        spark = session;
        rows = TestTables.sample(new int[] {2, 3, 3, 2}, 500, 11L);
        // b as an integer column: the API reads values as text, as for a Parquet input
        StructType schema = new StructType().add("a", DataTypes.StringType).add("b", DataTypes.IntegerType)
                .add("c", DataTypes.StringType).add("d", DataTypes.StringType);
        List<Row> list = new ArrayList<>();
        for (int[] r : rows) {
            list.add(RowFactory.create(LABELS[0][r[0]], Integer.parseInt(LABELS[1][r[1]]), LABELS[2][r[2]], LABELS[3][r[3]]));
        }
        data = spark.createDataFrame(list, schema);
    }

    /** Independent recount: InMemoryTally's per-row loop over the same rows gives the same counts and scores. */
    @Test
    void tallyOfADatasetEqualsAnIndependentRecount() {
        Path out = dir.resolve("api");
        TallyJob.Summary s = Tally.of(data).maxParents(2).writeTo(out.toString());
        assertEquals(500, s.rows());
        ScoreStore store = TestTables.read(out);
        assertEquals(List.of("1", "2", "10"), store.variables().get(1).states(), "numeric order, as for Parquet");
        assertEquals("dataset", store.manifest().input().format());
        assertEquals(List.of("dataset"), store.manifest().input().paths());
        ScoreStore ref = InMemoryTally.tally(store.variables(), TestTables.encodeWith(store.variables(), LABELS, rows), 2,
                FamilyScore.withDefaults());
        assertEquals(ref.families().size(), store.families().size());
        for (int f = 0; f < ref.families().size(); f++) {
            FamilyCounts a = ref.family(f);
            FamilyCounts b = store.family(f);
            assertEquals(a.child(), b.child(), "family " + f);
            assertArrayEquals(a.parents(), b.parents(), "family " + f);
            assertArrayEquals(a.configs(), b.configs(), "family " + f);
            assertArrayEquals(a.counts(), b.counts(), "family " + f);
            assertEquals(ref.logScore(f), store.logScore(f), 1e-9, "family " + f);
        }
    }

    /** The API runs the one TallyJob: with the same options it writes the CLI's store, part for part. */
    @Test
    void apiAndCommandLineWriteTheSameParts() throws IOException {
        Path csv = TestTables.csvOf(dir.resolve("same.csv"), NAMES, LABELS, rows);
        Path cli = dir.resolve("cli");
        TestTables.Run r = TestTables.tally(spark, "--input", csv.toString(), "--out", cli.toString(),
                "--max-parents", "3", "--candidates", "2", "--ess", "4");
        assertEquals(0, r.status(), r.err());
        Path api = dir.resolve("api-same");
        Tally.of(data).maxParents(3).candidates(2).ess(4).writeTo(api.toString());
        for (String part : List.of(StoreFormat.COUNTS, StoreFormat.SCORES)) {
            assertArrayEquals(Files.readAllBytes(cli.resolve(part)), Files.readAllBytes(api.resolve(part)), part);
        }
        assertEquals(TestTables.read(cli).manifest().candidates(), TestTables.read(api).manifest().candidates());
        assertEquals(TestTables.read(cli).manifest().input().fingerprint(),
                TestTables.read(api).manifest().input().fingerprint());
    }

    @Test
    void mistakesAreOneLineUserErrors() throws IOException {
        Path existing = Files.createDirectories(dir.resolve("existing"));
        UserError e = assertThrows(UserError.class, () -> Tally.of(data).writeTo(existing.toString()));
        assertEquals("output " + existing + " already exists; call overwrite(true) to replace it", e.getMessage());

        Dataset<Row> nested = data.selectExpr("a", "struct(b, c) as bc");
        e = assertThrows(UserError.class, () -> Tally.of(nested).writeTo(dir.resolve("nested").toString()));
        assertEquals("dataset: column 'bc' has type struct<b:int,c:string>, not a discrete value; leave it out with "
                + "exclude(\"bc\")", e.getMessage());
        assertFalse(Files.exists(dir.resolve("nested")), "nothing written");
        // following the advice works: the column left out is never read (issue 23, a refusal that ignored its own advice)
        Tally.of(nested).exclude("bc").writeTo(dir.resolve("nested-excluded").toString());
        assertEquals(List.of("a"), TestTables.read(dir.resolve("nested-excluded")).manifest().variables().stream()
                .map(org.edgewise.driver.store.Variable::name).toList());

        e = assertThrows(UserError.class, () -> Tally.of(data).maxParents(-1));
        assertEquals("maxParents must be 0 or more, got -1", e.getMessage());
        e = assertThrows(UserError.class, () -> Tally.of(data).missing("skip"));
        assertEquals("missing must be error, drop, state or average, got 'skip'", e.getMessage());
        e = assertThrows(UserError.class, () -> Tally.of(data).columns("a", "zz").writeTo(dir.resolve("zz").toString()));
        // issue 11/14: the job's refusals name the builder methods, not the command line's options
        assertEquals("columns: no column 'zz' in dataset (columns: a, b, c, d)", e.getMessage());
        Dataset<Row> holes = data.selectExpr("a", "case when b = 10 then null else b end as b");
        e = assertThrows(UserError.class, () -> Tally.of(holes).writeTo(dir.resolve("holes").toString()));
        assertTrue(e.getMessage().endsWith("; choose missing(\"drop\") or missing(\"state\")"), e.getMessage());
        e = assertThrows(UserError.class, () -> Tally.of(data).maxParents(1).require("a->b", "c->b")
                .writeTo(dir.resolve("req").toString()));
        assertEquals("require gives 'b' 2 parents but maxParents is 1", e.getMessage());
    }

    /** The mapping itself, on the command line's words (from the job's messages, verbatim). */
    @Test
    void theJobsOptionWordsMapToBuilderMethods() {
        assertEquals("exclude: no column 'q' in dataset (columns: a, b)",
                ApiWords.of("--exclude: no column 'q' in dataset (columns: a, b)"));
        assertEquals("input dataset: column 'id' has 90 distinct values, more than maxStates 32; it looks like an ID"
                        + " column (nearly every value is distinct): leave it out with exclude(\"id\")",
                ApiWords.of("input dataset: column 'id' has 90 distinct values, more than --max-states 32; it looks like"
                        + " an ID column (nearly every value is distinct): leave it out with --exclude id"));
        assertEquals("discretise it, e.g. discretize(\"x\", 4), or raise maxStates",
                ApiWords.of("discretise it, e.g. --discretize x=4, or raise --max-states"));
        assertEquals("'abc' is not a number, but discretize(\"x\", 2) needs numbers",
                ApiWords.of("'abc' is not a number, but --discretize x=2 needs numbers"));
        assertEquals("lower maxParents or use candidates(K)", ApiWords.of("lower --max-parents or use --candidates K"));
        assertEquals("require(\"a->b\") contradicts tier: 'a' is in a later tier than 'b'",
                ApiWords.of("--require a->b contradicts --tiers: 'a' is in a later tier than 'b'"));
        assertEquals("memoryBudget 1 GiB is more than the memory of this JVM",
                ApiWords.of("--memory-budget 1 GiB is more than the memory of this JVM"));
    }
}
