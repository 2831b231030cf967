package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.ResultJson;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** simulate, report and compare through the command line: outputs, exit codes, one-line errors. */
class ReportCommandsTest {
    @TempDir
    Path dir;

    static CliRun run(String... args) {
        return CliRun.of(args);
    }

    static final String NET = "{\"edgewiseNetwork\":1,\"variables\":["
            + "{\"name\":\"a\",\"states\":[\"0\",\"1\"],\"cpt\":[[0.5,0.5]]},"
            + "{\"name\":\"b\",\"states\":[\"0\",\"1\"],\"parents\":[\"a\"],\"cpt\":[[0.9,0.1],[0.1,0.9]]},"
            + "{\"name\":\"c\",\"states\":[\"0\",\"1\"],\"parents\":[\"b\"],\"cpt\":[[0.9,0.1],[0.1,0.9]]}]}";

    Path files() throws Exception {
        Files.writeString(dir.resolve("net.json"), NET);
        EdgeResult r = new EdgeResult("exact", List.of("a", "b", "c"), -10.0, null, null, null, null, null,
                List.of(new EdgeResult.Edge("a", "b", 0.9), new EdgeResult.Edge("b", "a", 0.05),
                        new EdgeResult.Edge("b", "c", 0.3), new EdgeResult.Edge("c", "b", 0.6),
                        new EdgeResult.Edge("a", "c", 0.1), new EdgeResult.Edge("c", "a", 0.2)),
                null, null, null, null, null, null, null);
        ResultJson.write(dir.resolve("r.json"), r);
        return dir;
    }

    @Test
    void simulateWritesAReproducibleCsv() throws Exception {
        files();
        Path out = dir.resolve("d.csv");
        CliRun r = run("simulate", "--network", dir.resolve("net.json").toString(), "--rows", "1000", "--seed", "3", "--out", out.toString());
        assertEquals(0, r.status(), r.err());
        List<String> lines = Files.readAllLines(out);
        assertEquals(1001, lines.size());
        assertEquals("a,b,c", lines.get(0));
        CliRun again = run("simulate", "--network", dir.resolve("net.json").toString(), "--rows", "1000", "--seed", "3", "--out", out.toString());
        assertEquals(2, again.status());
        assertEquals("simulate: --out " + out + " already exists; pass --overwrite to replace it\n", again.err());
        CliRun stdout = run("simulate", "--network", dir.resolve("net.json").toString(), "--rows", "1000", "--seed", "3");
        assertEquals(Files.readString(out), stdout.out(), "standard output carries the same rows");
    }

    @Test
    void badNetworkIsOneLineAndNoFile() throws Exception {
        Path bad = dir.resolve("bad.json");
        Files.writeString(bad, NET.replace("[0.9,0.1],[0.1,0.9]]},{\"name\":\"c\"", "[0.9,0.2],[0.1,0.9]]},{\"name\":\"c\""));
        Path out = dir.resolve("d.csv");
        CliRun r = run("simulate", "--network", bad.toString(), "--rows", "10", "--out", out.toString());
        assertEquals(2, r.status());
        assertEquals("simulate: network " + bad + ": variable 'b': cpt row 1 (a=0) sums to 1.1, not 1\n", r.err());
        assertFalse(Files.exists(out));
        try (var s = Files.list(dir)) {
            assertEquals(1, s.count(), "no temporary file left behind");
        }
    }

    @Test
    void compareJsonAndTable() throws Exception {
        files();
        CliRun j = run("compare", "--result", dir.resolve("r.json").toString(), "--truth", dir.resolve("net.json").toString(), "--format", "json");
        assertEquals(0, j.status(), j.err());
        JsonNode n = ResultJson.MAPPER.readTree(j.out());
        // consensus {a→b, c→b}: b→c reversed, SHD 1 (hand count)
        assertEquals(1, n.path("consensus").path("shd").asInt());
        assertEquals("b -> c", n.path("consensus").path("reversed").get(0).asText());
        // directed positives a→b 0.9, b→c 0.3 vs negatives 0.05, 0.6, 0.1, 0.2: U = 4 + 3 = 7 of 8
        assertEquals(7.0 / 8, n.path("directed").path("auroc").asDouble(), 1e-12);
        CliRun t = run("compare", "--result", dir.resolve("r.json").toString(), "--truth", dir.resolve("net.json").toString());
        assertEquals(0, t.status());
        assertTrue(t.out().contains("directed       0.875"), t.out());
        assertTrue(t.out().contains("SHD 1 = missing 0 + extra 0 + reversed 1"), t.out());
        CliRun bad = run("compare", "--result", dir.resolve("r.json").toString(), "--truth", dir.resolve("net.json").toString(), "--threshold", "1.5");
        assertEquals(2, bad.status());
        assertEquals("compare: --threshold must be in [0, 1), got 1.5\n", bad.err());
    }

