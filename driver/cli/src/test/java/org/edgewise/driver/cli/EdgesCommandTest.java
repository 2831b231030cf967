package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.Set;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderSum;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code edges} end to end: JSON shape (DESIGN.md, "JSON result of edges"), sweeps, and every refusal word for word. */
class EdgesCommandTest extends StoreFixture {

    @Override
    long seed() {
        return 77_001_002L;
    }

    @Test
    void jsonHasOneEntryPerOrderedPair() throws Exception {
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--order", ORDER, "--format", "json", "--top-parents", "3");
        assertEquals(0, r.status(), r.err());
        JsonNode j = JSON.readTree(r.out());
        assertEquals("order", j.get("method").asText());
        assertEquals(5, j.get("variables").size());
        assertEquals(20, j.get("edges").size(), "n(n-1) ordered pairs");
        Set<String> pairs = new HashSet<>();
        String[] ord = ORDER.split(",");
        for (JsonNode e : j.get("edges")) {
            String from = e.get("from").asText();
            String to = e.get("to").asText();
            assertFalse(from.equals(to));
            assertTrue(pairs.add(from + ">" + to), "pair listed once");
            double p = e.get("posterior").asDouble();
            assertTrue(p >= 0 && p <= 1);
            if (indexOf(ord, from) > indexOf(ord, to)) {
                assertEquals(0.0, p, 0, "the order forbids " + from + " -> " + to);
            }
        }
        // Same numbers as the library on the in-memory store (the CLI read it back from disk).
        OrderSum.OrderResult ref = OrderSum.evaluate(LocalScores.build(mem, ScoringOptions.asStored()), new int[] {3, 0, 4, 1, 2});
        assertEquals(ref.logEvidence(), j.get("logEvidence").asDouble(), 1e-9);
        assertEquals(ref.logEvidenceNormalized(), j.get("logEvidenceNormalized").asDouble(), 1e-9);
        assertEquals(ref.edgePosterior()[0][1], find(j, "v0", "v1"), 1e-12);
        assertEquals("order-modular", j.get("evidenceConvention").asText());
        assertEquals(5, j.get("order").size());
        assertEquals("bdeu", j.get("settings").get("score").asText());
        assertEquals(2, j.get("settings").get("maxParents").asInt());
        assertEquals(store.toString(), j.get("store").get("path").asText());
        assertEquals(80, j.get("store").get("rows").asLong());
        assertEquals(5, j.get("parentSets").size());
        for (JsonNode vp : j.get("parentSets")) {
            assertTrue(vp.get("top").size() <= 3 && vp.get("top").size() >= 1);
        }
        // v3 is first in the order: its only parent set is the empty one, with posterior 1.
        assertEquals(0, j.get("bestNetwork").get("parents").get("v3").size());
        assertEquals(1.0, j.get("parentSets").get(3).get("top").get(0).get("posterior").asDouble(), 1e-12);
        assertEquals(5, j.get("bestNetwork").get("parents").size());
    }

    @Test
    void essSweepPutsTheOthersIntoSensitivity() throws Exception {
        Path out = dir.resolve("r.json");
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--order", ORDER, "--ess", "0.5,1,8", "--out", out.toString());
        assertEquals(0, r.status(), r.err());
        JsonNode j = JSON.readTree(Files.readString(out));
        assertEquals(0.5, j.get("settings").get("ess").asDouble());
        assertEquals(2, j.get("sensitivity").size());
        assertEquals(8.0, j.get("sensitivity").get(1).get("ess").asDouble());
        // Each sweep entry equals a separate run at that ESS.
        CliRun single = CliRun.of("edges", "--store", store.toString(), "--order", ORDER, "--ess", "8", "--format", "json");
        JsonNode k = JSON.readTree(single.out());
        assertEquals(k.get("logEvidence").asDouble(), j.get("sensitivity").get(1).get("logEvidence").asDouble(), 1e-12);
        assertEquals(k.get("edges"), j.get("sensitivity").get(1).get("edges"));
    }

    @Test
    void tableForPeople() {
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--order", ORDER, "--ess", "1,4");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("Most probable parent sets"), r.out());
        assertTrue(r.out().contains("Best single network under the order"));
        assertTrue(r.out().contains("ESS 4"));
        assertTrue(r.out().contains("not proof of causation"));
    }

    @Test
    void refusals() throws Exception {
        String s = store.toString();
        refused("edges: --order misses variable v2; it must list every variable of the store exactly once",
                "edges", "--store", s, "--order", "v3,v0,v4,v1");
        refused("edges: --order: variable 'v1' appears more than once",
                "edges", "--store", s, "--order", "v3,v1,v4,v1,v2,v0");
        refused("edges: --order: unknown variable 'zz' (variables: v0, v1, v2, v3, v4)",
                "edges", "--store", s, "--order", "v3,v0,zz,v4,v1,v2");
        refused("edges: --ess must be positive, got 0.0", "edges", "--store", s, "--order", ORDER, "--ess", "1,0");
        refused("edges: --ess must be positive, got -2.0", "edges", "--store", s, "--order", ORDER, "--ess=-2");
        refused("edges: --require v1->v0 is impossible under this order: v1 comes after v0",
                "edges", "--store", s, "--order", ORDER, "--require", "v1->v0");
        refused("edges: --require is impossible: variable v2 would need 3 parents (v0, v1, v4) but the store's in-degree bound d is 2",
                "edges", "--store", s, "--order", ORDER, "--require", "v0->v2,v1->v2,v4->v2");
        refused("edges: give --order a,b,c,… (averaging given an order) or --method exact|mcmc (over unknown orders)",
                "edges", "--store", s);
        refused("edges: --order and --method exact exclude each other: exact averages over unknown orders",
                "edges", "--store", s, "--method", "exact", "--order", ORDER);
        refused("edges: --method must be order, exact or mcmc, got 'best'", "edges", "--store", s, "--method", "best");
        refused("edges: --format must be table or json, got 'xml'", "edges", "--store", s, "--order", ORDER, "--format", "xml");
        // A damaged store: one byte of the counts changed.
        Path counts = store.resolve("counts.parquet");
        byte[] b = Files.readAllBytes(counts);
        b[b.length / 2] ^= 1;
        Files.write(counts, b);
        refused("edges: store " + s + " is damaged: counts.parquet does not match its manifest (SHA-256 differs); re-run the tally",
                "edges", "--store", s, "--order", ORDER);
        assertFalse(Files.exists(dir.resolve("none.json")));
    }

    static void refused(String message, String... args) {
        CliRun r = CliRun.of(args);
        assertEquals(2, r.status(), "exit status for: " + String.join(" ", args));
        assertEquals(message, r.errLine());
        assertEquals("", r.out());
    }

    static int indexOf(String[] a, String x) {
        for (int i = 0; i < a.length; i++) {
            if (a[i].equals(x)) {
                return i;
            }
        }
        return -1;
    }

    static double find(JsonNode j, String from, String to) {
        for (JsonNode e : j.get("edges")) {
            if (e.get("from").asText().equals(from) && e.get("to").asText().equals(to)) {
                return e.get("posterior").asDouble();
            }
        }
        throw new AssertionError("no edge " + from + " -> " + to);
    }
}
