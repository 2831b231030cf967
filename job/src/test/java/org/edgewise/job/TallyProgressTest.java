package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import org.junit.jupiter.api.Test;
import org.slf4j.LoggerFactory;

/** The progress line's text (asserted word for word: users read it) and its in-place redraw. */
class TallyProgressTest {
    @Test
    void lineSaysFamiliesRateAndTimeLeft() {
        // 2 of 5 passes over 600,000 rows in 10 s: 120,000 rows/s; 240 of 600 families in 10 s -> 15 s left
        assertEquals("families: pass 2/5, 240/600 families (40%), 120 k rows/s, about 15 s left",
                TallyProgress.line("families", 2, 5, 240, 600, 1_200_000, 10.0));
        assertEquals("pairs: pass 1/1, 20/20 families (100%), 950 rows/s, done in 2 s",
                TallyProgress.line("pairs", 1, 1, 20, 20, 1900, 2.0));
        assertEquals("families: pass 1/3, 0/10 families (0%), 0 rows/s, time left unknown",
                TallyProgress.line("families", 1, 3, 0, 10, 0, 1.0));
        // 1 of 3 families in 100 s: 200 s left
        assertEquals("families: pass 1/9, 1/3 families (33%), 4.5 M rows/s, about 3 min 20 s left",
                TallyProgress.line("families", 1, 9, 1, 3, 450_000_000, 100.0));
    }

    @Test
    void ratesAndDurations() {
        assertEquals("999", TallyProgress.rate(999));
        assertEquals("9.5 k", TallyProgress.rate(9_500));
        assertEquals("45 k", TallyProgress.rate(45_200));
        assertEquals("1.2 G", TallyProgress.rate(1.2e9));
        assertEquals("59 s", TallyProgress.duration(59.4));
        assertEquals("1 min 00 s", TallyProgress.duration(59.6));
        assertEquals("59 min 59 s", TallyProgress.duration(3599));
        assertEquals("2 h 07 min", TallyProgress.duration(2 * 3600 + 7 * 60 + 10));
    }

    /** On a terminal each update overwrites the line (\r, padded over a longer one), a newline after the last pass. */
    @Test
    void terminalRedrawsInPlace() {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        PrintStream term = new PrintStream(bytes, true, StandardCharsets.UTF_8);
        TallyProgress p = new TallyProgress("pairs", 10, 2, 1000, term, LoggerFactory.getLogger("test"), 0L);
        p.update(1, 5, 1_000_000_000L);
        p.update(2, 10, 2_000_000_000L);
        String first = "pairs: pass 1/2, 5/10 families (50%), 1.0 k rows/s, about 1 s left";
        String second = "pairs: pass 2/2, 10/10 families (100%), 1.0 k rows/s, done in 2 s";
        String pad = " ".repeat(Math.max(0, first.length() - second.length()));
        assertEquals("\r" + first + "\r" + second + pad + "\n", bytes.toString(StandardCharsets.UTF_8));
    }
}
