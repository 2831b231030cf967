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
                TallyMain.class.getName(), "--master", "local[2]"));
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
                    .filter(n -> n.startsWith("spark-") || n.startsWith("blockmgr-") || n.startsWith("edgewise-spark-"))
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
        assertTrue(Files.isDirectory(dir.resolve("store")));
        assertFalse(Files.exists(stale.getParent()), "a dead run's scratch is removed by the next run");
        assertEquals(List.of(), left(tmp), "after a clean run");

        Path bad = TestTables.write(dir.resolve("bad.csv"), "a,b\nx,1\ny,2,3\n");
        String[] refused = tally(tmp, "--input", bad.toString(), "--out", dir.resolve("store2").toString());
        assertEquals("2", refused[0], refused[1]);
        String last = refused[1].strip().lines().reduce((x, y) -> y).orElse("");
        assertEquals("tally: input " + bad + " line 3: 3 fields, the header has 2 (1 malformed row in all)", last);
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
}
