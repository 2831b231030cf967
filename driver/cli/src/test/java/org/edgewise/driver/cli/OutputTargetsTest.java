package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.FileOutputStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;

/**
 * Outputs never destroy (issue 23, items 1–4): {@code --overwrite} replaces only a regular file;
 * two runs writing the same {@code --out} never lose a result; a failed write to standard output
 * ends in exit 1 and one line; {@code --out} is never one of the command's own inputs. Every
 * refusal is one line, word for word, and the folder is the same afterwards, byte for byte.
 */
class OutputTargetsTest extends StoreFixture {
    @Override
    long seed() {
        return 11;
    }

    /** Runs and asserts exit status 2, exactly {@code message} (one line) on stderr, nothing on stdout. */
    static void refused(String message, String... args) {
        CliRun r = CliRun.of(args);
        assertEquals(2, r.status(), "exit status for: " + String.join(" ", args) + "\n" + r.err());
        assertEquals(message + "\n", r.err());
        assertEquals("", r.out());
    }

    /** Every entry under the test folder: its kind, and a regular file's bytes. */
    Map<String, String> snapshot() throws Exception {
        Map<String, String> m = new TreeMap<>();
        try (Stream<Path> s = Files.walk(dir)) {
            for (Path p : (Iterable<Path>) s::iterator) {
                String kind = Files.isSymbolicLink(p) ? "link to " + Files.readSymbolicLink(p)
                        : Files.isDirectory(p, LinkOption.NOFOLLOW_LINKS) ? "dir"
                        : Files.isRegularFile(p, LinkOption.NOFOLLOW_LINKS) ? Arrays.toString(Files.readAllBytes(p))
                        : "special";
                m.put(dir.relativize(p).toString(), kind);
            }
        }
        return m;
    }

    Path network() throws Exception {
        return Files.writeString(dir.resolve("net.json"), ReportCommandsTest.NET);
    }

    Path result() throws Exception {
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--order", ORDER, "--out", dir.resolve("r.json").toString());
        assertEquals(0, r.status(), r.err());
        return dir.resolve("r.json");
    }

    static void run(String... cmd) throws Exception {
        Process p = new ProcessBuilder(cmd).inheritIO().start();
        Assumptions.assumeTrue(p.waitFor() == 0, "cannot run " + String.join(" ", cmd));
    }

    /** Item 1: a symbolic link, FIFO or device file named by --out is refused even with --overwrite. */
    @Test
    void overwriteReplacesOnlyARegularFile() throws Exception {
        Path net = network();
        Path r = result();
        Path victim = Files.writeString(dir.resolve("victim.txt"), "keep me\n");
        Path link = Files.createSymbolicLink(dir.resolve("link"), victim);
        Path fifo = dir.resolve("fifo");
        run("mkfifo", fifo.toString());
        Path dev = dir.resolve("dev-null");
        run("mknod", dev.toString(), "c", "1", "3");
        Map<String, String> before = snapshot();
        String s = store.toString();
        for (Path out : List.of(link, fifo, dev)) {
            String kind = out == link ? "a symbolic link" : out == fifo ? "a FIFO" : "a device file";
            String why = " --out " + out + " is " + kind + ", not a regular file; give a file name";
            refused("simulate:" + why, "simulate", "--network", net.toString(), "--rows", "5", "--out", out.toString(),
                    "--overwrite");
            refused("edges:" + why, "edges", "--store", s, "--order", ORDER, "--out", out.toString(), "--overwrite");
            refused("report:" + why, "report", "--result", r.toString(), "--out", out.toString(), "--overwrite");
            refused("scores:" + why, "scores", "--store", s, "--out", out.toString());
        }
        assertEquals(before, snapshot());
    }

    /** Item 2: two runs writing the same --out without --overwrite: exactly one wins, the other is refused, nothing lost. */
    @Test
    void ofTwoOverlappingRunsExactlyOneWins() throws Exception {
        CliRun alone = CliRun.of("edges", "--store", store.toString(), "--order", ORDER, "--format", "json");
        assertEquals(0, alone.status(), alone.err());
        Path out = dir.resolve("e.json");
        for (int round = 0; round < 5; round++) {
            Files.deleteIfExists(out);
            Map<String, String> before = snapshot();
            CountDownLatch start = new CountDownLatch(1);
            ExecutorService pool = Executors.newFixedThreadPool(2);
            List<Future<CliRun>> runs = new ArrayList<>();
            for (int t = 0; t < 2; t++) {
                runs.add(pool.submit(() -> {
                    start.await();
                    return CliRun.of("edges", "--store", store.toString(), "--order", ORDER, "--out", out.toString());
                }));
            }
            start.countDown();
            List<CliRun> done = new ArrayList<>();
            for (Future<CliRun> f : runs) {
                done.add(f.get(60, TimeUnit.SECONDS));
            }
            pool.shutdown();
            List<CliRun> won = done.stream().filter(c -> c.status() == 0).toList();
            List<CliRun> lost = done.stream().filter(c -> c.status() != 0).toList();
            assertEquals(1, won.size(), done.toString());
            assertEquals(1, lost.size(), done.toString());
            assertEquals(2, lost.get(0).status());
            String err = lost.get(0).err();
            assertTrue(err.equals("edges: --out " + out + " already exists; pass --overwrite to replace it\n")
                    || err.equals("edges: output " + out + " appeared while writing (another run writing it?); it was kept"
                    + " and nothing was written\n"), err);
            assertEquals(alone.out(), Files.readString(out), "the winner's result, whole");
            Map<String, String> after = snapshot();
            after.remove("e.json");
            assertEquals(before, after, "nothing else written or left behind");
        }
    }

