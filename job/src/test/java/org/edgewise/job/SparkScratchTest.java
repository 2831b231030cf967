package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.File;
import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Issue 11: an embedded tally leaves nothing in the scratch parent — no {@code spark-*},
 * {@code blockmgr-*} or {@code edgewise-spark-*} folder — after a clean run and after a refused
 * one, and removes the folder of a run killed earlier. Each run is a fresh JVM (the tests' shared
 * session would be reused by an in-process run) whose {@code java.io.tmpdir} is a folder of the test.
 */
class SparkScratchTest {
    @TempDir
    Path dir;

    /** Runs {@code tally} in a child JVM with {@code java.io.tmpdir = tmp}; returns exit status and stderr. */
    private static String[] tally(Path tmp, String... args) throws IOException, InterruptedException {
        List<String> cmd = new ArrayList<>();
        cmd.add(Path.of(System.getProperty("java.home"), "bin", "java").toString());
        for (String a : ManagementFactory.getRuntimeMXBean().getInputArguments()) {
            if (!a.startsWith("-Djava.io.tmpdir") && !a.startsWith("-agentlib") && !a.startsWith("-javaagent")
                    && !a.startsWith("-Xmx")) {
                cmd.add(a);
            }
        }
        cmd.addAll(List.of("-Xmx512m", "-Djava.io.tmpdir=" + tmp, "-cp", System.getProperty("java.class.path"),
                TallyMain.class.getName()));
        if (!List.of(args).contains("--master")) {
            cmd.addAll(List.of("--master", "local[2]"));
        }
        cmd.addAll(List.of(args));
        ProcessBuilder pb = new ProcessBuilder(cmd).redirectOutput(ProcessBuilder.Redirect.DISCARD);
        pb.environment().remove("SPARK_LOCAL_DIRS");
        pb.environment().put("SPARK_LOCAL_IP", "127.0.0.1");
        Process p = pb.start();
        String err = new String(p.getErrorStream().readAllBytes(), StandardCharsets.UTF_8);
        return new String[] {String.valueOf(p.waitFor()), err};
    }

    private static List<String> left(Path tmp) throws IOException {
        try (Stream<Path> s = Files.list(tmp)) {
            return s.map(p -> p.getFileName().toString())
                    .filter(n -> n.startsWith("spark-") || n.startsWith("blockmgr-") || n.startsWith("edgewise-spark-")
                            || n.startsWith("edgewise-tally-"))
                    .sorted().toList();
        }
    }

    @Test
    void aLocalTallyLeavesNoScratchBehindWhetherItSucceedsOrIsRefused() throws Exception {
        Path tmp = Files.createDirectories(dir.resolve("scratch-parent"));
        // the folder of a run killed with kill -9: its pid belongs to a process that has ended
        Process gone = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(), "-version")
                .redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        gone.waitFor();
        Path stale = Files.createDirectories(tmp.resolve("edgewise-spark-" + gone.pid() + "-42").resolve("blockmgr-x"));

        Path good = TestTables.write(dir.resolve("good.csv"), "a,b\nx,1\ny,2\nx,2\ny,1\n");
        String[] ok = tally(tmp, "--input", good.toString(), "--out", dir.resolve("store").toString(), "--max-parents", "1");
        assertEquals("0", ok[0], ok[1]);
        assertEquals("", ok[1], "a clean run prints nothing on standard error: Spark's warnings are in the run's log");
        assertTrue(Files.isDirectory(dir.resolve("store")));
        assertFalse(Files.exists(stale.getParent()), "a dead run's scratch is removed by the next run");
        assertEquals(List.of(), left(tmp), "after a clean run");

