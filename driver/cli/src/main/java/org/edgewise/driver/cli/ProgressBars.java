package org.edgewise.driver.cli;

import java.util.Locale;
import org.edgewise.driver.ProgressListener;

/**
 * The core's {@link ProgressListener} shown as a {@link Progress} bar on standard error (only on a
 * terminal): one bar per task, MCMC's acceptance and largest R-hat after it.
 */
final class ProgressBars implements ProgressListener {
    private final boolean show;
    private Progress bar;
    private long shown;

    private ProgressBars(boolean show) {
        this.show = show;
    }

    /** Bars on standard error when running on a terminal. */
    static ProgressListener onTerminal() {
        return new ProgressBars(System.console() != null);
    }

    @Override
    public synchronized void start(String task, long total) {
        finish();
        bar = Progress.start(task, total, show);
        shown = 0;
    }

    @Override
    public synchronized void done(long done) {
        if (bar != null && done > shown) {
            bar.step(done - shown);
            shown = done;
        }
    }

    @Override
    public synchronized void chainState(double acceptance, double maxRhat, double minEss) {
        if (bar != null) {
            bar.extra(String.format(Locale.ROOT, "acceptance %.3f  worst R-hat %s (< 1.01)  min ESS %s (>= 400)", acceptance,
                    Double.isNaN(maxRhat) ? "-" : String.format(Locale.ROOT, "%.3f", maxRhat),
                    Double.isNaN(minEss) ? "-" : String.format(Locale.ROOT, "%.0f", minEss)));
        }
    }

    /** Notes go to standard error whether or not a bar is shown (they are one line each). */
    @Override
    public synchronized void note(String line) {
        System.err.println(line);
    }

    @Override
    public synchronized void finish() {
        if (bar != null) {
            bar.close();
            bar = null;
        }
    }
}
