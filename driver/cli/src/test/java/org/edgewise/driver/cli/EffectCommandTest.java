package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.analysis.EffectAnalysis;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.effect.EffectEngine;
import org.edgewise.driver.result.EffectResult;
import org.junit.jupiter.api.Test;

/** {@code effect} end to end: the JSON names the checks read, a batch, and every refusal word for word (exit 2). */
class EffectCommandTest extends StoreFixture {

    @Override
    long seed() {
        return 64_646_464L;
    }

    CliRun effect(String... extra) {
        String[] base = {"effect", "--store", store.toString()};
        String[] all = new String[base.length + extra.length];
        System.arraycopy(base, 0, all, 0, base.length);
        System.arraycopy(extra, 0, all, base.length, extra.length);
        return CliRun.of(all);
    }

    @Test
    void jsonCarriesTheNamedFieldsAndMatchesTheLibrary() throws Exception {
        CliRun r = effect("--order", ORDER, "--do", "v0=s1", "--target", "v2=s0", "--versus", "v0=s0",
                "--format", "json", "--effect-draws", "200");
        assertEquals(0, r.status(), r.err());
        JsonNode j = JSON.readTree(r.out());
        for (String f : List.of("probability", "mcse", "noPathProbability", "noPathMcse", "versus", "difference", "ratio",
                "interval", "method", "estimate", "assumptions", "observational", "posterior")) {
            assertTrue(j.has(f), f);
        }
        assertEquals(0.95, j.get("interval").get("level").asDouble());
        assertTrue(j.get("interval").has("lower") && j.get("interval").has("upper"));
        assertEquals("exact", j.get("estimate").asText());
        assertEquals("order", j.get("method").asText());
        assertEquals("effect", j.get("kind").asText());
        EffectResult lib = EffectAnalysis.run(new EffectAnalysis.Request(LocalScores.build(mem, ScoringOptions.asStored()),
                new int[] {3, 0, 4, 1, 2}, null,
                List.of(new EffectAnalysis.Question("v0=s1", "v2=s0", null, "v0=s0", "")),
                new EffectEngine.Settings(200, 1L, 1_000_000L)), ProgressListener.NONE).get(0);
        assertEquals(lib.probability(), j.get("probability").asDouble(), 1e-15);
        assertEquals(lib.difference(), j.get("difference").asDouble(), 1e-15);
        assertEquals(lib.versus().probability(), j.get("versus").get("probability").asDouble(), 1e-15);
    }

