package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;
import org.edgewise.job.plan.FamilyPlan;
import org.junit.jupiter.api.Test;

/**
 * Refusals decided from the header and the options, before the rows are read: one line, exit
 * status 2, in seconds, the inputs byte for byte as they were and nothing left in the output's
 * folder.
 */
class BoundsTest extends TestTables.Refusals {
    /** Runs tally with {@code args} (after --out) and checks the refusal, the time, the inputs and the output folder. */
    static void refused(String expected, double seconds, List<Path> inputs, String... args) {
        Path outDir = nextOut();
        List<String> all = new ArrayList<>(List.of("--out", outDir.resolve("store").toString()));
        all.addAll(List.of(args));
        List<byte[]> before = inputs.stream().map(BoundsTest::bytes).toList();
        long t0 = System.nanoTime();
        TestTables.Run r = TestTables.tally(spark, all.toArray(String[]::new));
        double took = (System.nanoTime() - t0) / 1e9;
        assertEquals(2, r.status(), r.err());
        assertEquals(expected, r.err());
        assertFalse(r.err().contains("\n"), "one line");
        assertTrue(took < seconds, "refused in " + took + " s, bound " + seconds + " s");
        for (int i = 0; i < inputs.size(); i++) {
            assertArrayEquals(before.get(i), bytes(inputs.get(i)), "input unchanged: " + inputs.get(i));
        }
        if (Files.exists(outDir)) {
            try (Stream<Path> s = Files.list(outDir)) {
                assertEquals(List.of(), s.toList(), "nothing written, no temporary or probe left");
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
        }
    }

    static byte[] bytes(Path p) {
        try {
            return Files.isRegularFile(p) ? Files.readAllBytes(p) : new byte[0];
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Item 11: the family count is refused from the header alone: a bad row further down is never reached. */
    @Test
    void tooManyFamiliesAreRefusedFromTheHeaderBeforeTheScan() {
        int n = 400;
        StringBuilder sb = new StringBuilder();
        for (int c = 0; c < n; c++) {
            sb.append(c == 0 ? "" : ",").append("c").append(c);
        }
        sb.append('\n');
        for (int t = 0; t < 2000; t++) {
            for (int c = 0; c < n; c++) {
                sb.append(c == 0 ? "" : ",").append((t * 7 + c) % 3);
            }
            sb.append('\n');
        }
        sb.append("1,2\n"); // a short row: the scan would refuse it; the plan refusal comes first
        Path wide = TestTables.write(dir.resolve("wide.csv"), sb.toString());
        int[][] all = new int[n][];
        for (int i = 0; i < n; i++) {
            int me = i;
            all[i] = java.util.stream.IntStream.range(0, n).filter(v -> v != me).toArray();
        }
        double families = FamilyPlan.familyCount(all, new int[n][0], 5);
        long heap = Runtime.getRuntime().maxMemory();
        refused("tally: cannot plan the tally: 400 variables with --max-parents 5 give "
                + String.format(Locale.ROOT, "%,.0f", families) + " families, at least "
                + FamilyPlan.bytes(families * 160) + " on the driver, more than half its memory ("
                + FamilyPlan.bytes(heap) + "); lower --max-parents or use --candidates K",
                30, List.of(wide), "--input", wide.toString(), "--max-parents", "5");
    }

    /** Item 11: with --candidates K the count is that of K parents per child, also decided before the scan. */
    @Test
    void tooManyFamiliesWithCandidatesAreRefusedBeforeTheScan() {
        int n = 400;
        StringBuilder sb = new StringBuilder();
        for (int c = 0; c < n; c++) {
            sb.append(c == 0 ? "" : ",").append("c").append(c);
        }
        sb.append("\n1,2\n");
        Path wide = TestTables.write(dir.resolve("wide-k.csv"), sb.toString());
        int[][] kept = new int[n][200];
        double families = FamilyPlan.familyCount(kept, new int[n][0], 8);
        long heap = Runtime.getRuntime().maxMemory();
        refused("tally: cannot plan the tally: 400 variables with --max-parents 8 give "
                + String.format(Locale.ROOT, "%,.0f", families) + " families, at least "
                + FamilyPlan.bytes(families * 160) + " on the driver, more than half its memory ("
                + FamilyPlan.bytes(heap) + "); lower --max-parents or use --candidates K",
                30, List.of(wide), "--input", wide.toString(), "--max-parents", "8", "--candidates", "200");
    }

    /** Item 9: a header line longer than 1 MiB is refused without reading it whole. */
    @Test
    void aHeaderLineBeyondOneMebibyteIsRefused() {
        StringBuilder sb = new StringBuilder();
        for (int c = 0; sb.length() < (3 << 19); c++) {
            sb.append(c == 0 ? "" : ",").append("column").append(c);
        }
        sb.append("\n");
        Path longHeader = TestTables.write(dir.resolve("long-header.csv"), sb.toString());
        refused("tally: input " + longHeader + " line 1: the header line is longer than 1,048,576 bytes (1 MiB) without a"
                + " line break; a CSV file starts with one line naming its columns",
                30, List.of(longHeader), "--input", longHeader.toString());
    }

    /** Item 10: --partitions is bounded, with the figure and the limit. */
    @Test
    void tooManyPartitionsAreRefused() {
        refused("tally: --partitions must be between 1 and 10000, got 100000 (a few partitions per core is enough)",
                30, List.of(good), "--input", good.toString(), "--partitions", "100000");
    }

    /** Items 10 and 15: a FIFO would block the read; it is named for what it is, at once. */
    @Test
    void aFifoIsRefusedWithoutBlocking() throws Exception {
        Path fifo = dir.resolve("fifo.csv");
        Process mk = new ProcessBuilder("mkfifo", fifo.toString()).inheritIO().start();
        assertEquals(0, mk.waitFor());
        refused("tally: input " + fifo + " is a FIFO, not a file", 30, List.of(), "--input", fifo.toString());
        assertTrue(Files.exists(fifo, java.nio.file.LinkOption.NOFOLLOW_LINKS) && !Files.isRegularFile(fifo), "FIFO kept");
    }

    /** Items 9 and 15: /dev/zero (endless, no line break) is a device, named so, not read. */
    @Test
    void aDeviceIsRefused() {
        refused("tally: input /dev/zero is a character device, not a file", 30, List.of(), "--input", "/dev/zero",
                "--format", "csv");
    }

    /** Item 15: a loop of symbolic links is named as such, not "no such file". */
    @Test
    void aSymbolicLinkLoopIsNamed() throws IOException {
        Path a = dir.resolve("loop-a.csv");
        Path b = dir.resolve("loop-b.csv");
        Files.createSymbolicLink(a, b);
        Files.createSymbolicLink(b, a);
        refused("tally: input " + a + " is a loop of symbolic links, not a file", 30, List.of(), "--input", a.toString());
        assertTrue(Files.isSymbolicLink(a) && Files.isSymbolicLink(b), "links kept");
    }

    /** Item 14: required edges forming a cycle are refused, naming the cycle. */
    @Test
    void aCycleOfRequiredEdgesIsRefused() {
        refused("tally: --require: the required edges form a cycle (u->v->u); a DAG can hold at most all but one of them",
                30, List.of(good), "--input", good.toString(), "--require", "u->v,v->u");
        Path three = TestTables.write(dir.resolve("three.csv"), "a,b,c\n1,2,3\n2,1,3\n");
        refused("tally: --require: the required edges form a cycle (a->b->c->a); a DAG can hold at most all but one of them",
                30, List.of(three), "--input", three.toString(), "--require", "a->b", "--require", "b->c,c->a");
    }

    /** Item 14: K2 has no equivalent sample size; one given is refused rather than stored. */
    @Test
    void anEssWithK2IsRefused() {
        refused("tally: --ess does not apply to score k2: K2 has no equivalent sample size (every Dirichlet parameter is 1)",
                30, List.of(good), "--input", good.toString(), "--score", "k2", "--ess", "5");
    }

    /** Item 14: the same input twice (by text or by real path) would be counted twice. */
    @Test
    void theSameInputTwiceIsRefused() throws IOException {
        refused("tally: --input " + good + " is given twice; its rows would be counted twice",
                30, List.of(good), "--input", good.toString(), "--input", good.toString());
        Path link = dir.resolve("link-to-good.csv");
        Files.createSymbolicLink(link, good);
        refused("tally: --input " + link + " is the same as --input " + good + "; its rows would be counted twice",
                30, List.of(good), "--input", good.toString(), "--input", link.toString());
    }

    /** Item 15: CR-only line endings are named as such, not "text after a closing quote". */
    @Test
    void carriageReturnLineEndingsAreNamed() {
        String expected = " lines end in a carriage return alone (CR, old Mac line endings); convert them to LF or CRLF,"
                + " e.g. tr '\\r' '\\n' < in.csv > out.csv";
        Path quoted = TestTables.write(dir.resolve("cr-quoted.csv"), "\"a\",\"b\"\r\"1\",\"2\"\r\"2\",\"1\"\r");
        refused("tally: input " + quoted + ":" + expected, 30, List.of(quoted), "--input", quoted.toString());
        Path plain = TestTables.write(dir.resolve("cr-plain.csv"), "a,b\r1,2\r2,1\r");
        refused("tally: input " + plain + ":" + expected, 30, List.of(plain), "--input", plain.toString());
        StringBuilder big = new StringBuilder("a,b\r");
        while (big.length() < (3 << 19)) {
            big.append("1,2\r");
        }
        Path large = TestTables.write(dir.resolve("cr-large.csv"), big.toString());
        refused("tally: input " + large + ":" + expected, 30, List.of(large), "--input", large.toString());
    }

    /** Item 15: a quoted header name holding a line break is named as that. */
    @Test
    void aLineBreakInAQuotedHeaderIsNamed() {
        Path f = TestTables.write(dir.resolve("nl-header.csv"), "\"a\nb\",c\n1,2\n");
        refused("tally: input " + f + " line 1: column 1: unterminated quote (opened at character 1); a column name"
                + " cannot hold a line break", 30, List.of(f), "--input", f.toString());
    }

    /** Item 15: a directory of CSV and Parquet files is named with one file of each format. */
    @Test
    void aDirectoryOfMixedFormatsIsNamed() throws IOException {
        Path mixed = Files.createDirectories(dir.resolve("mixed"));
        TestTables.write(mixed.resolve("a.csv"), "u,v\n1,2\n");
        TestTables.write(mixed.resolve("b.parquet"), "not really parquet");
        refused("tally: input " + mixed + " holds csv and parquet files (" + mixed + "/a.csv, " + mixed
                + "/b.parquet); give inputs of one format", 30, List.of(mixed.resolve("a.csv"), mixed.resolve("b.parquet")),
                "--input", mixed.toString());
    }
}
