package org.edgewise.driver.cli;

import me.tongfei.progressbar.ConsoleProgressBarConsumer;
import me.tongfei.progressbar.ProgressBar;
import me.tongfei.progressbar.ProgressBarBuilder;
import me.tongfei.progressbar.ProgressBarStyle;

/**
 * A progress bar on standard error for slow driver work — shown only when the program runs on
 * a terminal ({@code System.console() != null}), silent otherwise (pipes, CI logs, tests).
 * <pre>
 * try (Progress p = Progress.start("sampling", rows)) { … p.step(k); p.extra("12 MB"); … }
 * </pre>
 */
public final class Progress implements AutoCloseable {
    private final ProgressBar bar;

    private Progress(ProgressBar bar) {
        this.bar = bar;
    }

    /** Starts a bar named {@code name} counting to {@code total} (≤ 0: unknown total). */
    public static Progress start(String name, long total) {
        return start(name, total, System.console() != null);
    }

    /** As {@link #start(String, long)}, with the terminal decision made by the caller (tests). */
    static Progress start(String name, long total, boolean show) {
        if (!show) {
            return new Progress(null);
        }
        ProgressBar bar = new ProgressBarBuilder().setTaskName(name).setInitialMax(total > 0 ? total : -1)
                .setStyle(ProgressBarStyle.ASCII).setUpdateIntervalMillis(250)
                .setConsumer(new ConsoleProgressBarConsumer(System.err)).showSpeed().build();
        return new Progress(bar);
    }

    /** Whether a bar is shown. */
    public boolean visible() {
        return bar != null;
    }

    /** Advances by {@code n} units. */
    public void step(long n) {
        if (bar != null) {
            bar.stepBy(n);
        }
    }

    /** Sets the short message shown after the bar. */
    public void extra(String message) {
        if (bar != null) {
            bar.setExtraMessage(message);
        }
    }

    @Override
    public void close() {
        if (bar != null) {
            bar.close();
        }
    }
}
