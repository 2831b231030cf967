package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.query.CasePredictor;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreWriter;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code predict} end to end: values against the library (exact), CSV batches, and every refusal word for word. */
class PredictCommandTest {
    static final ObjectMapper JSON = new ObjectMapper();
    static final String ORDER = "v3,v0,v4,v1,v2";
    static final int[] ORD = {3, 0, 4, 1, 2};
    static final int H = -1;

    @TempDir
    Path dir;
    Path store;
    ScoreStore mem;
    CasePredictor avg;
    CasePredictor best;

    @BeforeEach
    void setUp() {
        store = dir.resolve("store");
        mem = CliRun.store(store, 64_646_464L, 2);
        OrderPosterior op = OrderPosterior.of(LocalScores.build(mem, ScoringOptions.asStored()), ORD);
        avg = CasePredictor.averaged(op, 0);
        best = CasePredictor.bestNetwork(op);
    }

    @Test
    void oneCaseAsJson() throws Exception {
        CliRun r = CliRun.of("predict", "--store", store.toString(), "--order", ORDER, "--case", "v2=s1, v0=s0", "--format", "json");
        assertEquals(0, r.status(), r.err());
        JsonNode j = JSON.readTree(r.out());
        int[] x = {0, H, 1, H, H};
        // The default tail mass 1e-12 moves nothing at 1e-9 on five variables.
        assertEquals(avg.logProbability(x), j.get("logProbability").asDouble(), 1e-9);
        assertEquals(Math.exp(avg.logProbability(x)), j.get("probability").asDouble(), 1e-9);
        assertEquals(best.logProbability(x), j.get("bestNetworkLogProbability").asDouble(), 1e-12);
        assertEquals(Math.exp(best.logProbability(x)), j.get("bestNetworkProbability").asDouble(), 1e-12);
        assertEquals("s1", j.get("case").get("v2").asText());
        assertTrue(j.get("note").asText().contains("not a measured frequency"));
    }

    @Test
    void conditionalIsARatioOfJoints() throws Exception {
        CliRun r = CliRun.of("predict", "--store", store.toString(), "--order", ORDER, "--case", "v2=s1",
                "--given", "v0=s1,v4=s2", "--format", "json", "--tail-mass", "0");
        assertEquals(0, r.status(), r.err());
        JsonNode j = JSON.readTree(r.out());
        double expected = avg.logProbability(new int[] {1, H, 1, H, 2}) - avg.logProbability(new int[] {1, H, H, H, 2});
        assertEquals(expected, j.get("logProbability").asDouble(), 1e-12);
    }

    @Test
    void scoresATableOfCases() throws Exception {
        Path in = dir.resolve("cases.csv");
        Files.writeString(in, "v1,v0,v3\ns2,s1,s0\n,s0,\n\"s1\",,s1\n");
        Path out = dir.resolve("scored.csv");
        CliRun r = CliRun.of("predict", "--store", store.toString(), "--order", ORDER, "--cases", in.toString(),
                "--out", out.toString(), "--tail-mass", "0");
        assertEquals(0, r.status(), r.err());
        List<String> lines = Files.readAllLines(out);
        assertEquals("v1,v0,v3,probability,logProbability,bestNetworkProbability,bestNetworkLogProbability", lines.get(0));
        assertEquals(4, lines.size());
        int[][] cases = {{1, 2, H, 0, H}, {0, H, H, H, H}, {H, 1, H, 1, H}};
        for (int i = 0; i < cases.length; i++) {
            String[] f = lines.get(i + 1).split(",");
            assertEquals(avg.logProbability(cases[i]), Double.parseDouble(f[4]), 1e-12, "row " + (i + 1));
            assertEquals(Math.exp(avg.logProbability(cases[i])), Double.parseDouble(f[3]), 1e-12);
            assertEquals(best.logProbability(cases[i]), Double.parseDouble(f[6]), 1e-12);
        }
    }

