package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

/** Issue 23: a report's n × n parts are planned against the heap before any is built. */
class TooLargeToReportTest {
    @Test
    void eightHundredVariablesAtASmallHeapAreRefusedWithTheFigures() {
        TooLargeToReport e = assertThrows(TooLargeToReport.class, () -> TooLargeToReport.check(800, 256L << 20));
        assertEquals("a report of 800 variables (a 800 × 800 heatmap) needs about 549 MiB to read and build, more than half the"
                + " heap (256 MiB); give the JVM more heap", e.getMessage());
        TooLargeToReport.check(13, 256L << 20);
        TooLargeToReport.check(100, 256L << 20);
    }
}
