package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * Every bad input is refused with one line naming the file and line, column or variable, exit
 * status 2, and no store (nor a temporary sibling) is left behind. Messages are asserted word for
 * word: users read them.
 */
class BadInputTest extends TestTables.Refusals {
    /** Runs tally on {@code input} into a fresh folder and checks the refusal and that nothing was written. */
    static void refused(String expected, Path input, String... extra) {
        Path outDir = nextOut();
        List<String> args = new ArrayList<>(List.of("--input", input.toString(), "--out", outDir.resolve("store").toString()));
        args.addAll(List.of(extra));
        TestTables.Run r = TestTables.tally(spark, args.toArray(String[]::new));
        assertEquals(2, r.status(), r.err());
        assertEquals(expected, r.err());
        assertFalse(r.err().contains("\n"), "one line");
        if (Files.exists(outDir)) {
            try (Stream<Path> s = Files.list(outDir)) {
                assertEquals(List.of(), s.toList(), "nothing written, no temporary left");
            } catch (IOException e) {
                throw new AssertionError(e);
            }
        }
    }

    static Path file(String name, String text) {
        return TestTables.write(dir.resolve(name), text);
    }

    /** Writes {@code text} to the file {@code name} and checks tally refuses it with "tally: input &lt;file&gt;" + {@code after}. */
    static void refusedFile(String name, String text, String after, String... extra) {
        Path input = file(name, text);
        refused("tally: input " + input + after, input, extra);
    }

    @Test
    void missingOrEmptyFiles() {
        Path none = dir.resolve("none.csv");
        refused("tally: input " + none + ": no such file or directory", none);
        refusedFile("empty.csv", "", ": the file is empty (no header line)");
        refusedFile("header.csv", "a,b,c\n", ": no data rows (only a header)");
    }

    @Test
    void malformedHeadersAndRows() {
        refusedFile("dup.csv", "a,b,a\n1,2,3\n", " line 1: duplicate column name 'a' (columns 1 and 3)");
        refusedFile("many.csv", "a,b,c\n1,2,3\n1,2,3\n1,2,3,4\n1,2,3\n",
                " line 4: 4 fields, the header has 3 (1 malformed row in all)");
        refusedFile("few.csv", "a,b,c\n1,2,3\n1,2\n1\n", " line 3: 2 fields, the header has 3 (2 malformed rows in all)");
    }

    @Test
    void tooManyStates() {
        StringBuilder id = new StringBuilder("id,x\n");
        StringBuilder wide = new StringBuilder("v,x\n");
        for (int t = 0; t < 200; t++) {
            if (t < 50) {
                id.append(t + 1).append(',').append(t % 2 == 0 ? "a" : "b").append('\n');
            }
            wide.append(t % 40).append(',').append(t % 2 == 0 ? "a" : "b").append('\n');
        }
        refusedFile("ids.csv", id.toString(),
                ": column 'id' has 50 distinct numeric values, more than --max-states 32; "
                + "it looks like an ID column (nearly every value is distinct): leave it out with --exclude id");
        refusedFile("wide.csv", wide.toString(),
                ": column 'v' has 40 distinct numeric values, more than --max-states 32; "
                + "discretise it, e.g. --discretize v=4, or raise --max-states");
        refusedFile("text.csv", "w\np\nq\nr\ns\np\nq\nr\ns\np\nq\n",
                ": column 'w' has 4 distinct values, more than --max-states 3; "
                + "raise --max-states or leave it out with --exclude w", "--max-states", "3");
    }

    @Test
    void missingValuesAndNonNumbers() {
        refusedFile("holes.csv", "u,v\n1,a\n1,\n,b\n",
                " line 3, column 'v': missing value (2 missing values in all); "
                + "choose --missing drop or --missing state");
        refusedFile("allholes.csv", "u,v\n1,\n,b\n",
                ": every row has a missing value; nothing is left to count after "
                + "--missing drop", "--missing", "drop");
        refusedFile("nan.csv", "x,y\n1.5,a\n2.5,b\nabc,a\n",
                " line 4, column 'x': 'abc' is not a number, but --discretize x=2 needs numbers", "--discretize", "x=2");
    }

    @Test
    void unknownNames() {
        refused("tally: --columns: no column 'z' in " + good + " (columns: u, v)", good, "--columns", "u,z");
        refused("tally: --exclude: no column 'z' in " + good + " (columns: u, v)", good, "--exclude", "z");
        refused("tally: --forbid u->z: no variable 'z' (variables: u, v)", good, "--forbid", "u->z");
        refused("tally: --require z->u: no variable 'z' (variables: u, v)", good, "--require", "z->u");
        refused("tally: --tiers: unknown variable 'z' (variables: u, v)", good, "--tiers", "u;z");
        refused("tally: --tiers: variable 'u' is in tiers 1 and 2", good, "--tiers", "u", "--tiers", "v,u");
        refused("tally: --tiers: empty variable name in 'u;'", good, "--tiers", "u;");
        refused("tally: --discretize: no variable 'z' among the selected columns (u, v)", good, "--discretize", "z=3");
        refused("tally: --require u->v contradicts --forbid u->v", good, "--require", "u->v", "--forbid", "u->v");
        refused("tally: --require v->u contradicts --tiers: 'v' is in a later tier than 'u'", good,
                "--require", "v->u", "--tiers", "u;v");
    }