    /** Item 3: a failed write to standard output is exit 1 and one line, not exit 0. */
    @Test
    void aFullStandardOutputIsExitOne() throws Exception {
        Assumptions.assumeTrue(Files.exists(Path.of("/dev/full")), "no /dev/full");
        Path net = network();
        Path r = result();
        Path cases = Files.writeString(dir.resolve("cases.csv"), "v1,v0\ns0,s1\n");
        Map<String, String> before = snapshot();
        String s = store.toString();
        for (String[] cmd : new String[][] {
            {"simulate", "--network", net.toString(), "--rows", "100000"},
            {"scores", "--store", s},
            {"edges", "--store", s, "--order", ORDER, "--format", "json"},
            {"report", "--result", r.toString()},
            {"predict", "--store", s, "--order", ORDER, "--cases", cases.toString()},
        }) {
            StringWriter err = new StringWriter();
            int status;
            try (FileOutputStream full = new FileOutputStream("/dev/full")) {
                status = EdgewiseCli.execute(full, new PrintWriter(err, true), cmd);
            }
            assertEquals(1, status, cmd[0] + ": " + err);
            assertEquals(cmd[0] + ": cannot write standard output: No space left on device\n", err.toString());
        }
        assertEquals(before, snapshot());
    }

    /** Item 4: --out never names one of the command's own inputs, by real path. */
    @Test
    void theOutIsNeverAnInput() throws Exception {
        Path net = network();
        Path r = result();
        Path cases = Files.writeString(dir.resolve("c.csv"), "v1,v0\ns0,s1\n");
        Path alias = Files.createSymbolicLink(dir.resolve("alias.json"), r);
        Path hard = Files.createLink(dir.resolve("hard.json"), r);
        Map<String, String> before = snapshot();
        String s = store.toString();
        Path manifest = store.resolve("manifest.json");
        refused("edges: --out " + manifest + " is inside the input --store " + s + "; write elsewhere",
                "edges", "--store", s, "--order", ORDER, "--out", manifest.toString(), "--overwrite");
        refused("scores: --out " + store.resolve("x.json") + " is inside the input --store " + s + "; write elsewhere",
                "scores", "--store", s, "--out", store.resolve("x.json").toString());
        refused("report: --out " + r + " is the input --result " + r + "; write elsewhere",
                "report", "--result", r.toString(), "--out", r.toString(), "--overwrite");
        refused("report: --out " + alias + " is the input --result " + r + "; write elsewhere",
                "report", "--result", r.toString(), "--out", alias.toString(), "--overwrite");
        refused("report: --out " + hard + " is the input --result " + r + "; write elsewhere",
                "report", "--result", r.toString(), "--out", hard.toString(), "--overwrite");
        refused("predict: --out " + cases + " is the input --cases " + cases + "; write elsewhere",
                "predict", "--store", s, "--order", ORDER, "--cases", cases.toString(), "--out", cases.toString(), "--overwrite");
        refused("compare: --out " + net + " is the input --truth " + net + "; write elsewhere",
                "compare", "--result", r.toString(), "--truth", net.toString(), "--out", net.toString(), "--overwrite");
        refused("simulate: --out " + net + " is the input --network " + net + "; write elsewhere",
                "simulate", "--network", net.toString(), "--rows", "5", "--out", net.toString(), "--overwrite");
        Path relative = dir.relativize(Path.of("").toAbsolutePath()).resolve(dir.relativize(net)).normalize();
        assertEquals(before, snapshot(), "every input byte for byte, nothing left behind (" + relative + ")");
    }

    /**
     * Item 6: no -Infinity in JSON. A case the evidence contradicts has probability 0: its log is
     * written as null (JSON has no -Infinity), the probability as 0.
     */
    @Test
    void aProbabilityZeroHasANullLogNotMinusInfinity() throws Exception {
        Map<String, String> before = snapshot();
        String s = store.toString();
        // a case that contradicts its own evidence is refused in one line (PredictCommandTest words it) ...
        CliRun r = CliRun.of("predict", "--store", s, "--order", ORDER, "--case", "v0=s0", "--given", "v0=s1", "--format", "json");
        assertEquals(2, r.status(), r.err());
        assertTrue(!r.out().contains("Infinity") && !r.out().contains("NaN"), r.out());
        // ... and any non-finite number that reaches a JSON writer is written as null, never "-Infinity"
        assertEquals("{\"x\":null}", org.edgewise.driver.result.ResultJson.toJson(Map.of("x", Double.NEGATIVE_INFINITY))
                .replaceAll("\\s", ""), "a non-finite number is written as null");
        assertEquals(before, snapshot());
    }

    /** Item 8: draw counts beyond what memory can hold are refused with the figure and the limit. */
    @Test
    void hugeDrawCountsAreRefusedWithTheLimit() throws Exception {
        Map<String, String> before = snapshot();
        String s = store.toString();
        refused("effect: --effect-draws must be at most 1000000, got 2147483647 (each draw is kept in memory)",
                "effect", "--store", s, "--order", ORDER, "--do", "v0=s1", "--target", "v2=s0", "--effect-draws", "2147483647");
        refused("edges: --dag-samples must be at most 1000000, got 200000000 (each DAG drawn is kept in memory)",
                "edges", "--store", s, "--method", "mcmc", "--features", "ancestors", "--dag-samples", "200000000");
        assertEquals(before, snapshot());
    }
}
