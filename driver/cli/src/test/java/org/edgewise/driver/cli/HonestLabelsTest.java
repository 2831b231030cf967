package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Honest labels (issue 10, item 6): sampled orders say so and carry an MCSE, exact single cases by
 * Z(D ∪ x) / Z(D), options that do not apply are refused word for word, K2 reports no ESS, and a
 * Monte Carlo estimate of exactly 0 reports the rule-of-three bound 3/K.
 */
class HonestLabelsTest {
    static final ObjectMapper JSON = new ObjectMapper();
    /** Eight binary variables: n ≥ 8, where predict --method exact mixes sampled orders. */
    static final int[] AR8 = {2, 2, 2, 2, 2, 2, 2, 2};
    static final String CASE8 = "v0=s1,v1=s0,v2=s1,v3=s1,v4=s0,v5=s0,v6=s1,v7=s0";
    static final int[] X8 = {1, 0, 1, 1, 0, 0, 1, 0};

    @TempDir
    Path dir;
    Path store8;
    int[][] rows8;
    Path store5;

    @BeforeEach
    void setUp() {
        store8 = dir.resolve("store8");
        rows8 = HeldOutData.table(10_008L, 120, AR8);
        CliRun.store(store8, rows8, AR8, 2);
        store5 = dir.resolve("store5");
        CliRun.store(store5, 10_005L, 2);
    }

    private double logOrderSum(int[][] table) {
        ScoreStore s = InMemoryTally.tally(HeldOutData.variables(AR8), table, 2, FamilyScore.withDefaults());
        return ExactOrderSum.run(LocalScores.build(s, ScoringOptions.asStored()), OrderConstraints.none(AR8.length)).logOrderSum();
    }

    /**
     * n = 8: the default mixes 1,000 orders sampled from the exact order posterior — labelled
     * "sampled" with its MCSE; --exact-cases gives the exact value, equal to the recount
     * Z(D ∪ x)/Z(D) (predictive recount identity, Bayes' rule) to 1e-9, and the sampled estimate
     * lies within 5 MCSE of it (common practice for a Monte Carlo check).
     */
    @Test
    void sampledOrdersAreLabelledAndExactCasesAreExact() throws Exception {
        String s = store8.toString();
        CliRun sampled = CliRun.of("predict", "--dag-prior", "order-modular", "--store", s, "--method", "exact", "--case", CASE8, "--format", "json",
                "--tail-mass", "0");
        assertEquals(0, sampled.status(), sampled.err());
        JsonNode j = JSON.readTree(sampled.out());
        assertEquals("sampled orders", j.get("averagedOver").asText());
        assertEquals(1000, j.get("samples").asInt());
        assertEquals("order-modular", j.get("dagPrior").asText());
        assertEquals("exact", j.get("method").asText());
        double mcse = j.get("mcse").asDouble();
        assertTrue(mcse > 0, j.toString());

        CliRun ex = CliRun.of("predict", "--dag-prior", "order-modular", "--store", s, "--method", "exact", "--exact-cases", "--case", CASE8, "--format", "json");
        assertEquals(0, ex.status(), ex.err());
        JsonNode e = JSON.readTree(ex.out());
        assertEquals("all orders", e.get("averagedOver").asText());
        assertTrue(e.get("exactCase").asBoolean());
        assertFalse(e.has("mcse"));
        assertFalse(e.has("samples"));
        double expected = logOrderSum(HeldOutData.plus(rows8, X8)) - logOrderSum(rows8);
        assertEquals(expected, e.get("logProbability").asDouble(), 1e-9);
        double p = Math.exp(expected);
        assertEquals(p, j.get("probability").asDouble(), 5 * mcse, "sampled within 5 MCSE of exact");

        CliRun table = CliRun.of("predict", "--dag-prior", "order-modular", "--store", s, "--method", "exact", "--case", CASE8);
        assertTrue(table.out().contains("averaged over orders (exact: 1000 sampled orders, "), table.out());
        assertTrue(table.out().contains("Monte Carlo standard error"), table.out());
    }

    @Test
    void allOrdersSayAllAndBatchesCarryAnMcseColumn() throws Exception {
        CliRun r = CliRun.of("predict", "--dag-prior", "order-modular", "--store", store5.toString(), "--method", "exact", "--case", "v0=s1", "--format", "json");
        JsonNode j = JSON.readTree(r.out());
        assertEquals("all orders", j.get("averagedOver").asText());
        assertFalse(j.has("mcse"));
        assertFalse(j.has("samples"));
        Path cases = dir.resolve("cases.csv");
        Files.writeString(cases, "v0,v1\ns1,s2\ns0,\n");
        CliRun b = CliRun.of("predict", "--dag-prior", "order-modular", "--store", store5.toString(), "--method", "mcmc", "--steps", "2000", "--allow-unconverged", "--cases", cases.toString());
        assertEquals(0, b.status(), b.err());
        String[] lines = b.out().split("\n");
        assertEquals("v0,v1,probability,logProbability,bestNetworkProbability,bestNetworkLogProbability,mcse", lines[0]);
        assertEquals(7, lines[1].split(",").length, "two case columns, five figures");
        CliRun all = CliRun.of("predict", "--dag-prior", "order-modular", "--store", store5.toString(), "--method", "exact", "--cases", cases.toString());
        assertTrue(all.out().startsWith("v0,v1,probability,logProbability,bestNetworkProbability,bestNetworkLogProbability\n"), all.out());
    }

