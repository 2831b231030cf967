package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.exact.StructureSum;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code edges --method exact|mcmc} end to end: JSON shape, agreement with the library, refusals word for word. */
class UnknownOrderEdgesTest extends StoreFixture {

    @Override
    long seed() {
        return 5_003L;
    }

    private static double edge(JsonNode j, String from, String to) {
        for (JsonNode e : j.get("edges")) {
            if (e.get("from").asText().equals(from) && e.get("to").asText().equals(to)) {
                return e.get("posterior").asDouble();
            }
        }
        throw new AssertionError(from + "->" + to);
    }

    @Test
    void exactAndMcmcAgreeAndReportTheirDiagnostics() throws Exception {
        CliRun ex = CliRun.of("edges", "--store", store.toString(), "--method", "exact", "--format", "json",
                "--features", "ancestors,markov-blanket", "--dag-samples", "2000", "--dag-prior", "order-modular");
        assertEquals(0, ex.status(), ex.err());
        JsonNode e = JSON.readTree(ex.out());
        assertEquals("exact", e.get("method").asText());
        assertEquals("order-modular", e.get("dagPrior").asText());
        assertEquals(20, e.get("edges").size());
        ExactOrderSum.Result lib = ExactOrderSum.run(LocalScores.build(mem, ScoringOptions.asStored()), OrderConstraints.none(5));
        assertEquals(lib.logEvidence(), e.get("logEvidence").asDouble(), 1e-9);
        assertEquals(lib.edgePosterior()[0][1], edge(e, "v0", "v1"), 1e-12);
        // 20 ancestor pairs + 10 unordered Markov-blanket pairs
        assertEquals(30, e.get("features").size());

        CliRun mc = CliRun.of("edges", "--store", store.toString(), "--method", "mcmc", "--format", "json",
                "--steps", "20000", "--seed", "7", "--dag-prior", "order-modular");
        assertEquals(0, mc.status(), mc.err());
        JsonNode m = JSON.readTree(mc.out());
        assertEquals("mcmc", m.get("method").asText());
        JsonNode d = m.get("diagnostics");
        assertEquals(4, d.get("chains").asInt());
        assertEquals(20000, d.get("steps").asLong());
        assertEquals(5000, d.get("burnIn").asLong());
        assertTrue(d.get("rhat").asDouble() < 1.05, d.toString());
        assertEquals(4, d.get("traces").size());
        assertEdgesWithin(e, m, 0.05);
        // the same seed: the same JSON numbers
        CliRun again = CliRun.of("edges", "--store", store.toString(), "--method", "mcmc", "--format", "json",
                "--steps", "20000", "--seed", "7", "--dag-prior", "order-modular");
        assertEquals(m.get("edges"), JSON.readTree(again.out()).get("edges"));
    }

    @Test
    void structureModularIsTheDefaultExactAndMcmcAgreeWithTheLibrary() throws Exception {
        CliRun ex = CliRun.of("edges", "--store", store.toString(), "--method", "exact", "--format", "json",
                "--features", "essential-graph", "--dag-samples", "4000");
        assertEquals(0, ex.status(), ex.err());
        JsonNode e = JSON.readTree(ex.out());
        assertEquals("structure-modular", e.get("dagPrior").asText());
        assertEquals("structure-modular", e.get("evidenceConvention").asText());
        StructureSum.Result lib = StructureSum.run(LocalScores.build(mem, ScoringOptions.asStored()), OrderConstraints.none(5));
        assertEquals(lib.logEvidence(), e.get("logEvidence").asDouble(), 1e-9);
        assertEquals(lib.edgePosterior()[0][1], edge(e, "v0", "v1"), 1e-12);
        // one entry per unordered pair; adjacent = aToB + bToA + undirected (each DAG falls in exactly one)
        assertEquals(10, e.get("essentialGraph").size());
        for (JsonNode p : e.get("essentialGraph")) {
            assertEquals(p.get("adjacent").asDouble(), p.get("aToB").asDouble() + p.get("bToA").asDouble()
                    + p.get("undirected").asDouble(), 1e-9, p.toString());
            // adjacency from draws against the exact P(a->b) + P(b->a), within 5 MCSE
            double exact = edge(e, p.get("a").asText(), p.get("b").asText()) + edge(e, p.get("b").asText(), p.get("a").asText());
            assertEquals(exact, p.get("adjacent").asDouble(), 5 * p.get("mcse").asDouble() + 1e-3, p.toString());
        }
        CliRun mc = CliRun.of("edges", "--store", store.toString(), "--method", "mcmc", "--format", "json",
                "--steps", "20000", "--seed", "7", "--features", "essential-graph");
        assertEquals(0, mc.status(), mc.err());
        JsonNode m = JSON.readTree(mc.out());
        assertEquals("structure-modular", m.get("dagPrior").asText());
        assertEdgesWithin(e, m, 0.05);
        CliRun again = CliRun.of("edges", "--store", store.toString(), "--method", "mcmc", "--format", "json",
                "--steps", "20000", "--seed", "7", "--features", "essential-graph");
        assertEquals(m.get("edges"), JSON.readTree(again.out()).get("edges"));
        assertEquals(m.get("essentialGraph"), JSON.readTree(again.out()).get("essentialGraph"));
        CliRun table = CliRun.of("edges", "--store", store.toString(), "--method", "exact", "--features", "essential-graph");
        assertTrue(table.out().contains("DAG prior structure-modular"), table.out());
        assertTrue(table.out().contains("Essential graph (DAG prior structure-modular"), table.out());
        CliRun given = CliRun.of("edges", "--store", store.toString(), "--order", "v0,v1,v2,v3,v4", "--format", "json");
        assertEquals("either (order given)", JSON.readTree(given.out()).get("dagPrior").asText());
        assertEquals("edges: --dag-prior must be structure-modular or order-modular, got 'uniform'",
                CliRun.of("edges", "--store", store.toString(), "--method", "exact", "--dag-prior", "uniform").errLine());
    }