    @Test
    void refusals() throws Exception {
        String s = store.toString();
        refused("predict: --case: unknown variable 'zz' (variables: v0, v1, v2, v3, v4)",
                "predict", "--store", s, "--order", ORDER, "--case", "zz=s0");
        refused("predict: --case: variable 'v1' has no state 'q' (valid states: s0, s1, s2)",
                "predict", "--store", s, "--order", ORDER, "--case", "v1=q");
        refused("predict: --given: variable 'v0' has no state 's2' (valid states: s0, s1)",
                "predict", "--store", s, "--order", ORDER, "--case", "v1=s0", "--given", "v0=s2");
        refused("predict: --case: 'v1' is not name=state, e.g. v0=s0",
                "predict", "--store", s, "--order", ORDER, "--case", "v1");
        refused("predict: --order: unknown variable 'v9' (variables: v0, v1, v2, v3, v4)",
                "predict", "--store", s, "--order", "v3,v0,v4,v1,v2,v9", "--case", "v1=s0");
        refused("predict: --ess must be positive, got 0.0", "predict", "--store", s, "--order", ORDER, "--case", "v1=s0", "--ess", "0");
        refused("predict: give exactly one of --case a=x,b=y or --cases FILE", "predict", "--store", s, "--order", ORDER);
        refused("predict: --require v2->v4 is impossible under this order: v2 comes after v4",
                "predict", "--store", s, "--order", ORDER, "--case", "v1=s0", "--require", "v2->v4");
        refused("predict: summing out hidden variables v0, v1, v3, v4 would enumerate 36 joint states (limit 20); "
                        + "observe some of them or raise --max-hidden-states",
                "predict", "--store", s, "--order", ORDER, "--case", "v2=s0", "--max-hidden-states", "20");
        Path missing = dir.resolve("nope");
        refused("predict: store " + missing + " does not exist or is not a directory",
                "predict", "--store", missing.toString(), "--order", ORDER, "--case", "v1=s0");
    }

    /**
     * Evidence of probability zero: with d = 0, an ESS so small that α underflows to the smallest
     * double, and a state never observed, (0 + α)/(N + 2α) rounds to 0 (IEEE 754 double range).
     * Such an ESS is now refused up front, like every absurd ESS, by every command alike.
     */
    @Test
    void refusesAnEssSoSmallThatEvidenceWouldHaveProbabilityZero() {
        var vars = HeldOutData.variables(2, 2);
        int[][] rows = {{0, 1}, {0, 0}, {0, 1}};
        ScoreStore s = InMemoryTally.tally(vars, rows, 0, FamilyScore.withDefaults());
        Path p = dir.resolve("zero");
        StoreWriter.write(p, s.manifest(), s.families(), s.logScores(), false);
        refused("predict: --ess must be between 1e-9 and 1e15, got 1.0E-323 (beyond these the prior alone decides every"
                + " score, or the data alone)",
                "predict", "--store", p.toString(), "--order", "v0,v1", "--case", "v1=s0", "--given", "v0=s1", "--ess", "1e-323");
    }

    /** A case that contradicts its own evidence is refused in one line, never answered with a log of −∞ (issue 23). */
    @Test
    void aCaseThatContradictsItsEvidenceIsRefused() {
        refused("predict: --case sets v0=s0 but --given observed v0=s1: a case that contradicts its evidence has conditional "
                + "probability 0 by definition; nothing to average",
                "predict", "--store", store.toString(), "--order", ORDER, "--case", "v0=s0", "--given", "v0=s1");
    }

    /** {@code predict --cases f} with {@code content} in f is refused with "predict: f" + {@code message}. */
    private void refusedCsv(String store, Path f, String content, String message) throws Exception {
        Files.writeString(f, content);
        refused("predict: " + f + message, "predict", "--store", store, "--order", ORDER, "--cases", f.toString());
    }

