package org.edgewise.job.cluster;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.edgewise.driver.store.StoreFormat;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.MethodOrderer;
import org.junit.jupiter.api.Order;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestMethodOrder;

/**
 * The tally on a real Spark standalone cluster (master, two 1-core workers, executor JVMs the
 * workers launch) on loopback, started by {@code scripts/local-cluster}; each tally is a separate
 * driver JVM started by {@code scripts/edgewise tally}, as a user runs it.
 *
 * <p>Reference: a tally is a deterministic function of the table, so the store written on the
 * cluster must equal the embedded {@code local[2]} one byte for byte in its Parquet parts (the
 * manifest differs only in time and paths). Spark's documented recovery (RDD lineage: lost
 * partitions are recomputed; "Job Scheduling" / "Cluster Mode Overview" of the Spark 3.5 docs)
 * must give the same store after a worker is killed, and the store writer's temporary-then-rename
 * contract (DESIGN.md, "The score store") must leave nothing at the output path when the driver
 * dies.
 *
 * <p>Run alone: {@code mvn -B -o -pl job -am verify -Dtest=none -Dsurefire.failIfNoSpecifiedTests=false
 * -Dit.test=ClusterIT} (tag {@code cluster}). The cluster is stopped in {@link #stopCluster()}, and by a
 * shutdown hook should the JVM end early.
 */
@Tag("cluster")
@TestMethodOrder(MethodOrderer.OrderAnnotation.class)
class ClusterIT {
    private static final Pattern APP = Pattern.compile("app-\\d+-\\d+");
    private static Path root;
    private static Path dir;
    private static Path table;
    private static LocalCluster cluster;
    private static Path localStore;

    @BeforeAll
    static void startCluster() throws Exception {
        root = LocalCluster.projectRoot();
        dir = root.resolve("job/target/cluster-it");
        Path state = dir.resolve("cluster");
        // a cluster left by an earlier, killed run is stopped by its pid files before anything is removed
        LocalCluster.stopIfRunning(state);
        if (Files.isDirectory(dir)) {
            try (Stream<Path> s = Files.list(dir)) {
                for (Path x : s.toList()) {
                    if (!x.equals(state)) {
                        deleteTree(x);
                    }
                }
            }
        }
        deleteTree(state.resolve("worker-dirs"));
        deleteTree(state.resolve("local"));
        Files.createDirectories(dir);
        table = dir.resolve("table.csv");
        writeTable(table, 20_000, 11);
        cluster = LocalCluster.start(state, 2);
    }

    @AfterAll
    static void stopCluster() throws Exception {
        if (cluster != null) {
            cluster.close();
        }
    }

    /**
     * A table drawn from a small fixed network (a → b, {a, b} → c, c → e; d and f independent),
     * seeded so every run tallies the same rows.
     */
    static void writeTable(Path file, int rows, long seed) throws IOException {
        SplittableRandom r = new SplittableRandom(seed);
        try (BufferedWriter w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            w.write("a,b,c,d,e,f\n");
            for (int i = 0; i < rows; i++) {
                int a = r.nextInt(3);
                int b = (a + (r.nextDouble() < 0.3 ? 1 : 0)) % 2;
                int c = (a + b + (r.nextDouble() < 0.2 ? 1 : 0)) % 3;
                int d = r.nextInt(2);
                int e = r.nextDouble() < 0.7 ? c : r.nextInt(3);
                int f = r.nextInt(4);
                w.write(a + "," + (b == 0 ? "no" : "yes") + "," + c + "," + d + "," + e + "," + f + "\n");
            }
        }
    }

    /** The reference: the same table tallied by embedded Spark in one JVM. */
    private static synchronized Path localStore() throws Exception {
        if (localStore == null) {
            Path out = dir.resolve("local-store");
            Process p = tally(out, "local[2]", "local");
            assertEquals(0, waitFor(p, 600), "local tally failed:\n" + log("local"));
            localStore = out;
        }
        return localStore;
    }