    @Test
    void tableShowsDiagnosticsAndTheCaution() {
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--method", "mcmc", "--steps", "2000", "--allow-unconverged", "--draws", "100");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("\nConvergence (sampled by MCMC: every posterior carries its Monte Carlo standard error)\n"
                + "  verdict   "), r.out());
        assertTrue(r.out().contains("\n  targets   R-hat < 1.01, bulk effective sample size >= 400, MCSE <= 0.01 for every edge and feature "
                + "posterior\n"),
                r.out());
        CliRun ex = CliRun.of("edges", "--store", store.toString(), "--method", "exact");
        assertTrue(ex.out().contains("\nEdge posteriors are exact (summed over every order or DAG, not sampled): no Monte Carlo "
                + "error, no convergence to check.\n"), ex.out());
        assertTrue(!ex.out().contains("Convergence"), ex.out());
        assertTrue(r.out().contains("not proof of causation"), r.out());
    }

    /** Every edge posterior of {@code exact} is within {@code tol} of the same edge's in {@code sampled}. */
    private static void assertEdgesWithin(JsonNode exact, JsonNode sampled, double tol) {
        for (JsonNode x : exact.get("edges")) {
            double p = edge(sampled, x.get("from").asText(), x.get("to").asText());
            assertEquals(x.get("posterior").asDouble(), p, tol, x.toString());
        }
    }

    @Test
    void tooShortRunWarns() throws Exception {
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--method", "mcmc", "--allow-unconverged", "--steps", "8", "--draws", "4",
                "--burn-in", "0", "--chains", "4", "--format", "json");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.err().contains("edges: WARNING: not converged (a fixed number of steps was run, with no check until "
                + "converged; needs R-hat < 1.01, bulk effective sample size >= 400, MCSE <= 0.01 for every edge and feature "
                + "posterior): the posteriors are not reliable. Worst: "), r.err());
        assertTrue(r.err().contains(". Run longer: raise the steps per chain (--steps) or run until converged instead (no --steps, "
                + "or --rhat-target)."), r.err());
        assertFalse(r.err().contains("--max-time"), "refused after --steps, so never advised: " + r.err());
        JsonNode d = JSON.readTree(r.out()).get("diagnostics");
        assertEquals("steps", d.get("stopReason").asText());
        assertTrue(d.get("worst").size() >= 1, d.toString());
    }

    @Test
    void withoutStepsRunsUntilConverged() throws Exception {
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--method", "mcmc", "--format", "json", "--seed", "3");
        assertEquals(0, r.status(), r.err());
        JsonNode d = JSON.readTree(r.out()).get("diagnostics");
        assertEquals("converged", d.get("stopReason").asText(), d.toString());
        ((com.fasterxml.jackson.databind.node.ObjectNode) d).remove("traces");
        assertTrue(d.get("converged").asBoolean(), d.toString());
        assertEquals(1.01, d.get("rhatTarget").asDouble(), 0.0);
        assertEquals(400, d.get("effectiveSampleSizeTarget").asDouble(), 0.0);
        assertEquals(0.01, d.get("mcseTarget").asDouble(), 0.0);
        assertTrue(d.get("mcse").asDouble() <= 0.01, d.toString());
        for (JsonNode e : JSON.readTree(r.out()).get("edges")) {
            assertTrue(e.get("mcse").asDouble() <= 0.01, e.toString()); // every reported posterior meets the target
        }
        assertTrue(d.get("rhat").asDouble() < 1.01 && d.get("bulkEffectiveSampleSize").asDouble() >= 400, d.toString());
        assertTrue(d.get("tailEffectiveSampleSize").asDouble() > 0, d.toString());
        // one word, one meaning: "ess" is BDeu's equivalent sample size (settings.ess), never the MCMC's
        for (String old : List.of("ess", "essTail", "essTarget")) {
            assertFalse(d.has(old), old + " in " + d);
        }
        for (JsonNode w : d.has("worst") ? d.get("worst") : JSON.createArrayNode()) {
            assertFalse(w.has("ess") || w.has("essTail"), w.toString());
        }
        assertEquals(d.get("steps").asLong(), d.get("burnIn").asLong()); // the first half is warm-up
    }

    @Test
    void refusals() {
        String s = store.toString();
        assertEquals("edges: --tiers: unknown variable 'zz' (variables: v0, v1, v2, v3, v4)",
                CliRun.of("edges", "--store", s, "--method", "exact", "--tiers", "v0,zz").errLine());
        assertEquals("edges: --features: unknown feature 'paths' (valid: ancestors, markov-blanket, essential-graph)",
                CliRun.of("edges", "--store", s, "--method", "mcmc", "--features", "paths").errLine());
        assertEquals("edges: --rhat-target must be above 1 (e.g. 1.01), got 0.9",
                CliRun.of("edges", "--store", s, "--method", "mcmc", "--rhat-target", "0.9").errLine());
        assertEquals("edges: --until-rhat is now --rhat-target (beside --mcse-target): give --rhat-target 1.02",
                CliRun.of("edges", "--store", s, "--method", "mcmc", "--until-rhat", "1.02").errLine());
        assertEquals("edges: --samples and --order-samples are now --dag-samples (they count DAGs drawn for --features): give --dag-samples 10",
                CliRun.of("edges", "--store", s, "--method", "exact", "--order-samples", "10").errLine());
        assertEquals("edges: --max-time applies when running until converged (no --steps, or --rhat-target)",
                CliRun.of("edges", "--store", s, "--method", "mcmc", "--steps", "100", "--max-time", "5").errLine());
        assertEquals("edges: --burn-in applies to a fixed run (--steps without --rhat-target); "
                        + "running until converged discards the first half of each chain",
                CliRun.of("edges", "--store", s, "--method", "mcmc", "--burn-in", "5").errLine());
        assertEquals("edges: --mcse-target must be between 0.005 and 0.5, got 0.001",
                CliRun.of("edges", "--store", s, "--method", "mcmc", "--mcse-target", "0.001").errLine());
        assertEquals("edges: --chains must be at least 1, got 0",
                CliRun.of("edges", "--store", s, "--method", "mcmc", "--chains", "0").errLine());
        assertEquals("edges: --require v0->v1 contradicts --tiers: v0 is in a later tier than v1",
                CliRun.of("edges", "--store", s, "--method", "exact", "--tiers", "v1", "--tiers", "v0", "--require", "v0->v1").errLine());
        assertEquals("edges: the required edges and tiers form a cycle through variable v0: no order satisfies them",
                CliRun.of("edges", "--store", s, "--method", "mcmc", "--require", "v0->v1,v1->v2,v2->v0").errLine());
    }
    /** Issue 11: a refused exact sum is said once (the refusal), not announced first and refused after. */
    @Test
    void aRefusedExactSumIsSaidOnce(@TempDir Path tmp) {
        int[] arities = new int[30];
        java.util.Arrays.fill(arities, 2);
        ScoreStore wide = org.edgewise.driver.store.InMemoryTally.tally(org.edgewise.driver.HeldOutData.variables(arities),
                org.edgewise.driver.HeldOutData.table(11, 40, arities), 1, org.edgewise.driver.score.FamilyScore.withDefaults());
        Path dir = tmp.resolve("wide");
        org.edgewise.driver.store.StoreWriter.write(dir, wide.manifest(), wide.families(), wide.logScores(), false);
        // the figures depend on this JVM's free heap at the moment, so they are matched as numbers
        CliRun r = CliRun.of("edges", "--store", dir.toString(), "--method", "exact");
        assertEquals(2, r.status());
        assertEquals(1, r.err().lines().count(), r.err());
        assertTrue(r.errLine().matches("edges: exact structure-modular sum for n = 30 needs about [0-9.]+ GiB and [0-9.e+]+ s"
                + " on idle cores here; this JVM allows n <= [0-9]+; use --method mcmc \\(sampling under the same prior\\)"
                + " or --dag-prior order-modular \\(exact to larger n\\) \\(or raise the heap with EDGEWISE_JAVA_OPTS=-Xmx…\\)"),
                r.errLine());
        CliRun ro = CliRun.of("edges", "--store", dir.toString(), "--method", "exact", "--dag-prior", "order-modular");
        assertEquals(2, ro.status());
        assertEquals(1, ro.err().lines().count(), ro.err());
        assertTrue(ro.errLine().startsWith("edges: exact sum over orders for n = 30 needs about "), ro.errLine());
        assertTrue(ro.errLine().endsWith(" MiB; raise it with EDGEWISE_JAVA_OPTS=-Xmx…, or use --method mcmc)"), ro.errLine());
    }
}
