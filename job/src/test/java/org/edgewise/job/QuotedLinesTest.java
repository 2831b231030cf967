package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Issue 11: RFC 4180 §2 rule 6 (a quoted field may hold line breaks) end to end, and line numbers
 * that count every physical line. {@code simulate}'s writer (the one {@link ForwardSampler}) and
 * {@code tally} round-trip states holding a quote, a comma and a line break; the counts equal an
 * independent recount (InMemoryTally's per-row loop over the sampled state indices) whatever the
 * partitioning. Truly malformed rows keep their refusals, word for word.
 */
class QuotedLinesTest {
    @TempDir
    static Path dir;

    /** Network a → b; a's labels hold a quote, a comma, a line break (and one plain label). */
    static final List<String> A = List.of("plain", "say \"hi\"", "Rome, Italy", "line one\nline two");

    static Network network() {
        return Network.of("test", "quoted", "", List.of("a", "b"), List.of(A, List.of("0", "1")),
                List.of(List.of(), List.of("a")),
                List.of(new double[][] {{0.4, 0.2, 0.2, 0.2}},
                        new double[][] {{0.9, 0.1}, {0.2, 0.8}, {0.5, 0.5}, {0.7, 0.3}}));
    }

    static ScoreStore tally(Path input, String... extra) {
        return TestTables.tallyInto(dir, input, extra);
    }

    static void refused(String expected, Path input) throws IOException {
        TestTables.assertRefused(dir, expected, input);
    }

    @Test
    void simulateThenTallyRoundTripsQuotesCommasAndLineBreaks() throws IOException {
        Network net = network();
        int rows = 600;
        Path csv = dir.resolve("simulated.csv");
        try (OutputStream o = Files.newOutputStream(csv)) {
            new ForwardSampler(net).writeCsv(rows, 17, o, n -> { });
        }
        ScoreStore s = tally(csv, "--max-parents", "1");
        List<String> sorted = new ArrayList<>(A);
        java.util.Collections.sort(sorted); // the store orders text states by code point
        assertEquals(sorted, s.variables().get(0).states());
        assertEquals(rows, s.manifest().input().rows());

        // independent recount of the same draws (writeCsv and sample draw alike from one seed)
        int[][] drawn = new ForwardSampler(net).sample(rows, 17);
        String[][] labels = {A.toArray(String[]::new), {"0", "1"}};
        ScoreStore ref = InMemoryTally.tally(s.variables(), TestTables.encodeWith(s.variables(), labels, drawn), 1,
                FamilyScore.withDefaults());
        assertSameCounts(ref, s);

        // partition invariance: a file read whole is spread over tasks; --partitions 3 gives the same store
        ScoreStore p3 = tally(csv, "--max-parents", "1", "--partitions", "3");
        assertSameCounts(ref, p3);
        assertEquals(s.manifest().input().fingerprint(), p3.manifest().input().fingerprint());
    }

    private static void assertSameCounts(ScoreStore ref, ScoreStore s) {
        TestTables.assertSameFamilies(ref, s, -1);
    }

    @Test
    void malformedRowsAreStillRefusedNamingTheirPhysicalLine() throws IOException {
        // lines: 1 header, 2-3 one row, 4 blank, 5 row, 6 blank, 7 three fields
        Path bad = TestTables.write(dir.resolve("bad-after-break.csv"), "a,b\n\"x\ny\",1\n\np,2\n\nq,1,3\nq,1\n");
        refused("tally: input " + bad + " line 7: 3 fields, the header has 2 (1 malformed row in all)", bad);
        // a quote never closed would swallow the rest of the file: read line by line, its row is refused
        Path open = TestTables.write(dir.resolve("open.csv"), "a,b\nx,1\n\np,2\n\"q,1\nr,2\n");
        refused("tally: input " + open + " line 5: 1 field, the header has 2 (1 malformed row in all)", open);
    }

    @Test
    void lineNumbersCountBlankLines() throws IOException {
        Path holes = TestTables.write(dir.resolve("blank-then-hole.csv"), "a,b\nx,1\n\n\n  \ny,\nx,2\n");
        refused("tally: input " + holes + " line 6, column 'b': missing value (1 missing value in all); choose"
                + " --missing drop or --missing state", holes);
        Path many = TestTables.write(dir.resolve("blank-then-many.csv"), "\na,b\n\nx,1\n\ny,2,3\n");
        refused("tally: input " + many + " line 6: 3 fields, the header has 2 (1 malformed row in all)", many);
    }
    /**
     * A file name the JVM cannot represent (a NUL; an unpaired UTF-16 surrogate, which no UTF-8 byte
     * sequence encodes) is one line naming the option, not a Java exception's name.
     */
    @Test
    void aPathTheSystemCannotRepresentIsOneLineNamingTheOption() {
        Path good = TestTables.write(dir.resolve("fine.csv"), "a,b\nx,1\n");
        TestTables.Run out = TestTables.tally(SharedSpark.session(), "--input", good.toString(), "--out", "st\u0000ore");
        assertEquals(2, out.status());
        assertEquals("tally: --out: 'st\\u0000ore' is not a file name this system can use: it holds a NUL character",
                out.err());
        TestTables.Run in = TestTables.tally(SharedSpark.session(), "--input", "d\uDC80ta.csv", "--out", dir.resolve("s").toString());
        assertEquals(2, in.status());
        assertEquals("tally: --input: 'd\\uDC80ta.csv' is not a file name this system can use: it holds a character the"
                + " platform encoding " + System.getProperty("sun.jnu.encoding") + " cannot represent", in.err());
    }
}