    @Test
    void optionsThatDoNotApplyAreRefused() {
        String s = store5.toString();
        String order = "v0,v1,v2,v3,v4";
        assertEquals("edges: --tiers does not apply with --order: the order already fixes which variable comes first; "
                        + "give the order that respects the tiers",
                CliRun.of("edges", "--store", s, "--order", order, "--tiers", "v0").errLine());
        assertEquals("predict: --features does not apply with --order: features are estimated over unknown orders "
                        + "(--method exact or mcmc)",
                CliRun.of("predict", "--store", s, "--order", order, "--features", "ancestors", "--case", "v0=s1").errLine());
        String k2 = "--ess does not apply to score k2: K2 has no equivalent sample size (every Dirichlet parameter is 1)";
        assertEquals("edges: " + k2, CliRun.of("edges", "--store", s, "--order", order, "--score", "k2", "--ess", "2").errLine());
        assertEquals("predict: " + k2, CliRun.of("predict", "--dag-prior", "order-modular", "--store", s, "--method", "exact", "--score", "k2", "--ess", "2",
                "--case", "v0=s1").errLine());
        assertEquals("scores: " + k2, CliRun.of("scores", "--store", s, "--score", "k2", "--ess", "2").errLine());
        assertEquals("predict: --exact-cases does not apply with --method mcmc: it computes the exact sum over all orders "
                        + "(--method exact)",
                CliRun.of("predict", "--dag-prior", "order-modular", "--store", s, "--method", "mcmc", "--exact-cases", "--case", "v0=s1").errLine());
        assertEquals("predict: --exact-cases does not apply with --given: a conditional needs P(given | D), a sum over the "
                        + "hidden variables",
                CliRun.of("predict", "--dag-prior", "order-modular", "--store", s, "--method", "exact", "--exact-cases", "--case", "v0=s1", "--given", "v1=s0").errLine());
        assertEquals("predict: --exact-cases needs every variable observed; v2 is hidden",
                CliRun.of("predict", "--dag-prior", "order-modular", "--store", s, "--method", "exact", "--exact-cases", "--case", "v0=s1,v1=s0").errLine());
        assertEquals(2, CliRun.of("edges", "--store", s, "--order", order, "--tiers", "v0").status());
    }

    @Test
    void k2ReportsNoEss() throws Exception {
        CliRun r = CliRun.of("edges", "--store", store5.toString(), "--order", "v0,v1,v2,v3,v4", "--score", "k2", "--format", "json");
        assertEquals(0, r.status(), r.err());
        JsonNode settings = JSON.readTree(r.out()).get("settings");
        assertEquals("k2", settings.get("score").asText());
        assertFalse(settings.has("ess"), settings.toString());
        CliRun t = CliRun.of("edges", "--store", store5.toString(), "--order", "v0,v1,v2,v3,v4", "--score", "k2");
        assertTrue(t.out().startsWith("Edge posteriors (order v0 < v1 < v2 < v3 < v4; DAG prior either (order given); score k2, prior uniform, d = 2)"), t.out());
    }

    /**
     * v0 may have no child (every v0 → x forbidden), so "v0 is an ancestor of v1" is 0 in every
     * sampled DAG: its error is the rule-of-three bound 3/K (Hanley &amp; Lippman-Hand 1983), not 0.
     */
    @Test
    void estimatesOfZeroReportTheRuleOfThree() throws Exception {
        CliRun r = CliRun.of("edges", "--store", store5.toString(), "--method", "exact", "--dag-prior", "order-modular", "--features", "ancestors",
                "--dag-samples", "500", "--forbid", "v0->v1,v0->v2,v0->v3,v0->v4", "--format", "json");
        assertEquals(0, r.status(), r.err());
        int checked = 0;
        for (JsonNode f : JSON.readTree(r.out()).get("features")) {
            if (f.get("from").asText().equals("v0")) {
                assertEquals(0.0, f.get("posterior").asDouble());
                assertEquals(3.0 / 500, f.get("mcse").asDouble(), 1e-15);
                checked++;
            }
        }
        assertEquals(4, checked);
        CliRun m = CliRun.of("edges", "--store", store5.toString(), "--method", "mcmc", "--dag-prior", "order-modular", "--steps", "2000", "--allow-unconverged", "--draws", "100",
                "--features", "ancestors", "--forbid", "v0->v1,v0->v2,v0->v3,v0->v4", "--format", "json");
        assertEquals(0, m.status(), m.err());
        for (JsonNode f : JSON.readTree(m.out()).get("features")) {
            if (f.get("from").asText().equals("v0")) {
                assertEquals(3.0 / 400, f.get("mcse").asDouble(), 1e-15, "4 chains x 100 stored draws");
            }
        }
    }
}