        Path bad = TestTables.write(dir.resolve("bad.csv"), "a,b\nx,1\ny,2,3\n");
        String[] refused = tally(tmp, "--input", bad.toString(), "--out", dir.resolve("store2").toString());
        assertEquals("2", refused[0], refused[1]);
        // exactly one line: Spark's warnings went to the run's log, removed with its scratch folder (issue 23 item 12)
        assertEquals("tally: input " + bad + " line 3: 3 fields, the header has 2 (1 malformed row in all)", refused[1].strip());
        assertEquals(List.of(), left(tmp), "after a refused run");
        assertFalse(Files.exists(dir.resolve("store2")));
        assertTrue(new File(tmp.toString()).isDirectory());
    }

    /** Issue 23 item 13: a scratch parent that does not exist is refused, not created and left behind. */
    @Test
    void aMissingScratchParentIsRefusedAndNotCreated() throws Exception {
        Path tmp = Files.createDirectories(dir.resolve("tmp"));
        Path good = TestTables.write(dir.resolve("good.csv"), "a,b\nx,1\ny,2\nx,2\ny,1\n");
        byte[] before = Files.readAllBytes(good);
        Path missing = dir.resolve("nonexistent").resolve("x");
        String[] r = tally(tmp, "--input", good.toString(), "--out", dir.resolve("store").toString(), "--conf",
                "spark.local.dir=" + missing);
        assertEquals("2", r[0], r[1]);
        assertEquals("tally: --conf spark.local.dir=" + missing + ": " + missing + " does not exist; give an existing directory",
                r[1].strip());
        assertFalse(Files.exists(dir.resolve("nonexistent")), "nothing created");
        assertFalse(Files.exists(dir.resolve("store")));
        assertEquals(List.of(), left(tmp));
        org.junit.jupiter.api.Assertions.assertArrayEquals(before, Files.readAllBytes(good));
    }

    /**
     * Issue 23 item 12: Spark is quiet unless asked. A Parquet file whose data pages are damaged (its
     * footer intact) fails in an executor, whose error and stack trace Spark logs: the terminal shows the
     * one-line refusal only. A fault of the environment (a master URL Spark does not know; local[two]: a
     * cluster's URL is refused earlier here, where the classes are not in jars) is one line naming
     * the kept log, which holds Spark's own account. With --verbose Spark's log is on standard error.
     */
    @Test
    void sparkIsQuietUnlessAsked() throws Exception {
        Path tmp = Files.createDirectories(dir.resolve("quiet-tmp"));
        Path parquet = dir.resolve("damaged.parquet");
        org.apache.spark.sql.SparkSession spark = SharedSpark.session();
        Path written = dir.resolve("damaged-spark");
        spark.sql("SELECT CAST(id % 3 AS STRING) AS a, CAST(id % 7 AS STRING) AS b FROM range(20000)").coalesce(1)
                .write().option("compression", "none").parquet(written.toString());
        try (Stream<Path> s = Files.list(written)) {
            Files.move(s.filter(p -> p.getFileName().toString().endsWith(".parquet")).findFirst().orElseThrow(), parquet);
        }
        byte[] bytes = Files.readAllBytes(parquet);
        java.util.Random r = new java.util.Random(7);
        for (int i = 4; i < bytes.length / 2; i++) { // the data pages; the footer at the end stays readable
            bytes[i] = (byte) r.nextInt(256);
        }
        Files.write(parquet, bytes);
        String[] damaged = tally(tmp, "--input", parquet.toString(), "--out", dir.resolve("q1").toString());
        assertEquals("2", damaged[0], damaged[1]);
        assertEquals(1, damaged[1].strip().lines().count(), damaged[1]);
        assertTrue(damaged[1].startsWith("tally: input " + parquet + ": "), damaged[1]);
        assertEquals(List.of(), left(tmp), "the log of a refused run goes with its scratch folder");
        assertFalse(Files.exists(dir.resolve("q1")));

        Path good = TestTables.write(dir.resolve("quiet.csv"), "a,b\nx,1\ny,2\nx,2\ny,1\n");
        String[] master = tally(tmp, "--master", "local[two]", "--input", good.toString(), "--out", dir.resolve("q2").toString());
        assertEquals("2", master[0], master[1]);
        List<String> kept = left(tmp);
        assertEquals(1, kept.size(), "the log of a run failed by its environment is kept: " + kept + "\n" + master[1]);
        Path log = tmp.resolve(kept.get(0));
        assertEquals("tally: --master local[two]: not a master URL Spark knows; give local[*], local[N], spark://HOST:PORT, "
                + "or yarn or k8s://… through scripts/submit; Spark's log: " + log, master[1].strip());
        assertTrue(Files.readString(log).contains("Could not parse Master URL"), "Spark's account is in the log");
        Files.delete(log);

        String[] verbose = tally(tmp, "--verbose", "--input", good.toString(), "--out", dir.resolve("q3").toString());
        assertEquals("0", verbose[0], verbose[1]);
        assertTrue(verbose[1].contains("WARN SparkConf"), "Spark's warnings on standard error:\n" + verbose[1]);
        assertEquals(List.of(), left(tmp), "no log file with --verbose");
    }
}
