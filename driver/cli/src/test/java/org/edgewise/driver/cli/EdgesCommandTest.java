package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderSum;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.result.EdgeResult;
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

    /** The lines that lead the table over unknown orders (exact: the adjacencies are sums, not samples). */
    private static final String HEAD = """
            Edge posteriors (exact; DAG prior structure-modular; score bdeu, ESS 1, prior uniform, d = 2)
            log evidence -289.042739 (structure-modular: prior over the admitted DAGs, each counted once)

            Adjacencies P(a -- b) = P(a -> b) + P(b -> a), most probable first (the skeleton: the same whichever way the edges point)
              a       b      adjacent
              v2   -- v3       0.9999
              v2   -- v4       0.9999
              v1   -- v2       0.9866
              v0   -- v1       0.9635
              v3   -- v4       0.9553
              v0   -- v3       0.9236
              v0   -- v2       0.0412
              v1   -- v3       0.0019
              v0   -- v4       0.0014
              (9 of 10 unordered pairs shown: adjacent >= 0.001, at most 40)
            """;

    private static final String DIRECTED = """

            Directed edges P(a -> b): their directions depend on the DAG prior (structure-modular) and are identifiable from the data only where compelled
              from    to    posterior    ESS 0.1     ESS 10
            """;

    @Test
    void unknownOrdersLeadWithAdjacenciesAndCompelledDirectionsAndFlagWhatTheEssSweepFlips() throws Exception {
        // a store whose data show a v-structure v1 -> v2 <- v3, so that directions are compelled
        Path s2 = dir.resolve("v-structure");
        CliRun.store(s2, 2L, 2);
        String[] args = {"edges", "--store", s2.toString(), "--method", "exact", "--ess", "1,0.1,10",
                "--features", "essential-graph", "--dag-samples", "2000", "--seed", "3"};
        CliRun r = CliRun.of(args);
        assertEquals(0, r.status(), r.err());
        String out = r.out();
        assertTrue(out.startsWith(HEAD + """

                Compelled directions P(a -> b compelled): the same in every DAG of the equivalence class (DAGs drawn from the posterior: Monte Carlo estimates)
                  from    to    compelled
                  v1   -> v2       0.9055
                  v3   -> v2       0.9055
                  v2   -> v4       0.9055
                  v3   -> v4       0.8615
                  (4 shown: P(compelled) >= 0.01, at most 40)
                """ + DIRECTED), out);
        assertTrue(out.contains("""

                fragile under the ESS sweep: v1 -> v2 0.93 (0.93 at ESS 1, 0.46 at ESS 10)
                fragile under the ESS sweep: v3 -> v4 0.91 (0.91 at ESS 1, 0.17 at ESS 0.1)
                fragile under the ESS sweep: v0 -> v1 0.62 (0.62 at ESS 1, 0.30 at ESS 10)
                fragile under the ESS sweep: v0 -> v3 0.61 (0.61 at ESS 1, 0.24 at ESS 10)
                fragile under the ESS sweep: v1 -> v2 compelled 0.91 (0.91 at ESS 1, 0.24 at ESS 10)
                fragile under the ESS sweep: v2 -> v4 compelled 0.91 (0.91 at ESS 1, 0.25 at ESS 10)
                fragile under the ESS sweep: v3 -> v2 compelled 0.91 (0.91 at ESS 1, 0.24 at ESS 10)
                fragile under the ESS sweep: v3 -> v4 compelled 0.86 (0.86 at ESS 1, 0.12 at ESS 0.1)
                  (a headline posterior >= 0.5 that falls below 0.5 at another ESS: the choice of ESS, not the data, settles it)
                """), out);
        assertFalse(out.contains("fragile under the ESS sweep: v2 -> v4 0.97"), "v2 -> v4 stays above 0.5 at every ESS");
        assertTrue(out.endsWith("""
                An edge posterior is evidence of statistical dependence under the stated assumptions (d, score,
                prior and DAG prior), not proof of causation; even a compelled direction is causal only under
                further assumptions (no hidden common causes, no selection). Interpret it with domain experts.
                """), out);

        // the same run as JSON: the fragile list the text printed, each sweep entry with its essential graph
        Path json = dir.resolve("v.json");
        String[] withOut = java.util.Arrays.copyOf(args, args.length + 2);
        withOut[args.length] = "--out";
        withOut[args.length + 1] = json.toString();
        CliRun j = CliRun.of(withOut);
        assertEquals(0, j.status(), j.err());
        JsonNode root = JSON.readTree(Files.readString(json));
        JsonNode fragile = root.get("fragile");
        assertEquals(8, fragile.size());
        assertEquals("{\"kind\":\"edge\",\"from\":\"v1\",\"to\":\"v2\",\"posterior\":" + find(root, "v1", "v2")
                + ",\"ess\":1.0,\"min\":" + find(root.get("sensitivity").get(1), "v1", "v2") + ",\"minEss\":10.0,\"max\":"
                + find(root, "v1", "v2") + ",\"maxEss\":1.0}", fragile.get(0).toString());
        assertEquals("compelled", fragile.get(4).get("kind").asText());
        assertEquals(10, root.get("sensitivity").get(0).get("essentialGraph").size());

        // the report of that result flags them in its cautions and its summary
        Path html = dir.resolve("v.html");
        CliRun rep = CliRun.of("report", "--result", json.toString(), "--out", html.toString());
        assertEquals(0, rep.status(), rep.err());
        String page = Files.readString(html);
        assertTrue(page.contains("<li><b>Fragile under the ESS sweep:</b> v1 \u2192 v2 0.93 (0.93 at ESS 1, 0.46 at ESS 10); "), page);
        assertTrue(page.contains("<tr><th>fragile under the ESS sweep</th><td><b>v1 \u2192 v2 0.93"), page);

        // without the essential graph: compelled directions not computed, and said so
        CliRun plain = CliRun.of("edges", "--store", s2.toString(), "--method", "exact", "--ess", "1,0.1,10");
        assertEquals(0, plain.status(), plain.err());
        assertTrue(plain.out().startsWith(HEAD + """

                Compelled directions: not computed (add --features essential-graph to see which directions the data fix)
                """ + DIRECTED), plain.out());
    }

    @Test
    void givenAnOrderTheOrderFixesTheDirectionsAndSaysSo() {
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--order", ORDER);
        assertEquals(0, r.status(), r.err());
        assertFalse(r.out().contains("Adjacencies"));
        assertTrue(r.out().contains("""

                Directed edges P(a -> b) given the order: the order fixes every direction (an assumption you made, not learned from the data)
                  from    to    posterior
                """), r.out());
        assertTrue(r.out().contains("(this order,\nd, score and prior), not proof of causation."), r.out());
    }

    @Test
    void fragilityOfAConstructedResultWordForWord() {
        // a -> b (0.9) falls to 0.3 at ESS 10 and the compelled a -> c (0.8) to 0.4 at ESS 0.1: flagged;
        // b -> c (0.6) stays above 0.5 at every ESS and the compelled b -> c (0.55) too: not flagged
        EdgeResult swept = org.edgewise.driver.result.FragilityTest.swept();
        assertEquals("""

                fragile under the ESS sweep: a -> b 0.90 (0.95 at ESS 0.1, 0.30 at ESS 10)
                fragile under the ESS sweep: a -> c compelled 0.80 (0.85 at ESS 10, 0.40 at ESS 0.1)
                  (a headline posterior >= 0.5 that falls below 0.5 at another ESS: the choice of ESS, not the data, settles it)
                """, EdgesCommand.fragility(swept));
        assertTrue(EdgesCommand.table(swept, true).contains(EdgesCommand.fragility(swept)));
        // a sweep in which nothing crosses
        EdgeResult calm = new EdgeResult(swept.method(), swept.variables(), swept.logEvidence(), null, swept.evidenceConvention(),
                null, swept.settings(), null, swept.edges(), null, null, null, null,
                List.of(new EdgeResult.Sensitivity(4, null, swept.edges(), swept.essentialGraph())), swept.dagPrior(),
                swept.essentialGraph());
        assertEquals("\nno headline edge or compelled direction crosses 0.5 under the ESS sweep (ESS 1, 4)\n",
                EdgesCommand.fragility(calm));
        // no sweep: nothing
        assertEquals("", EdgesCommand.fragility(new EdgeResult(swept.method(), swept.variables(), null, null, null, null,
                swept.settings(), null, swept.edges(), null, null, null, null, null, swept.dagPrior(), null)));
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