    @Test
    @Order(1)
    void clusterStoreEqualsLocalStore() throws Exception {
        Set<String> before = apps();
        Path out = dir.resolve("cluster-store");
        // through spark-submit (scripts/submit), as on a user's own cluster
        List<String> cmd = new ArrayList<>(List.of("bash", root.resolve("scripts/submit").toString(),
                "--master", cluster.masterUrl(), "--conf", "spark.executor.memory=1g", "--"));
        cmd.addAll(tallyArgs(out, "--partitions", "4"));
        Process p = start(cmd, "cluster");
        assertEquals(0, waitFor(p, 600), "cluster tally through scripts/submit failed:\n" + log("cluster"));
        assertSameStore(localStore(), out);

        // The Edgewise classes reached the executors as the application jar, fetched from the driver:
        // the cluster's SPARK_HOME holds Spark alone.
        try (Stream<Path> jars = Files.list(cluster.sparkHome().resolve("jars"))) {
            List<String> ours = jars.map(j -> j.getFileName().toString()).filter(n -> n.startsWith("edgewise")).toList();
            assertEquals(List.of(), ours, "no Edgewise jar in the cluster's SPARK_HOME/jars");
        }
        String app = newApp(before);
        int workersUsed = 0;
        for (int w = 1; w <= 2; w++) {
            String exec = cluster.executorLog(w, app);
            if (exec.contains("Finished task")) {
                workersUsed++;
                assertTrue(Pattern.compile("Fetching spark://\\S+/jars/edgewise-job\\.jar").matcher(exec).find(),
                        "worker-" + w + "'s executor fetched the job jar from the driver:\n" + exec);
            }
        }
        assertTrue(workersUsed >= 1, "executors on the workers ran the tasks of " + app);
    }

    @Test
    @Order(2)
    void killedWorkerDoesNotChangeTheStore() throws Exception {
        Running t = startTally("worker-killed");
        Process p = t.process();
        // wait until the victim's executor has finished work of this tally and is running more
        boolean killed = false;
        while (p.isAlive() && System.nanoTime() < t.deadline()) {
            String exec = cluster.executorLog(2, t.app());
            int finished = count(exec, "Finished task");
            int running = count(exec, "Running task");
            if (finished >= 1 && running > finished) {
                cluster.killWorker(2);
                killed = true;
                break;
            }
            Thread.sleep(20);
        }
        assertTrue(killed, "worker-2 was killed while it ran a task of the tally (else nothing was checked):\n"
                + log("worker-killed"));
        assertEquals(0, waitFor(p, 600), "tally after a lost worker failed:\n" + log("worker-killed"));
        String driverLog = log("worker-killed");
        assertTrue(driverLog.contains("Lost executor"), "the driver saw the executor go:\n" + driverLog);
        assertSameStore(t.reference(), t.out());
    }

    @Test
    @Order(3)
    void killedDriverLeavesNoStoreAndARerunSucceeds() throws Exception {
        Running t = startTally("driver-killed");
        Process p = t.process();
        Path out = t.out();
        while (p.isAlive() && System.nanoTime() < t.deadline() && !runningOnAnyWorker(t.app())) {
            Thread.sleep(20);
        }
        assertTrue(p.isAlive(), "the tally was still running when killed (else nothing was checked):\n"
                + log("driver-killed"));
        p.destroyForcibly(); // SIGKILL: no shutdown hook, no clean-up
        assertTrue(p.waitFor(60, TimeUnit.SECONDS));
        assertFalse(Files.exists(out), "nothing at the output path after the driver died");
        try (Stream<Path> s = Files.list(dir)) {
            List<String> visible = s.map(x -> x.getFileName().toString())
                    .filter(n -> n.startsWith("driver-killed-store")).toList();
            assertEquals(List.of(), visible, "no partial store under any visible name");
        }

        // A driver killed while renaming can leave a hidden temporary sibling; a rerun must not mind it.
        Path leftover = dir.resolve(".driver-killed-store.tmp-left-by-a-killed-driver");
        Files.createDirectories(leftover);
        Files.writeString(leftover.resolve(StoreFormat.COUNTS), "partial");
        Process rerun = tally(out, cluster.masterUrl(), "driver-rerun", "--partitions", "24");
        assertEquals(0, waitFor(rerun, 600), "rerun after a killed driver failed:\n" + log("driver-rerun"));
        assertSameStore(t.reference(), out);
    }

    /**
     * A tally running on the cluster into {@code out}, its application registered, with the local
     * store it must equal and a deadline five minutes on for waiting on it.
     */
    private record Running(Path reference, Path out, Process process, String app, long deadline) {
    }

    /** Starts a tally named {@code name} (its log, and its store {@code name-store}) on the cluster. */
    private static Running startTally(String name) throws Exception {
        Path reference = localStore();
        Set<String> before = apps();
        Path out = dir.resolve(name + "-store");
        // more partitions than cores, so tasks remain to be run (and re-run) when a worker or the driver goes
        Process p = tally(out, cluster.masterUrl(), name, "--partitions", "24");
        String app = awaitApp(before, p);
        return new Running(reference, out, p, app, System.nanoTime() + TimeUnit.SECONDS.toNanos(300));
    }

