package org.edgewise.job;

import java.io.IOException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.UserError;

/**
 * Spark's scratch space ({@code spark.local.dir}: shuffle files, cached blocks, {@code spark-*} and
 * {@code blockmgr-*} folders) for an embedded ({@code local…}) run: a folder
 * {@code edgewise-spark-<pid>-<random>} the run owns under the scratch parent (the first
 * {@code spark.local.dir} given with {@code --conf}, which must exist, else {@code java.io.tmpdir}). It is removed
 * when the run ends, by a shutdown hook on any exit the JVM sees, and — after a {@code kill -9} —
 * by the next run, which removes every such folder whose process is no longer alive. Spark itself
 * removes its folders only on a clean stop, so without this a failed or killed run left them in
 * {@code /tmp} for ever. ({@code SPARK_LOCAL_DIRS}, when set, takes precedence over
 * {@code spark.local.dir} in Spark and is left alone.)
 */
final class SparkScratch implements AutoCloseable {
    private static final Pattern OWNED = Pattern.compile("edgewise-spark-(\\d+)-\\d+");

    private final Path dir;
    private final Thread hook;

    private SparkScratch(Path dir) {
        this.dir = dir;
        this.hook = new Thread(() -> AtomicWrite.deleteTree(dir), "edgewise-spark-scratch-cleanup");
        Runtime.getRuntime().addShutdownHook(hook);
    }

    /**
     * Creates the run's folder (and removes those of dead runs) under the scratch parent {@code extra}
     * implies for an {@code embedded} Spark; for a cluster's master (whose {@code spark.local.dir} is a
     * folder on the workers) under {@code java.io.tmpdir}, where it holds the run's log only.
     */
    static SparkScratch create(Map<String, String> extra, boolean embedded) {
        String given = embedded ? extra.get("spark.local.dir") : null;
        Path parent = Path.of(given != null && !given.isBlank() ? given.split(",")[0].trim()
                : System.getProperty("java.io.tmpdir"));
        if (given != null && !given.isBlank() && !Files.isDirectory(parent)) {
            // never created: a folder made for one run would be left behind after it
            throw new UserError("--conf spark.local.dir=" + given.trim() + ": " + parent
                    + (Files.exists(parent) ? " is not a directory" : " does not exist") + "; give an existing directory");
        }
        removeDeadRuns(parent);
        try {
            Files.createDirectories(parent);
            return new SparkScratch(Files.createTempDirectory(parent,
                    "edgewise-spark-" + ProcessHandle.current().pid() + "-"));
        } catch (IOException e) {
            throw new UserError("Spark scratch directory: cannot create a folder in " + parent + " ("
                    + AtomicWrite.reason(e) + "); give another with --conf spark.local.dir=DIR");
        }
    }

    /** The folder, for {@code spark.local.dir}. */
    Path dir() {
        return dir;
    }

    /** Removes the folder (after Spark has stopped). */
    @Override
    public void close() {
        AtomicWrite.deleteTree(dir);
        try {
            Runtime.getRuntime().removeShutdownHook(hook);
        } catch (IllegalStateException shuttingDown) {
            // the hook runs anyway
        }
    }

    /** Removes the folders of runs whose process has ended (a {@code kill -9} runs no hook). */
    static void removeDeadRuns(Path parent) {
        if (!Files.isDirectory(parent)) {
            return;
        }
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(parent, "edgewise-spark-*")) {
            for (Path p : ds) {
                Matcher m = OWNED.matcher(p.getFileName().toString());
                if (m.matches() && !ProcessHandle.of(Long.parseLong(m.group(1))).map(ProcessHandle::isAlive).orElse(false)) {
                    AtomicWrite.deleteTree(p);
                }
            }
        } catch (IOException | SecurityException ignored) {
            // best effort: a leftover scratch folder is never mistaken for an output
        }
    }
}