    @Test
    void planThatCannotFitIsRefusedAtOnce() {
        refused("tally: cannot fit the tally: the variable set {u(2), v(2)} needs 4 count cells (48 B) in one task, "
                + "more than --memory-budget 40 B; lower --max-parents, use --candidates K, exclude or discretise wide "
                + "variables, or raise --memory-budget", good, "--memory-budget", "40");
    }

    /** 30 columns with --max-parents 10 ran for minutes and died of OutOfMemoryError; now refused from the count. */
    @Test
    void tooManyFamiliesAreRefusedBeforeThePlanIsBuilt() {
        StringBuilder sb = new StringBuilder();
        for (int c = 0; c < 30; c++) {
            sb.append(c == 0 ? "" : ",").append("c").append(c);
        }
        sb.append('\n');
        for (int t = 0; t < 4; t++) {
            for (int c = 0; c < 30; c++) {
                sb.append(c == 0 ? "" : ",").append((t + c) % 2);
            }
            sb.append('\n');
        }
        Path wide = file("thirty.csv", sb.toString());
        double families = org.edgewise.job.plan.FamilyPlan.familyCount(thirty(), new int[30][0], 10);
        long heap = Runtime.getRuntime().maxMemory();
        refused("tally: cannot plan the tally: 30 variables with --max-parents 10 give "
                + String.format(java.util.Locale.ROOT, "%,.0f", families) + " families, at least "
                + org.edgewise.job.plan.FamilyPlan.bytes(families * 160) + " on the driver, more than half its memory ("
                + org.edgewise.job.plan.FamilyPlan.bytes(heap) + "); lower --max-parents or use --candidates K",
                wide, "--max-parents", "10");
    }

    static int[][] thirty() {
        int[][] a = new int[30][];
        for (int i = 0; i < 30; i++) {
            int me = i;
            a[i] = java.util.stream.IntStream.range(0, 30).filter(v -> v != me).toArray();
        }
        return a;
    }

    @Test
    void aBudgetBeyondTheHeapIsRefusedAtOnce() {
        long heap = Runtime.getRuntime().maxMemory();
        refused("tally: --memory-budget 100 GB is more than the memory of this JVM ("
                + org.edgewise.job.plan.FamilyPlan.bytes(heap) + "); give at most that, or give this JVM more memory",
                good, "--memory-budget", "100g");
    }

    @Test
    void existingStoreIsNotReplacedWithoutOverwrite() throws IOException {
        Path out = dir.resolve("existing");
        Files.createDirectories(out);
        Files.writeString(out.resolve("keep.txt"), "mine");
        TestTables.Run r = TestTables.tally(spark, "--input", good.toString(), "--out", out.toString());
        assertEquals(2, r.status());
        assertEquals("tally: output " + out + " already exists; pass --overwrite to replace it", r.err());
        assertEquals("mine", Files.readString(out.resolve("keep.txt")));
        TestTables.Run bad = TestTables.tally(spark, "--input", good.toString(), "--out", out.toString(),
                "--max-parents", "two");
        assertEquals(2, bad.status());
        assertTrue(bad.err().startsWith("tally: Invalid value for option '--max-parents'"), bad.err());
    }

    /** Issue 23 item 8: an empty --input and a delimiter CSV cannot use are refused before Spark starts, not as a bug. */
    @Test
    void emptyInputNameAndUnusableDelimiters() {
        for (String name : List.of("", " ")) {
            TestTables.Run r = TestTables.tally(spark, "--input", name, "--out", nextOut().toString());
            assertEquals(2, r.status(), r.err());
            assertEquals("tally: --input '" + name + "' names no file; give a file or directory", r.err());
        }
        refused("tally: --delimiter cannot be '\"', which quotes CSV fields; give another character, e.g. ',' ';' or tab",
                good, "--delimiter", "\"");
        refused("tally: --delimiter cannot be a line break, which ends CSV rows; give another character, e.g. ',' ';' or tab",
                good, "--delimiter", "\n");
    }

    /** Issue 23 item 14: --discretize that would leave a column in one bin is refused, naming the bin. */
    @Test
    void discretizeToOneBin() throws IOException {
        Path constant = file("constant.csv", "x,v\n5,a\n5,b\n5,a\n5,b\n");
        byte[] before = Files.readAllBytes(constant);
        refused("tally: --discretize x=2 leaves column 'x' in one bin [5,5]: every value is 5; a constant column tells nothing "
                + "about the others, leave it out (--exclude x)", constant, "--discretize", "x=2");
        Path skewed = file("skewed.csv", "x,v\n0,a\n0,b\n0,a\n0,b\n0,a\n0,b\n0,a\n3,b\n7,a\n");
        refused("tally: --discretize x=2 leaves column 'x' in one bin [0,7]: at least 1/2 of its values are 0, its smallest, "
                + "so no cut point lies above it; leave --discretize x out to keep its values as states", skewed, "--discretize", "x=2");
        org.junit.jupiter.api.Assertions.assertArrayEquals(before, Files.readAllBytes(constant));
    }