    private static boolean runningOnAnyWorker(String app) throws IOException {
        for (int w = 1; w <= 2; w++) {
            if (cluster.executorLog(w, app).contains("Running task")) {
                return true;
            }
        }
        return false;
    }

    private static void assertSameStore(Path expected, Path actual) throws IOException {
        for (String part : List.of(StoreFormat.COUNTS, StoreFormat.SCORES)) {
            byte[] e = Files.readAllBytes(expected.resolve(part));
            byte[] a = Files.readAllBytes(actual.resolve(part));
            assertTrue(e.length > 100, part + " of the reference is a real Parquet file");
            assertArrayEquals(e, a, part + " of " + actual + " equals the local store's byte for byte");
        }
    }

    // --- processes -------------------------------------------------------------------------------

    /** Starts {@code scripts/edgewise tally} on {@code master}; output goes to {@code <name>.log}. */
    private static Process tally(Path out, String master, String name, String... extra) throws IOException {
        // --verbose: the tests read Spark's driver log (a lost executor) from the run's output
        List<String> cmd = new ArrayList<>(List.of("bash", root.resolve("scripts/edgewise").toString(), "tally",
                "--master", master, "--verbose"));
        cmd.addAll(tallyArgs(out, extra));
        return start(cmd, name);
    }

    private static List<String> tallyArgs(Path out, String... extra) {
        List<String> a = new ArrayList<>(List.of("--input", table.toString(), "--out", out.toString(),
                "--max-parents", "2"));
        a.addAll(List.of(extra));
        return a;
    }

    private static Process start(List<String> cmd, String name) throws IOException {
        ProcessBuilder pb = new ProcessBuilder(cmd).directory(dir.toFile()).redirectErrorStream(true)
                .redirectOutput(dir.resolve(name + ".log").toFile());
        pb.environment().put("EDGEWISE_JAVA_OPTS", "-Xmx1g");
        pb.environment().put("SPARK_LOCAL_IP", "127.0.0.1");
        Process p = pb.start();
        // a test JVM that dies must not leave a driver behind
        ProcessHandle h = p.toHandle();
        Runtime.getRuntime().addShutdownHook(new Thread(h::destroyForcibly));
        return p;
    }

    private static int waitFor(Process p, long seconds) throws InterruptedException {
        if (!p.waitFor(seconds, TimeUnit.SECONDS)) {
            p.destroyForcibly().waitFor();
            return -1;
        }
        return p.exitValue();
    }

    private static String log(String name) throws IOException {
        Path f = dir.resolve(name + ".log");
        return Files.exists(f) ? Files.readString(f, StandardCharsets.UTF_8) : "(no log)";
    }

    private static Set<String> apps() throws IOException {
        Set<String> s = new HashSet<>(cluster.applicationsOn(1));
        s.addAll(cluster.applicationsOn(2));
        return s;
    }

    private static String newApp(Set<String> before) throws IOException {
        Set<String> now = apps();
        now.removeAll(before);
        assertEquals(1, now.size(), "exactly one new application on the workers: " + now);
        String app = now.iterator().next();
        assertTrue(APP.matcher(app).matches(), app);
        return app;
    }

    /** Waits for the tally's application to get executors on the workers. */
    private static String awaitApp(Set<String> before, Process p) throws Exception {
        long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(300);
        while (System.nanoTime() < deadline) {
            Set<String> now = apps();
            now.removeAll(before);
            if (!now.isEmpty()) {
                return newApp(before);
            }
            if (!p.isAlive()) {
                break;
            }
            Thread.sleep(100);
        }
        throw new AssertionError("the tally got no executors:\n" + cluster.status());
    }

    private static int count(String text, String what) {
        Matcher m = Pattern.compile(Pattern.quote(what)).matcher(text);
        int n = 0;
        while (m.find()) {
            n++;
        }
        return n;
    }

    private static void deleteTree(Path d) throws IOException {
        if (!Files.exists(d)) {
            return;
        }
        try (Stream<Path> w = Files.walk(d)) {
            for (Path x : w.sorted(java.util.Comparator.reverseOrder()).toList()) {
                Files.delete(x);
            }
        }
    }
}
