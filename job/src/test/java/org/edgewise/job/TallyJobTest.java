package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import org.apache.spark.sql.SparkSession;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreFormat;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** End-to-end tallies on the shared local[2] session, checked against independent recounts. */
class TallyJobTest {
    static SparkSession spark;
    @TempDir
    static Path dir;
    static final List<String> NAMES = List.of("a", "b", "c", "d", "e");
    static final String[][] LABELS = {{"lo", "hi"}, {"1", "2", "10"}, {"x", "y", "z"}, {"0", "1", "2", "3"}, {"no", "yes"}};
    static int[][] rows;
    static Path table;

    @BeforeAll
    static void start() {
        spark = SharedSpark.session();
        rows = TestTables.sample(new int[] {2, 3, 3, 4, 2}, 600, 7L);
        table = TestTables.csvOf(dir.resolve("table.csv"), NAMES, LABELS, rows);
    }

    static Path tallyOk(String name, String... extra) {
        Path out = dir.resolve(name);
        List<String> args = new ArrayList<>(List.of("--input", table.toString(), "--out", out.toString(), "--overwrite"));
        args.addAll(List.of(extra));
        TestTables.Run r = TestTables.tally(spark, args.toArray(String[]::new));
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().startsWith("tally: wrote "), r.out());
        return out;
    }

    /** Independent recount: a naive per-row loop (InMemoryTally) gives the same counts and scores. */
    @Test
    void countsAndScoresEqualAnIndependentRecount() {
        ScoreStore s = TestTables.read(tallyOk("recount", "--max-parents", "3", "--partitions", "3"));
        List<Variable> vars = s.variables();
        // states: lexicographic for text, numeric order when every value is a number ("10" after "2")
        assertEquals(List.of("hi", "lo"), vars.get(0).states());
        assertEquals(List.of("1", "2", "10"), vars.get(1).states());
        assertEquals(List.of("0", "1", "2", "3"), vars.get(3).states());
        int[][] encoded = TestTables.encodeWith(vars, LABELS, rows);
        ScoreStore ref = InMemoryTally.tally(vars, encoded, 3, FamilyScore.withDefaults());
        TestTables.assertSameFamilies(ref, s, rows.length);
        Manifest m = s.manifest();
        assertEquals(600, m.input().rows());
        assertEquals(3, m.maxParents());
        assertNull(m.candidates());
        assertEquals("bdeu", m.score());
        assertEquals(1.0, m.ess());
        assertEquals(32, m.input().fingerprint().length());
    }

    /** The store must not depend on partitioning (Spark's ChiSquareTest suite repeats values for 2–8 partitions). */
    @Test
    void oneThreeAndEightPartitionsGiveIdenticalStores() throws IOException {
        Path p1 = tallyOk("p1", "--max-parents", "2", "--partitions", "1");
        Path p3 = tallyOk("p3", "--max-parents", "2", "--partitions", "3");
        Path p8 = tallyOk("p8", "--max-parents", "2", "--partitions", "8");
        for (String part : List.of(StoreFormat.COUNTS, StoreFormat.SCORES)) {
            byte[] one = Files.readAllBytes(p1.resolve(part));
            assertArrayEquals(one, Files.readAllBytes(p3.resolve(part)), part);
            assertArrayEquals(one, Files.readAllBytes(p8.resolve(part)), part);
        }
        String fp = TestTables.read(p1).manifest().input().fingerprint();
        assertEquals(fp, TestTables.read(p8).manifest().input().fingerprint());
    }

    /** Rescoring the stored counts with another ESS equals scoring at tally time with it. */
    @Test
    void rescoringFromCountsEqualsScoringAtTallyTime() {
        ScoreStore ess1 = TestTables.read(tallyOk("ess1", "--max-parents", "2"));
        ScoreStore ess5 = TestTables.read(tallyOk("ess5", "--max-parents", "2", "--ess", "5"));
        ScoreStore k2 = TestTables.read(tallyOk("k2", "--max-parents", "2", "--score", "k2"));
        assertEquals(5.0, ess5.manifest().ess());
        assertEquals("k2", k2.manifest().score());
        FamilyScore five = FamilyScore.of(ScoreKind.BDEU, 5);
        FamilyScore kk = FamilyScore.of(ScoreKind.K2, 1);
        for (int f = 0; f < ess1.families().size(); f++) {
            FamilyCounts fc = ess1.family(f);
            double q = ess1.configurations(fc.parents());
            int r = ess1.arity(fc.child());
            assertEquals(ess5.logScore(f), five.logScore(fc.counts(), r, q), 1e-9);
            assertEquals(k2.logScore(f), kk.logScore(fc.counts(), r, q), 1e-9);
        }
    }

    /** --forbid, --require, --tiers and --candidates prune at tally time and are recorded. */
    @Test
    void constraintsArePrunedAndRecorded() {
        ScoreStore s = TestTables.read(tallyOk("cons", "--max-parents", "2", "--candidates", "2",
                "--forbid", "b->a", "--require", "a->d", "--tiers", "a,b;c,d,e"));
        Manifest m = s.manifest();
        assertEquals(List.of(new EdgeRule("b", "a")), m.forbidden());
        assertEquals(List.of(new EdgeRule("a", "d")), m.required());
        assertEquals(List.of(List.of("a", "b"), List.of("c", "d", "e")), m.tiers());
        Map<String, List<String>> cand = m.candidates();
        assertEquals(NAMES, new ArrayList<>(cand.keySet()));
        // a: tier 1, b forbidden, c,d,e in a later tier -> no candidates at all
        assertEquals(List.of(), cand.get("a"));
        assertEquals(List.of("a"), cand.get("b"));
        assertTrue(cand.get("d").contains("a"), "required parent kept");
        // independent choice of the 2 best single parents of e by BDeu gain over the empty set
        int[][] enc = TestTables.encodeWith(s.variables(), LABELS, rows);
        FamilyScore fs = FamilyScore.withDefaults();
        double empty = score(fs, s.variables(), enc, 4);
        Integer[] others = {0, 1, 2, 3};
        Arrays.sort(others, Comparator.comparingDouble((Integer j) -> -(score(fs, s.variables(), enc, 4, j) - empty)));
        List<String> best = new ArrayList<>(List.of(NAMES.get(others[0]), NAMES.get(others[1])));
        best.sort(Comparator.comparingInt(NAMES::indexOf));
        assertEquals(best, cand.get("e"));
        for (FamilyCounts fc : s.families()) {
            String child = NAMES.get(fc.child());
            List<String> ps = Arrays.stream(fc.parents()).mapToObj(NAMES::get).toList();
            assertTrue(cand.get(child).containsAll(ps), child + " <- " + ps);
            if (child.equals("d")) {
                assertTrue(ps.contains("a"), "every family of d holds a: " + ps);
            }
        }
        // families: a (no candidates) has only the empty set; b has {} and {a}
        assertEquals(1, s.endFamilyOf(0) - s.firstFamilyOf(0));
        assertEquals(2, s.endFamilyOf(1) - s.firstFamilyOf(1));
    }

    /**
     * {@code --candidates 2 --reserve 1}: the manifest lists each child's 2 best single parents and,
     * as its reserve, the third and every variable that keeps the child among its own 2; the families are every set of at most d of the three, with the counts
     * and scores of an independent recount that ranks the parents itself (InMemoryTally.pruned, the
     * job's rule restated over a naive per-row count). Without --reserve the manifest has none.
     */
    @Test
    void aReserveIsCountedAndListedAfterTheCandidates() {
        ScoreStore s = TestTables.read(tallyOk("reserve", "--max-parents", "2", "--candidates", "2", "--reserve", "1"));
        int[][] encoded = TestTables.encodeWith(s.variables(), LABELS, rows);
        ScoreStore ref = InMemoryTally.pruned(s.variables(), encoded, 2, FamilyScore.withDefaults(), 2, 1);
        TestTables.assertSameFamilies(ref, s, rows.length);
        assertEquals(ref.manifest().candidates(), s.manifest().candidates());
        assertEquals(ref.manifest().reserve(), s.manifest().reserve());
        for (String child : NAMES) {
            assertEquals(2, s.manifest().candidates().get(child).size(), child);
            // the next one by gain, then any variable that keeps the child among its own 2
            assertTrue(s.manifest().reserve().get(child).size() >= 1, child);
        }
        assertNull(TestTables.read(tallyOk("noreserve", "--max-parents", "2", "--candidates", "2")).manifest().reserve());
    }

    static double score(FamilyScore fs, List<Variable> vars, int[][] rows, int child, int... parents) {
        FamilyCounts fc = InMemoryTally.count(vars, rows, child, parents);
        double q = 1;
        for (int p : parents) {
            q *= vars.get(p).arity();
        }
        return fs.logScore(fc.counts(), vars.get(child).arity(), q);
    }

    /** Equal-frequency bins: edges recorded, labels [lo,hi), a quarter of the rows per bin. */
    @Test
    void discretisedColumnGetsEqualFrequencyBins() {
        StringBuilder sb = new StringBuilder("x,y\n");
        for (int t = 0; t < 400; t++) {
            double x = (t * 37 % 400) / 4.0; // 0, 0.25, …, 99.75 in a shuffled order
            sb.append(x).append(',').append(x < 50 ? "low" : "high").append('\n');
        }
        Path in = TestTables.write(dir.resolve("numeric.csv"), sb.toString());
        Path out = dir.resolve("binned");
        TestTables.Run r = TestTables.tally(spark, "--input", in.toString(), "--out", out.toString(),
                "--discretize", "x=4", "--max-parents", "1");
        assertEquals(0, r.status(), r.err());
        ScoreStore s = TestTables.read(out);
        Variable x = s.variables().get(0);
        // Spark's approxQuantile is exact on small data (Greenwald & Khanna 2001 summary below its
        // compression threshold) and returns the value of rank p·N: the 100th, 200th, 300th of 400
        assertEquals(List.of(24.75, 49.75, 74.75), x.binEdges());
        assertEquals(List.of("[0,24.75)", "[24.75,49.75)", "[49.75,74.75)", "[74.75,99.75]"), x.states());
        FamilyCounts xAlone = s.family(s.firstFamilyOf(0));
        assertArrayEquals(new long[] {99, 100, 100, 101}, xAlone.counts());
        // y given x (y states [high, low]); 49.75 is the one "low" value of the third bin
        FamilyCounts yGivenX = s.family(s.firstFamilyOf(1) + 1);
        assertArrayEquals(new long[] {0, 99, 0, 100, 99, 1, 101, 0}, yGivenX.counts());
    }

    /** Cooper & Herskovits (1992) ten cases through the whole job: P(D | x1→x2→x3) = 2.23e-9 under K2. */
    @Test
    void cooperHerskovitsExampleEndToEnd() {
        StringBuilder sb = new StringBuilder("x1,x2,x3\n");
        int[][] cases = {{1, 0, 0}, {1, 1, 1}, {0, 0, 1}, {1, 1, 1}, {0, 0, 0}, {0, 1, 1}, {1, 1, 1}, {0, 0, 0}, {1, 1, 1}, {0, 0, 0}};
        for (int[] c : cases) {
            sb.append(c[0]).append(',').append(c[1]).append(',').append(c[2]).append('\n');
        }
        Path in = TestTables.write(dir.resolve("ch.csv"), sb.toString());
        Path out = dir.resolve("ch");
        TestTables.Run r = TestTables.tally(spark, "--input", in.toString(), "--out", out.toString(),
                "--score", "k2", "--max-parents", "2", "--partitions", "2");
        assertEquals(0, r.status(), r.err());
        ScoreStore s = TestTables.read(out);
        double s1 = find(s, 0) + find(s, 1, 0) + find(s, 2, 1);
        double s2 = find(s, 0) + find(s, 1, 0) + find(s, 2, 0);
        assertEquals(2.23e-9, Math.exp(s1), 0.005e-9);
        assertEquals(Math.log(10), s1 - s2, 1e-12);
    }

    static double find(ScoreStore s, int child, int... parents) {
        for (int f = s.firstFamilyOf(child); f < s.endFamilyOf(child); f++) {
            if (Arrays.equals(s.family(f).parents(), parents)) {
                return s.logScore(f);
            }
        }
        throw new AssertionError("no family " + child + " <- " + Arrays.toString(parents));
    }

    /** Parquet input gives the same counts as the CSV it was made from; missing-value policies. */
    @Test
    void parquetInputAndMissingValuePolicies() throws IOException {
        Path pq = dir.resolve("table.parquet");
        spark.read().option("header", "true").csv(table.toString()).coalesce(2).write().parquet(pq.toString());
        Path fromCsv = tallyOk("fromcsv", "--max-parents", "1");
        Path fromPq = dir.resolve("frompq");
        TestTables.Run r = TestTables.tally(spark, "--input", pq.toString(), "--format", "parquet",
                "--out", fromPq.toString(), "--max-parents", "1");
        assertEquals(0, r.status(), r.err());
        assertArrayEquals(Files.readAllBytes(fromCsv.resolve(StoreFormat.COUNTS)),
                Files.readAllBytes(fromPq.resolve(StoreFormat.COUNTS)));
        assertEquals("parquet", TestTables.read(fromPq).manifest().input().format());

        Path holes = TestTables.write(dir.resolve("holes.csv"), "u,v\n1,a\n,b\n2,\n1,b\n2,a\n");
        Path drop = dir.resolve("drop");
        assertEquals(0, TestTables.tally(spark, "--input", holes.toString(), "--out", drop.toString(),
                "--missing", "drop").status());
        ScoreStore d = TestTables.read(drop);
        assertEquals(3, d.manifest().input().rows());
        assertEquals(2, d.manifest().input().droppedRows());
        assertEquals("drop", d.manifest().input().missingPolicy());
        Path state = dir.resolve("state");
        assertEquals(0, TestTables.tally(spark, "--input", holes.toString(), "--out", state.toString(),
                "--missing", "state").status());
        ScoreStore st = TestTables.read(state);
        assertEquals(5, st.manifest().input().rows());
        assertEquals(List.of("1", "2", "(missing)"), st.variables().get(0).states());
        assertArrayEquals(new long[] {2, 2, 1}, st.family(0).counts());
    }
}
