package org.edgewise.driver.report;

import java.util.Locale;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.WordedError;

/**
 * A report whose n × n parts (the heatmap's cells, the pairs) would not fit the heap, refused before
 * any of it is built. Carries the figures; a front end names how to give the JVM more memory.
 */
public final class TooLargeToReport extends WordedError {
    /** Memory one cell of the n × n parts needs while the report is built (measured: ~147 characters of HTML, as UTF-16, the builder's growth and the final copies). */
    public static final long BYTES_PER_CELL = 900;

    private final int variables;
    private final long heapBytes;

    TooLargeToReport(int variables, long heapBytes) {
        super(text(variables, heapBytes) + "; give the JVM more heap");
        this.variables = variables;
        this.heapBytes = heapBytes;
    }

    /** Refuses a report of {@code variables} whose build would need more than half of {@code heapBytes}. */
    public static void check(int variables, long heapBytes) {
        if (need(variables) > heapBytes / 2.0) {
            throw new TooLargeToReport(variables, heapBytes);
        }
    }

    static double need(int variables) {
        return (double) variables * variables * BYTES_PER_CELL;
    }

    private static String text(int variables, long heapBytes) {
        return String.format(Locale.ROOT, "a report of %d variables (a %d × %d heatmap) needs about %d MiB to read and build,"
                        + " more than half the heap (%d MiB)", variables, variables, variables,
                Math.round(need(variables) / (1 << 20)), heapBytes >> 20);
    }

    @Override
    public String worded(InputNames names, String heapSetting) {
        return text(variables, heapBytes) + "; raise it with " + heapSetting;
    }
}
