package org.edgewise.job;

import java.io.FileOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.time.LocalDateTime;
import java.time.format.DateTimeFormatter;
import org.apache.logging.log4j.Level;
import org.apache.logging.log4j.LogManager;
import org.apache.logging.log4j.core.LoggerContext;
import org.apache.logging.log4j.core.config.Configurator;
import org.apache.logging.log4j.core.config.builder.api.ConfigurationBuilder;
import org.apache.logging.log4j.core.config.builder.api.ConfigurationBuilderFactory;
import org.apache.logging.log4j.core.config.builder.impl.BuiltConfiguration;

/**
 * Where the log goes while a {@code tally} started from the command line runs, unless
 * {@code --verbose} asks for it on standard error: into {@code tally.log} inside the run's scratch
 * folder ({@link SparkScratch}) — Spark's warnings, executors' errors and their stack traces, and
 * Edgewise's own step lines — so that the terminal shows only Edgewise's lines: the summary,
 * warnings, the progress bar, and a refusal in exactly one line.
 *
 * <p>The file goes with the scratch folder (at the end, by the shutdown hook, or by the next run
 * after a {@code kill -9}) after a run that succeeded or was refused: the summary or the refusal
 * says all there is. When the run failed otherwise (an environment fault or a bug) it is kept
 * ({@link #keep}): moved beside the scratch folder as {@code edgewise-tally-<time>-<pid>.log} and
 * named in the one-line message, for the user to read and remove — never inside the output.
 *
 * <p>Spark logs through Log4j 2 (the backend of every Spark 3.3+ line); under another backend
 * (a caller's own) nothing is changed and the log stays where that backend sends it.
 */
final class SparkLog implements AutoCloseable {
    private static final String PATTERN = "%d{HH:mm:ss} %p %c{1}: %m%n";

    /** Standard error as the run found it, while {@link #quiet} has sent {@code System.err} to the file; else null. */
    private static volatile PrintStream terminal;

    private final Path file;
    private final PrintStream stray;
    private final PrintStream out;
    private final PrintStream err;

    private SparkLog(Path file, PrintStream stray, PrintStream out, PrintStream err) {
        this.file = file;
        this.stray = stray;
        this.out = out;
        this.err = err;
    }

    /** Where Edgewise's own terminal output (the progress line) goes: standard error as the run found it. */
    static PrintStream terminal() {
        PrintStream t = terminal;
        return t != null ? t : System.err;
    }

    /**
     * Sends every log line to {@code file} (Spark at warnings, Edgewise at info), and what libraries print
     * straight to {@code System.out} / {@code System.err} (snappy-java prints its stack traces there) too;
     * the command's own writers were made from the streams before. Null when the backend is not Log4j 2.
     */
    static SparkLog quiet(Path file) {
        if (!(LogManager.getContext(false) instanceof LoggerContext)) {
            return null;
        }
        ConfigurationBuilder<BuiltConfiguration> b = ConfigurationBuilderFactory.newConfigurationBuilder();
        b.setConfigurationName("edgewise-tally-quiet");
        b.setStatusLevel(Level.OFF); // Log4j's own complaints (e.g. a full disk under the file) stay off the terminal
        b.add(b.newAppender("file", "File")
                .addAttribute("fileName", file.toString())
                .addAttribute("append", true)
                .addAttribute("immediateFlush", true)
                .add(b.newLayout("PatternLayout").addAttribute("pattern", PATTERN)));
        b.add(b.newLogger("org.edgewise", Level.INFO).add(b.newAppenderRef("file")).addAttribute("additivity", false));
        b.add(b.newLogger("org.sparkproject.jetty", Level.ERROR));
        b.add(b.newLogger("org.apache.parquet", Level.ERROR));
        b.add(b.newLogger("org.apache.hadoop", Level.ERROR));
        b.add(b.newRootLogger(Level.WARN).add(b.newAppenderRef("file")));
        Configurator.reconfigure(b.build());
        PrintStream stray;
        try {
            stray = new PrintStream(new FileOutputStream(file.toFile(), true), true, StandardCharsets.UTF_8);
        } catch (IOException e) {
            stray = new PrintStream(OutputStream.nullOutputStream()); // the log cannot be written: nothing is shown
        }
        SparkLog log = new SparkLog(file, stray, System.out, System.err);
        terminal = System.err;
        System.setOut(stray);
        System.setErr(stray);
        return log;
    }

    /** The file the log is written to. */
    Path file() {
        return file;
    }

    /**
     * Keeps the log of a failed run: stops writing it and moves it into {@code parent} (the folder that
     * holds the scratch folder) as {@code edgewise-tally-<time>-<pid>.log}; returns the new path, or null
     * when there is nothing to keep or it cannot be moved.
     */
    Path keep(Path parent) {
        close();
        if (!Files.isRegularFile(file)) {
            return null;
        }
        String stamp = LocalDateTime.now().format(DateTimeFormatter.ofPattern("yyyyMMdd-HHmmss"));
        Path kept = parent.resolve("edgewise-tally-" + stamp + "-" + ProcessHandle.current().pid() + ".log");
        try {
            return Files.move(file, kept, StandardCopyOption.ATOMIC_MOVE);
        } catch (IOException | RuntimeException e) {
            return null;
        }
    }

    /** Stops writing the file (nothing more is logged anywhere; the JVM is about to end); restores the standard streams. */
    @Override
    public void close() {
        if (System.err == stray) {
            System.setErr(err);
            System.setOut(out);
            terminal = null;
            stray.close();
        }
        if (LogManager.getContext(false) instanceof LoggerContext ctx
                && "edgewise-tally-quiet".equals(ctx.getConfiguration().getName())) {
            ConfigurationBuilder<BuiltConfiguration> b = ConfigurationBuilderFactory.newConfigurationBuilder();
            b.setConfigurationName("edgewise-tally-closed");
            b.setStatusLevel(Level.OFF);
            b.add(b.newRootLogger(Level.OFF));
            Configurator.reconfigure(b.build());
        }
    }
}
