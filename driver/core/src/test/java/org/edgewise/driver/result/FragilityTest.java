package org.edgewise.driver.result;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Headline posteriors that cross 0.5 within the ESS sweep: which are flagged, in words, and in the JSON. */
public class FragilityTest {
    /**
     * A hand-made exact result at ESS 1 with a sweep at ESS 0.1 and 10: a → b (0.9) falls to 0.3 at
     * ESS 10 (fragile); b → c (0.6) stays above 0.5 (0.55, 0.65: not fragile); c → b (0.3) rises to 0.7
     * (no headline: not fragile); the compelled a → c (0.8) falls to 0.4 at ESS 0.1 (fragile), the
     * compelled b → c (0.55) stays above (0.6, 0.7: not fragile).
     */
    public static EdgeResult swept() {
        List<EdgeResult.Edge> at1 = edges(0.9, 0.05, 0.6, 0.3, 0.1, 0.2);
        List<EdgeResult.Edge> at01 = edges(0.95, 0.02, 0.55, 0.3, 0.1, 0.2);
        List<EdgeResult.Edge> at10 = edges(0.3, 0.5, 0.65, 0.7, 0.1, 0.2);
        List<EdgeResult.EssentialPair> eg1 = essential(0.8, 0.55);
        List<EdgeResult.EssentialPair> eg01 = essential(0.4, 0.6);
        List<EdgeResult.EssentialPair> eg10 = essential(0.85, 0.7);
        EdgeResult r = new EdgeResult("exact", List.of("a", "b", "c"), -1234.5, null, "structure-modular", null,
                new EdgeResult.Settings("bdeu", 1.0, "uniform", 2, List.of(), List.of(), null), null, at1, null, null, null, null,
                List.of(new EdgeResult.Sensitivity(0.1, -1240.0, at01, eg01), new EdgeResult.Sensitivity(10, -1250.0, at10, eg10)),
                "structure-modular", eg1);
        return r.withFragile(Fragility.of(r));
    }

    private static List<EdgeResult.Edge> edges(double ab, double ba, double bc, double cb, double ac, double ca) {
        return List.of(new EdgeResult.Edge("a", "b", ab), new EdgeResult.Edge("b", "a", ba),
                new EdgeResult.Edge("b", "c", bc), new EdgeResult.Edge("c", "b", cb),
                new EdgeResult.Edge("a", "c", ac), new EdgeResult.Edge("c", "a", ca));
    }

    private static List<EdgeResult.EssentialPair> essential(double acCompelled, double bcCompelled) {
        return List.of(new EdgeResult.EssentialPair("a", "b", 0.95, 0.0, 0.0, 0.95, null),
                new EdgeResult.EssentialPair("a", "c", 0.9, acCompelled, 0.0, 0.9 - acCompelled, null),
                new EdgeResult.EssentialPair("b", "c", 0.9, bcCompelled, 0.0, 0.9 - bcCompelled, null));
    }

    @Test
    void oneEdgeThatCrossesIsFlaggedOneThatStaysAboveIsNot() {
        List<EdgeResult.Fragile> f = swept().fragile();
        assertEquals(List.of(new EdgeResult.Fragile("edge", "a", "b", 0.9, 1.0, 0.3, 10, 0.95, 0.1),
                new EdgeResult.Fragile("compelled", "a", "c", 0.8, 1.0, 0.4, 0.1, 0.85, 10)), f);
        assertEquals("a -> b 0.90 (0.95 at ESS 0.1, 0.30 at ESS 10)", Fragility.words(f.get(0), "->"));
        assertEquals("a \u2192 c compelled 0.80 (0.85 at ESS 10, 0.40 at ESS 0.1)", Fragility.words(f.get(1), "\u2192"));
    }

    @Test
    void noSweepNoList() {
        EdgeResult r = swept();
        EdgeResult single = new EdgeResult(r.method(), r.variables(), r.logEvidence(), null, r.evidenceConvention(), null,
                r.settings(), null, r.edges(), null, null, null, null, null, r.dagPrior(), r.essentialGraph());
        assertNull(Fragility.of(single));
        // A sweep in which nothing crosses: an empty list, not null.
        EdgeResult calm = new EdgeResult(r.method(), r.variables(), r.logEvidence(), null, r.evidenceConvention(), null,
                r.settings(), null, r.edges(), null, null, null, null,
                List.of(new EdgeResult.Sensitivity(2, null, r.edges(), r.essentialGraph())), r.dagPrior(), r.essentialGraph());
        assertEquals(List.of(), Fragility.of(calm));
    }

    @Test
    void writtenAndReadBackAndOldReadersIgnoreIt(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("r.json");
        ResultJson.write(f, swept());
        String text = Files.readString(f);
        assertEquals(swept(), ResultJson.readEdges(f));
        JsonNode j = ResultJson.MAPPER.readTree(text);
        assertEquals(2, j.get("formatVersion").asInt(), "an added field that readers may ignore: no version change");
        JsonNode first = j.get("fragile").get(0);
        assertEquals("{\"kind\":\"edge\",\"from\":\"a\",\"to\":\"b\",\"posterior\":0.9,\"ess\":1.0,\"min\":0.3,\"minEss\":10.0,"
                + "\"max\":0.95,\"maxEss\":0.1}", first.toString());
        assertTrue(j.get("sensitivity").get(0).has("essentialGraph"));
        // A result written before: no fragile list, sweep entries without an essential graph; it reads, and
        // the list can be computed from the sweep (edges only).
        com.fasterxml.jackson.databind.node.ObjectNode old = (com.fasterxml.jackson.databind.node.ObjectNode) j;
        old.remove("fragile");
        for (JsonNode s : old.get("sensitivity")) {
            ((com.fasterxml.jackson.databind.node.ObjectNode) s).remove("essentialGraph");
        }
        Files.writeString(f, old.toString());
        EdgeResult back = ResultJson.readEdges(f);
        assertNull(back.fragile());
        assertNull(back.sensitivity().get(0).essentialGraph());
        List<EdgeResult.Fragile> again = Fragility.of(back);
        assertEquals(1, again.size());
        assertEquals("edge", again.get(0).kind());
        assertFalse(text.contains("NaN"));
    }
}