    /**
     * Issue 23 item 14: --discretize that obtains two or more bins but fewer than asked says so in one
     * warning line naming the column and the bins, and the store holds those bins. The cut points are
     * the 1/4, 2/4 and 3/4 quantiles of 0,0,0,0,0,0,1,2,3,4 — the smallest value with at least q·n values
     * at or below it (common practice; Spark's approxQuantile is exact on so few rows): 0, 0 and 2; a
     * cut point at the minimum splits nothing, so one cut point (2) and two bins remain.
     */
    @Test
    void discretizeToFewerBinsThanAskedIsSaid() throws IOException {
        Path skewed = file("fewer.csv", "x,v\n0,a\n0,b\n0,a\n0,b\n0,a\n0,b\n1,a\n2,b\n3,a\n4,b\n");
        Path out = dir.resolve("fewer-out").resolve("store");
        TestTables.Run r = TestTables.tally(spark, "--input", skewed.toString(), "--out", out.toString(), "--discretize", "x=4");
        assertEquals(0, r.status(), r.err());
        assertEquals("tally: warning: --discretize x=4 cut column 'x' into 2 bins, not 4: [0,2), [2,4]; equal values share a "
                + "bin, so values repeated across a cut point leave fewer bins", r.err().strip());
        assertEquals(List.of("[0,2)", "[2,4]"), TestTables.read(out).variables().get(0).states());
        // as many bins as asked: nothing to say
        Path even = file("even.csv", "x,v\n1,a\n2,b\n3,a\n4,b\n");
        TestTables.Run e = TestTables.tally(spark, "--input", even.toString(), "--out", dir.resolve("even-out").toString(),
                "--discretize", "x=2");
        assertEquals(0, e.status(), e.err());
        assertEquals("", e.err().strip());
    }

    /**
     * Issue 23 item 14: one number written several ways in a numeric column stays several states
     * (the text is the state) and is said in one line on standard error; the tally still succeeds.
     */
    @Test
    void oneNumberWrittenSeveralWaysIsNamed() throws IOException {
        Path input = file("zeros.csv", "x,y,v\n0,7,a\n0.0,07,b\n-0,7,a\n1,8,b\n1.0,8,a\n2,8,b\n");
        byte[] before = Files.readAllBytes(input);
        Path out = dir.resolve("zeros-out").resolve("store");
        TestTables.Run r = TestTables.tally(spark, "--input", input.toString(), "--out", out.toString());
        assertEquals(0, r.status(), r.err());
        assertEquals("tally: warning: column 'x' writes one number 3 ways (-0, 0, 0.0; 1 more number likewise), kept as 3 states "
                + "since the text is the state; a query must name each as written (also in column 'y'); write each number one "
                + "way for one state", r.err().strip());
        assertTrue(Files.exists(out.resolve("manifest.json")));
        org.junit.jupiter.api.Assertions.assertArrayEquals(before, Files.readAllBytes(input));
        // one spelling per number: nothing to say
        Path clean = file("clean.csv", "x,v\n0,a\n1,b\n2,a\n");
        TestTables.Run c = TestTables.tally(spark, "--input", clean.toString(), "--out", dir.resolve("clean-out").toString());
        assertEquals(0, c.status(), c.err());
        assertEquals("", c.err().strip());
    }

    /** Issue 23 item 14: a column no query could name is refused before the rows are read, naming it. */
    @Test
    void columnNamesNoQueryCanName() throws IOException {
        Path comma = file("comma.csv", "\"a,b\",v\n1,x\n2,y\n");
        Path equals = file("equals.csv", "a=b,v\n1,x\n2,y\n");
        Path arrow = file("arrow.csv", "a->b,v\n1,x\n2,y\n");
        byte[] before = Files.readAllBytes(equals);
        refused("tally: input " + comma + ": column 'a,b' holds a comma, which splits every list of variables (--columns, --tiers, "
                + "--order, --case); rename it, or leave it out by listing the other columns in --columns", comma);
        refused("tally: input " + equals + ": column 'a=b' holds '=', which ends the variable's name in NAME=STATE (--case, "
                + "--given, --do); rename it, or leave it out with --exclude a=b", equals);
        refused("tally: input " + arrow + ": column 'a->b' holds '->', which splits FROM->TO (--forbid, --require); rename it, "
                + "or leave it out with --exclude a->b", arrow);
        org.junit.jupiter.api.Assertions.assertArrayEquals(before, Files.readAllBytes(equals));
        // left out, the other columns are tallied
        for (String[] way : List.of(new String[] {"--exclude", "a=b"}, new String[] {"--columns", "v"})) {
            TestTables.Run r = TestTables.tally(spark, "--input", (way[0].equals("--columns") ? comma : equals).toString(), "--out",
                    dir.resolve("named-" + cases++).toString(), way[0], way[1]);
            assertEquals(0, r.status(), r.err());
        }
    }
}
