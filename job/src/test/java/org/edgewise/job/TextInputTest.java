package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Text read as written: an encoding option (invalid bytes refused with the line, never replaced),
 * RFC 4180 doubled quotes (RFC 4180 §2, rule 7), .tsv read with tabs, one whitespace rule (Java's
 * String.trim, as the driver's case parser), and a missing-value label that cannot pass for data.
 * Each of these was silently wrong before. Messages word for word.
 */
class TextInputTest {
    @TempDir
    static Path dir;

    static ScoreStore tally(Path input, String... extra) {
        return TestTables.tallyInto(dir, input, extra);
    }

    static void refused(String expected, Path input, String... extra) throws IOException {
        TestTables.assertRefused(dir, expected, input, extra);
    }

    @Test
    void latin1IsRefusedAsUtf8AndReadWithItsEncoding() throws IOException {
        Path f = Files.write(dir.resolve("latin1.csv"), "drink,n\ntea,1\ncafé,2\ncafè,1\n".getBytes(StandardCharsets.ISO_8859_1));
        refused("tally: input " + f + " line 3, column 'drink': bytes that are not valid UTF-8; pass --encoding with the"
                + " file's encoding, e.g. --encoding ISO-8859-1", f);
        ScoreStore s = tally(f, "--encoding", "ISO-8859-1");
        assertEquals(List.of("cafè", "café", "tea"), s.variables().get(0).states()); // two states, sorted by code point
        Path h = Files.write(dir.resolve("latin1-header.csv"), "café,n\n1,2\n".getBytes(StandardCharsets.ISO_8859_1));
        refused("tally: input " + h + " line 1: bytes that are not valid UTF-8; pass --encoding with the file's"
                + " encoding, e.g. --encoding ISO-8859-1", h);
        refused("tally: --encoding: unknown encoding 'klingon' (e.g. UTF-8, ISO-8859-1, windows-1252)", h,
                "--encoding", "klingon");
    }

    @Test
    void doubledQuotesAreOneQuote() {
        Path f = TestTables.write(dir.resolve("quotes.csv"), "said,n\n\"say \"\"hi\"\"\",1\nbye,2\n\"a,b\",1\n");
        assertEquals(List.of("a,b", "bye", "say \"hi\""), tally(f).variables().get(0).states());
    }

    @Test
    void tsvIsReadWithTabs() {
        Path f = TestTables.write(dir.resolve("t.tsv"), "a\tb\nx,1\t2\ny\t3\n");
        ScoreStore s = tally(f);
        assertEquals(2, s.variables().size());
        assertEquals(List.of("x,1", "y"), s.variables().get(0).states());
    }

    @Test
    void spacesAroundAValueAreNotPartOfIt() {
        Path f = TestTables.write(dir.resolve("spaces.csv"), " a , b\nx,1\n x ,2\nx\t, 1 \n");
        ScoreStore s = tally(f);
        assertEquals("a", s.variables().get(0).name());
        assertEquals(List.of("x"), s.variables().get(0).states());
        assertEquals(List.of("1", "2"), s.variables().get(1).states());
    }

    @Test
    void theMissingLabelCannotCollideWithData() throws IOException {
        Path f = TestTables.write(dir.resolve("collide.csv"), "a,b\n(missing),1\n,2\nx,1\n");
        refused("tally: input " + f + ", column 'a': the value '(missing)' is also the label --missing state gives to"
                + " empty fields; rename that value or choose --missing drop", f, "--missing", "state");
    }
}
