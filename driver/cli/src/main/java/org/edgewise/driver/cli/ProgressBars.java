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
        chainState(new ChainState(acceptance, maxRhat, minEss, Double.NaN, 1.01, 400, Double.NaN));
    }

    @Override
    public synchronized void chainState(ChainState s) {
        if (bar != null) {
            bar.extra(line(s));
        }
    }

    /** The bar's MCMC text: acceptance, then each figure of the last check with its target. */
    static String line(ChainState s) {
        return String.format(Locale.ROOT, "acceptance %.3f  worst R-hat %s (< %s)  min eff. n %s (>= %.0f)%s", s.acceptance(),
                Double.isNaN(s.maxRhat()) ? "-" : Double.isInfinite(s.maxRhat()) ? "inf" : String.format(Locale.ROOT, "%.3f", s.maxRhat()),
                UnknownOrderEdges.trim(s.rhatTarget()), Double.isNaN(s.minEss()) ? "-" : String.format(Locale.ROOT, "%.0f", s.minEss()),
                s.essTarget(), Double.isNaN(s.mcseTarget()) ? "" : String.format(Locale.ROOT, "  max MCSE %s (<= %s)",
                        Double.isNaN(s.maxMcse()) ? "-" : String.format(Locale.ROOT, "%.4f", s.maxMcse()),
                        UnknownOrderEdges.trim(s.mcseTarget())));
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
