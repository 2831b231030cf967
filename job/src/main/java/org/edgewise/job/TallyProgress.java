package org.edgewise.job;

import java.io.PrintStream;
import java.util.Locale;
import org.slf4j.Logger;

/**
 * Progress of one counting stage (the pairwise candidate pass, or the families): after each pass
 * over the data, the families done out of the total, the rows read per second over the passes so
 * far, and an estimate of the time left. On a terminal the line is redrawn in place ({@code \r});
 * otherwise (a log file, spark-submit's output captured by a scheduler) each update is a plain
 * log line.
 *
 * <p>The estimate is a linear extrapolation (common practice): time so far × (families left /
 * families done). Passes of a stage count comparable numbers of cells, so it is rough but not
 * biased one way; the first pass also pays for Spark's start of the stage.
 */
public final class TallyProgress {
    private final String what;
    private final int families;
    private final int passes;
    private final long rows;
    private final PrintStream terminal;
    private final Logger log;
    private final long startNanos;
    private int width;

    /**
     * @param terminal where to redraw the line in place, or null to log each update through {@code log}
     */
    TallyProgress(String what, int families, int passes, long rows, PrintStream terminal, Logger log, long startNanos) {
        this.what = what;
        this.families = families;
        this.passes = passes;
        this.rows = rows;
        this.terminal = terminal;
        this.log = log;
        this.startNanos = startNanos;
    }

    /** Redraws in place on stderr (as the run found it: {@link SparkLog}) when the JVM has a console, else logs. */
    static TallyProgress start(String what, int families, int passes, long rows, Logger log) {
        PrintStream t = System.console() != null ? SparkLog.terminal() : null;
        return new TallyProgress(what, families, passes, rows, t, log, System.nanoTime());
    }

    /** After pass {@code pass} (1-based) with {@code done} families finished, at {@code nowNanos}. */
    void update(int pass, int done, long nowNanos) {
        String line = line(what, pass, passes, done, families, rows * (long) pass, (nowNanos - startNanos) / 1e9);
        if (terminal == null) {
            log.info(line);
            return;
        }
        // pad over a longer previous line; a newline after the last pass
        String padded = line + " ".repeat(Math.max(0, width - line.length()));
        width = line.length();
        terminal.print("\r" + padded + (pass == passes ? "\n" : ""));
        terminal.flush();
    }

    /**
     * The text of one update, e.g. {@code families: pass 2/5, 240/600 families (40%), 1.2 M rows/s,
     * about 12 s left}. The rate is rows read (rows × passes done) per second since the stage
     * started; the estimate is {@code seconds × (total − done) / done}, none before the first
     * family is done, "done" after the last.
     */
    static String line(String what, int pass, int passes, int done, int total, long rowsRead, double seconds) {
        StringBuilder sb = new StringBuilder();
        sb.append(what).append(": pass ").append(pass).append('/').append(passes).append(", ")
                .append(done).append('/').append(total).append(" families (")
                .append(total == 0 ? 100 : (int) Math.floor(100.0 * done / total)).append("%), ")
                .append(rate(rowsRead / Math.max(seconds, 1e-9))).append(" rows/s, ");
        if (done >= total) {
            sb.append("done in ").append(duration(seconds));
        } else if (done == 0) {
            sb.append("time left unknown");
        } else {
            sb.append("about ").append(duration(seconds * (total - done) / done)).append(" left");
        }
        return sb.toString();
    }

    /** 950, 9.5 k, 45 k, 1.2 M (SI prefixes; one decimal below 10, none above). */
    static String rate(double perSecond) {
        if (perSecond < 1000) {
            return String.format(Locale.ROOT, "%.0f", perSecond);
        }
        String[] unit = {"k", "M", "G", "T"};
        double x = perSecond;
        int u = -1;
        while (x >= 1000 && u < unit.length - 1) {
            x /= 1000;
            u++;
        }
        return String.format(Locale.ROOT, x < 10 ? "%.1f %s" : "%.0f %s", x, unit[u]);
    }

    /** 42 s, 3 min 05 s, 2 h 07 min (rounded to the second, to the minute from an hour on). */
    static String duration(double seconds) {
        long s = Math.round(seconds);
        if (s < 60) {
            return s + " s";
        }
        if (s < 3600) {
            return String.format(Locale.ROOT, "%d min %02d s", s / 60, s % 60);
        }
        long m = Math.round(seconds / 60);
        return String.format(Locale.ROOT, "%d h %02d min", m / 60, m % 60);
    }
}