    @Test
    void tableNamesTheAssumptions() {
        CliRun r = effect("--order", ORDER, "--do", "v0=s1", "--target", "v2=s0", "--effect-draws", "100");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("Assumptions: causal sufficiency"), r.out());
        assertTrue(r.out().contains("not proof of causation"), r.out());
    }

    @Test
    void batchOfQuestions() throws Exception {
        Path in = dir.resolve("q.csv");
        Files.writeString(in, "do,target,versus\n\"v0=s1\",v2=s0,v0=s0\nv4=s2,v1=s1,\n");
        Path out = dir.resolve("e.json");
        CliRun r = effect("--order", ORDER, "--questions", in.toString(), "--out", out.toString(), "--format", "json",
                "--effect-draws", "100");
        assertEquals(0, r.status(), r.err());
        List<EffectResult> rs = EffectResult.read(out);
        assertEquals(2, rs.size());
        assertEquals(null, rs.get(1).versus());
        CliRun bad = effect("--order", ORDER, "--questions", write("b.csv", "do,target\nv0=s9,v2=s0\n"));
        assertEquals(2, bad.status());
        assertEquals("effect: " + dir.resolve("b.csv") + ": line 2: --do: variable 'v0' has no state 's9' (valid states: s0, s1)",
                bad.errLine());
    }

    String write(String name, String text) throws Exception {
        Path p = dir.resolve(name);
        Files.writeString(p, text);
        return p.toString();
    }

    /** The default prior over unknown orders is structure-modular: sampled from exact DAG draws, with its MCSE. */
    @Test
    void structureModularByDefaultIsSampledWithMcse() throws Exception {
        CliRun r = effect("--method", "exact", "--do", "v0=s0", "--target", "v2=s1", "--format", "json");
        assertEquals(0, r.status(), r.err());
        com.fasterxml.jackson.databind.JsonNode j = new com.fasterxml.jackson.databind.ObjectMapper().readTree(r.out());
        assertEquals("structure-modular", j.get("dagPrior").asText());
        assertEquals("sampled", j.get("estimate").asText());
        assertTrue(j.get("mcse").asDouble() > 0 && j.get("mcse").asDouble() <= 0.002, r.out());
    }

    @Test
    void caseControlRefusalsWordForWord() {
        String[] q = {"--order", ORDER, "--do", "v0=s1", "--versus", "v0=s0", "--target", "v2=s0", "--effect-draws", "100"};
        String[][] cases = {
            {"effect: --measure risk-difference needs --prevalence under --design case-control: risks are not estimable from a "
                + "sample drawn on v2 (give --prevalence v2=p, or --measure odds-ratio)",
                "--design", "case-control", "--outcome", "v2", "--measure", "risk-difference"},
            {"effect: --prevalence: the prevalence must lie strictly between 0 and 1, got 1.5",
                "--design", "case-control", "--outcome", "v2", "--prevalence", "v2=s0:1.5"},
            {"effect: --outcome: unknown variable 'status' (variables: v0, v1, v2, v3, v4)",
                "--design", "case-control", "--outcome", "status"},
            {"effect: --design case-control needs --outcome y: the variable the cases and controls were sampled on",
                "--design", "case-control"},
            {"effect: --outcome names the variable a case-control sample was drawn on: give --design case-control", "--outcome", "v2"},
            {"effect: --measure must be risk-difference, risk-ratio or odds-ratio, got 'hazard'", "--measure", "hazard"},
        };
        for (String[] c : cases) {
            String[] args = java.util.Arrays.copyOfRange(c, 1, c.length);
            String[] all = new String[q.length + args.length];
            System.arraycopy(q, 0, all, 0, q.length);
            System.arraycopy(args, 0, all, q.length, args.length);
            CliRun r = effect(all);
            assertEquals(2, r.status(), String.join(" ", args) + ": " + r.err());
            assertEquals(c[0], r.errLine());
        }
        CliRun ok = effect(with(q, "--design", "case-control", "--outcome", "v2"));
        assertEquals(0, ok.status(), ok.err());
        assertTrue(ok.out().contains("case-control sample drawn on v2: only the odds ratio is reported for effects on v2"), ok.out());
        assertTrue(ok.out().contains("odds ratio "), ok.out());
        assertFalse(ok.out().lines().anyMatch(l -> l.startsWith("risk difference") || l.contains("also: risk")), ok.out());
        CliRun lead = effect(with(q, "--measure", "risk-ratio"));
        assertEquals(0, lead.status(), lead.err());
        assertTrue(lead.out().lines().anyMatch(l -> l.startsWith("risk ratio")), lead.out());
        assertTrue(lead.out().contains("raw frequencies from the counts"), lead.out());
        assertTrue(lead.out().contains("the model's conditional (conditioning, not setting)"), lead.out());
    }

    static String[] with(String[] a, String... b) {
        String[] all = new String[a.length + b.length];
        System.arraycopy(a, 0, all, 0, a.length);
        System.arraycopy(b, 0, all, a.length, b.length);
        return all;
    }

    @Test
    void refusalsWordForWord() {
        String[][] cases = {
            {"effect: --do is empty: name at least one variable to set, e.g. --do \"x=a\"", "--order", ORDER, "--do", "", "--target", "v2=s0"},
            {"effect: --do: unknown variable 'v9' (variables: v0, v1, v2, v3, v4)", "--order", ORDER, "--do", "v9=s0", "--target", "v2=s0"},
            {"effect: --target: variable 'v2' has no state 'up' (valid states: s0, s1)", "--order", ORDER, "--do", "v0=s0", "--target", "v2=up"},
            {"effect: --do and --target both name variable 'v2': a variable that is set cannot be the outcome", "--order", ORDER, "--do", "v2=s0", "--target", "v2=s1"},
            {"effect: --do sets every variable (5 of 5): nothing is left to be an outcome", "--order", ORDER, "--do", "v0=s0,v1=s0,v2=s0,v3=s0,v4=s0", "--target", "v2=s1"},
            {"effect: --versus must set the same variables as --do (v0), got v1", "--order", ORDER, "--do", "v0=s0", "--target", "v2=s1", "--versus", "v1=s0"},
        };
        for (String[] c : cases) {
            String[] args = java.util.Arrays.copyOfRange(c, 1, c.length);
            CliRun r = effect(args);
            assertEquals(2, r.status(), String.join(" ", args));
            assertEquals(c[0], r.errLine());
            assertFalse(r.errLine().contains("\n"));
        }
    }

    @Test
    void anExistingOutIsReplacedOnlyWithOverwrite() throws Exception {
        Path e = dir.resolve("kept.json");
        Files.writeString(e, "someone's notes\n");
        CliRun r = effect("--order", ORDER, "--do", "v0=s1", "--target", "v2=s0", "--out", e.toString(), "--effect-draws", "100");
        assertEquals(2, r.status());
        assertEquals("effect: --out " + e + " already exists; pass --overwrite to replace it", r.errLine());
        assertEquals("someone's notes\n", Files.readString(e), "nothing replaced");
        assertEquals(0, effect("--order", ORDER, "--do", "v0=s1", "--target", "v2=s0", "--out", e.toString(), "--effect-draws",
                "100", "--overwrite").status());
        assertTrue(Files.readString(e).contains("\"probability\""));
    }

    @Test
    void reportGainsAnInterventionsSection() throws Exception {
        Path e = dir.resolve("effect.json");
        assertEquals(0, effect("--order", ORDER, "--do", "v0=s1", "--target", "v2=s0", "--versus", "v0=s0",
                "--out", e.toString(), "--effect-draws", "100").status());
        EffectResult er = EffectResult.read(e).get(0);
        Path edges = dir.resolve("edges.json");
        assertEquals(0, CliRun.of("edges", "--store", store.toString(), "--order", ORDER, "--out", edges.toString()).status());
        Path html = dir.resolve("r.html");
        CliRun r = CliRun.of("report", "--result", edges.toString(), "--effect", e.toString(), "--out", html.toString());
        assertEquals(0, r.status(), r.err());
        String text = Files.readString(html);
        assertTrue(text.contains("Edge posterior heatmap") && text.contains("Interventions: what setting a variable would do"));
        assertTrue(text.contains(String.format(java.util.Locale.ROOT, "%.4f", er.probability())));
        assertTrue(text.contains(String.format(java.util.Locale.ROOT, "%.4f", er.observational().probability())));
        assertTrue(text.contains("no hidden confounders"));
        // every SVG of the section is well-formed XML with one bar per histogram bin
        int at = text.indexOf("<svg", text.indexOf("id=\"interventions\""));
        String svg = text.substring(at, text.indexOf("</svg>", at) + 6);
        var doc = javax.xml.parsers.DocumentBuilderFactory.newInstance().newDocumentBuilder()
                .parse(new java.io.ByteArrayInputStream(svg.getBytes(java.nio.charset.StandardCharsets.UTF_8)));
        assertEquals(er.posterior().counts().length, doc.getElementsByTagName("rect").getLength());
        CliRun none = CliRun.of("report", "--out", html.toString());
        assertEquals(2, none.status());
        assertEquals("report: give --result FILE (an edges result), --effect FILE (an effect result), or both", none.errLine());
    }
}