    @Test
    void refusesBadCsv() throws Exception {
        String s = store.toString();
        Path f = dir.resolve("bad.csv");
        refusedCsv(s, f, "v1,id\ns0,7\n",
                ": line 1, column 2: unknown variable 'id' (variables: v0, v1, v2, v3, v4)");
        refusedCsv(s, f, "v1,v0\ns0,s1\ns2,x\n",
                ": line 3, column 2: variable 'v0' has no state 'x' (valid states: s0, s1)");
        refusedCsv(s, f, "v1,v0\ns0,s1,s0\n",
                ": line 2 has 3 fields, the header has 2");
        refusedCsv(s, f, "v1,v0\ns0,\"s1\n",
                ": line 2, column 2: unterminated quote (opened at character 4)");
        refusedCsv(s, f, "v1,v1\ns0,s1\n",
                ": line 1, column 2: variable 'v1' appears twice in the header");
        Path out = dir.resolve("out.csv");
        Files.writeString(f, "v1,v0\ns0,s1\ns2,x\n");
        CliRun.of("predict", "--store", s, "--order", ORDER, "--cases", f.toString(), "--out", out.toString());
        assertFalse(Files.exists(out), "nothing half-written");
    }

    /** An all-blank row of --cases would be answered P = 1 (issue 23): refused with its line, the file unchanged. */
    @Test
    void anAllBlankCaseRowIsRefused() throws Exception {
        Path f = dir.resolve("blank.csv");
        String text = "v1,v0\ns0,s1\n , \n";
        Files.writeString(f, text);
        Path out = dir.resolve("blank-out.csv");
        refused("predict: " + f + ": line 3 sets no variable (every field is blank); a case needs at least one"
                + " name=state, and an empty one has probability 1 by definition",
                "predict", "--store", store.toString(), "--order", ORDER, "--cases", f.toString(), "--out", out.toString());
        assertEquals(text, Files.readString(f));
        assertFalse(Files.exists(out), "nothing written");
    }

    /**
     * An exact structure-modular prediction is planned before it runs (issue 23): joint hidden states ×
     * 3^n terms above the budget is refused at once, with the figures and the sampled method; with
     * enough observed it answers.
     */
    @Test
    void anExactPredictionAboveTheBudgetIsRefusedBeforeWork() throws Exception {
        int[] arities = new int[13];
        java.util.Arrays.fill(arities, 2);
        var vars = HeldOutData.variables(arities);
        ScoreStore s = InMemoryTally.tally(vars, HeldOutData.table(23_010L, 60, arities), 1, FamilyScore.withDefaults());
        Path p = dir.resolve("thirteen");
        StoreWriter.write(p, s.manifest(), s.families(), s.logScores(), false);
        long t0 = System.nanoTime();
        refused("predict: an exact prediction over all DAGs would sum 9.8e+09 terms (6,144 hidden joint states × one sum"
                        + " of 3^13 = 1,594,323 terms each), more than the budget of 1e+09 terms; observe more of the hidden"
                        + " variables, or use --method mcmc, which answers it by sampling",
                "predict", "--store", p.toString(), "--method", "exact", "--case", "v0=s0", "--given", "v1=s0");
        double took = (System.nanoTime() - t0) / 1e9;
        assertTrue(took < 60, "refused in " + took + " s");
        CliRun ok = CliRun.of("predict", "--store", p.toString(), "--method", "exact", "--case", "v0=s0",
                "--given", "v1=s0,v2=s0,v3=s1,v4=s0,v5=s1,v6=s0,v7=s1,v8=s0,v9=s0");
        assertEquals(0, ok.status(), ok.err());
    }

    /** {@code edgewise} without a command is a mistake: exit 2 and the usage line, nothing on standard output. */
    @Test
    void noCommandExitsTwoWithTheUsage() {
        refused("edgewise: no command given; usage: edgewise [-hV] [COMMAND] (see edgewise --help)");
    }

    static void refused(String message, String... args) {
        CliRun r = CliRun.of(args);
        assertEquals(2, r.status(), "exit status for: " + String.join(" ", args) + "\n" + r.err());
        assertEquals(message, r.errLine());
        assertEquals("", r.out());
    }
}