    @Test
    void reportHtmlAndDot() throws Exception {
        files();
        Path html = dir.resolve("out.html");
        CliRun r = run("report", "--result", dir.resolve("r.json").toString(), "--truth", dir.resolve("net.json").toString(), "--out", html.toString());
        assertEquals(0, r.status(), r.err());
        String text = Files.readString(html);
        assertTrue(text.startsWith("<!DOCTYPE html>"));
        assertTrue(text.contains("not proof of causation"));
        CliRun dot = run("report", "--result", dir.resolve("r.json").toString(), "--format", "dot", "--threshold", "0.5");
        assertEquals(0, dot.status());
        // an exact result without essential-graph posteriors: undirected lines for P(a→b) + P(b→a) > 0.5
        // (a–b 0.95, b–c 0.9, laid along the likelier DAG direction), a–c (0.3) not drawn, no arrow
        assertTrue(dot.out().contains("\"a\" -> \"b\" [label=\"0.95\", penwidth=5.75, dir=none, tooltip="), dot.out());
        assertTrue(dot.out().contains("\"c\" -> \"b\" [label=\"0.90\", penwidth=5.50, dir=none, tooltip="), dot.out());
        assertFalse(dot.out().contains("\"b\" -> \"c\""));
        assertFalse(dot.out().contains("\"a\" -> \"c\"") || dot.out().contains("\"c\" -> \"a\""));
        assertEquals(2, dot.out().split(" -> ").length - 1);
        CliRun missing = run("report", "--result", dir.resolve("nope.json").toString(), "--out", html.toString(), "--overwrite");
        assertEquals(2, missing.status());
        assertEquals("report: result file " + dir.resolve("nope.json") + " does not exist\n", missing.err());
    }

    /** The edges result's formatVersion (ResultJson): report and compare refuse another one in one line naming the file. */
    /** Directions not assessed: the report tells the reader the command and option, as the CLI spells them. */
    @Test
    void reportNamesTheEdgesOptionThatAssessesDirections() throws Exception {
        files();
        Path html = dir.resolve("hint.html");
        assertEquals(0, run("report", "--result", dir.resolve("r.json").toString(), "--out", html.toString()).status());
        assertTrue(Files.readString(html).contains("run <code>edges</code> with <code>--features essential-graph</code>"));
        CliRun dot = run("report", "--result", dir.resolve("r.json").toString(), "--format", "dot");
        assertTrue(dot.out().contains("directions not assessed (run edges with --features essential-graph)"), dot.out());
    }

    @Test
    void reportAndCompareRefuseAResultOfAnotherFormatVersion() throws Exception {
        files();
        Path r = dir.resolve("r.json");
        Files.writeString(r, Files.readString(r).replace("\"formatVersion\" : 2", "\"formatVersion\" : 1"));
        String truth = dir.resolve("net.json").toString();
        for (String command : List.of("report", "compare")) {
            Path out = dir.resolve(command + ".out");
            CliRun run = run(command, "--result", r.toString(), "--truth", truth, "--out", out.toString());
            assertEquals(2, run.status(), run.err());
            assertEquals(command + ": result file " + r + " has format version 1; this Edgewise reads edges results of"
                    + " format version 2; re-run the analysis that wrote it with this Edgewise\n", run.err());
            assertFalse(Files.exists(out));
        }
    }

    /**
     * Issue 23: the report of an 800-variable result at a small heap is refused with the figures before
     * anything is built (it ran out of memory), in a JVM of its own with -Xmx256m; nothing is written.
     */
    @Test
    void aReportTooLargeForTheHeapIsRefusedBeforeBuilding(@org.junit.jupiter.api.io.TempDir Path tmp) throws Exception {
        int n = 800;
        java.util.List<String> vars = new java.util.ArrayList<>();
        for (int i = 0; i < n; i++) {
            vars.add("v" + i);
        }
        java.util.List<org.edgewise.driver.result.EdgeResult.Edge> edges = new java.util.ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a != b) {
                    edges.add(new org.edgewise.driver.result.EdgeResult.Edge(vars.get(a), vars.get(b), (a + b) % 7 / 10.0,
                            null, null));
                }
            }
        }
        Path result = tmp.resolve("wide.json");
        org.edgewise.driver.result.ResultJson.write(result, new org.edgewise.driver.result.EdgeResult("order", vars, null, null,
                null, vars, null, null, edges, null, null, null, null, null, null, null));
        byte[] before = Files.readAllBytes(result);
        Path out = tmp.resolve("wide.html");
        String javaBin = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        Process p = new ProcessBuilder(javaBin, "-Xmx256m", "-cp", System.getProperty("java.class.path"),
                "org.edgewise.driver.cli.EdgewiseCli", "report", "--result", result.toString(), "--out", out.toString())
                .redirectErrorStream(false).start();
        String err = new String(p.getErrorStream().readAllBytes(), java.nio.charset.StandardCharsets.UTF_8).strip();
        String stdout = new String(p.getInputStream().readAllBytes(), java.nio.charset.StandardCharsets.UTF_8);
        assertTrue(p.waitFor(120, java.util.concurrent.TimeUnit.SECONDS), "finished");
        long heap = Long.parseLong(err.replaceAll(".*heap \\((\\d+) MiB\\).*", "$1"));
        assertEquals("report: a report of 800 variables (a 800 × 800 heatmap) needs about 549 MiB to read and build, more than half"
                + " the heap (" + heap + " MiB); raise it with EDGEWISE_JAVA_OPTS=-Xmx…", err);
        assertEquals(2, p.exitValue());
        assertEquals("", stdout);
        assertTrue(Files.notExists(out), "nothing written");
        assertArrayEquals(before, Files.readAllBytes(result), "result unchanged");
        try (var ls = Files.list(tmp)) {
            assertEquals(java.util.List.of(result), ls.toList(), "no temporary left");
        }
    }
}
