package org.edgewise.job.cluster;

import java.io.File;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.concurrent.TimeUnit;
import java.util.stream.Collectors;
import java.util.stream.Stream;

/**
 * The loopback standalone cluster of {@code scripts/local-cluster}, driven from a test: started
 * with its own state folder, stopped by {@link #close()} and, should the test JVM end early, by a
 * shutdown hook (the script stops exactly the daemons recorded in its pid files).
 */
public final class LocalCluster implements AutoCloseable {
    private final Path root;
    private final Path state;
    private final String masterUrl;
    private final Thread hook;
    private boolean stopped;

    private LocalCluster(Path root, Path state, String masterUrl, Thread hook) {
        this.root = root;
        this.state = state;
        this.masterUrl = masterUrl;
        this.hook = hook;
    }

    /** The project root the build runs in (surefire/failsafe pass it as a system property). */
    public static Path projectRoot() {
        String p = System.getProperty("edgewise.projectRoot");
        Path root = p != null ? Path.of(p) : Path.of("").toAbsolutePath().getParent();
        if (!Files.isRegularFile(root.resolve("scripts/local-cluster"))) {
            throw new IllegalStateException("no scripts/local-cluster under " + root);
        }
        return root;
    }

    /** Stops a cluster an earlier run left running from {@code state} (a no-op when none runs). */
    public static void stopIfRunning(Path state) throws IOException, InterruptedException {
        if (Files.isDirectory(state)) {
            run(projectRoot(), state, 120, "stop");
        }
    }

    /** Starts a master and {@code workers} workers (1 core, 2 GiB each) with state under {@code state}. */
    public static LocalCluster start(Path state, int workers) throws IOException, InterruptedException {
        Path root = projectRoot();
        Files.createDirectories(state);
        // The hook exists before the daemons do, so a JVM that dies while they start still stops them.
        Thread hook = new Thread(() -> runQuietly(root, state, "stop"), "local-cluster-stop");
        Runtime.getRuntime().addShutdownHook(hook);
        Result r = run(root, state, 180, "start", "--workers", Integer.toString(workers));
        if (r.exit != 0) {
            runQuietly(root, state, "stop");
            Runtime.getRuntime().removeShutdownHook(hook);
            throw new IllegalStateException("local-cluster start failed (exit " + r.exit + "):\n" + r.output);
        }
        String url = r.stdout.strip();
        if (!url.matches("spark://127\\.0\\.0\\.1:\\d+")) {
            runQuietly(root, state, "stop");
            Runtime.getRuntime().removeShutdownHook(hook);
            throw new IllegalStateException("local-cluster start printed no master URL:\n" + r.output);
        }
        return new LocalCluster(root, state, url, hook);
    }

    public String masterUrl() {
        return masterUrl;
    }

    public Path state() {
        return state;
    }

    /** The SPARK_HOME the daemons run from. */
    public Path sparkHome() {
        return state.resolve("spark-home");
    }

    /** SIGKILLs worker {@code i} (1-based) and its executors: a lost machine. */
    public void killWorker(int i) throws IOException, InterruptedException {
        Result r = run(root, state, 30, "kill-worker", Integer.toString(i));
        if (r.exit != 0) {
            throw new IllegalStateException("kill-worker " + i + " failed:\n" + r.output);
        }
    }

    /** Application ids (app-…) that have executor folders on worker {@code i}. */
    public Set<String> applicationsOn(int i) throws IOException {
        Path work = state.resolve("worker-dirs/worker-" + i);
        if (!Files.isDirectory(work)) {
            return Set.of();
        }
        try (Stream<Path> s = Files.list(work)) {
            return s.map(p -> p.getFileName().toString()).filter(n -> n.startsWith("app-")).collect(Collectors.toSet());
        }
    }

    /** Everything the executors of application {@code app} on worker {@code i} wrote to stderr. */
    public String executorLog(int i, String app) throws IOException {
        Path dir = state.resolve("worker-dirs/worker-" + i).resolve(app);
        if (!Files.isDirectory(dir)) {
            return "";
        }
        StringBuilder sb = new StringBuilder();
        try (Stream<Path> s = Files.list(dir)) {
            for (Path exec : s.sorted().toList()) {
                Path err = exec.resolve("stderr");
                if (Files.isRegularFile(err)) {
                    sb.append(Files.readString(err, StandardCharsets.UTF_8));
                }
            }
        }
        return sb.toString();
    }

    /** Output of {@code scripts/local-cluster status}. */
    public String status() throws IOException, InterruptedException {
        return run(root, state, 30, "status").output;
    }

    @Override
    public void close() throws IOException, InterruptedException {
        if (stopped) {
            return;
        }
        stopped = true;
        Result r = run(root, state, 120, "stop");
        try {
            Runtime.getRuntime().removeShutdownHook(hook);
        } catch (IllegalStateException shuttingDown) {
            // already running the hooks: the stop above has done the hook's work
        }
        if (r.exit != 0) {
            throw new IllegalStateException("local-cluster stop failed:\n" + r.output);
        }
    }

    private record Result(int exit, String stdout, String output) {
    }

    private static void runQuietly(Path root, Path state, String... args) {
        try {
            run(root, state, 120, args);
        } catch (IOException | InterruptedException | RuntimeException ignored) {
            // best effort: called on the way out
        }
    }

    private static Result run(Path root, Path state, long timeoutSeconds, String... args)
            throws IOException, InterruptedException {
        List<String> cmd = new ArrayList<>(List.of("bash", root.resolve("scripts/local-cluster").toString()));
        cmd.addAll(List.of(args));
        File out = File.createTempFile("local-cluster-", ".out");
        File err = File.createTempFile("local-cluster-", ".err");
        try {
            ProcessBuilder pb = new ProcessBuilder(cmd).directory(root.toFile())
                    .redirectOutput(out).redirectError(err);
            pb.environment().put("EDGEWISE_CLUSTER_DIR", state.toString());
            Process p = pb.start();
            if (!p.waitFor(timeoutSeconds, TimeUnit.SECONDS)) {
                p.destroyForcibly().waitFor();
                throw new IllegalStateException("local-cluster " + String.join(" ", args) + " timed out after "
                        + timeoutSeconds + " s:\n" + Files.readString(err.toPath()));
            }
            String stdout = Files.readString(out.toPath());
            return new Result(p.exitValue(), stdout, stdout + Files.readString(err.toPath()));
        } finally {
            out.delete();
            err.delete();
        }
    }
}
