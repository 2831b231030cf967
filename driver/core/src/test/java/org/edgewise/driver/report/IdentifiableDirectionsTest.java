package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.result.EdgeResult;
import org.junit.jupiter.api.Test;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.NodeList;

/**
 * The consensus graph draws only what the result supports (issue 10, item 5): an arrow for a
 * compelled direction above the threshold, an undirected line for an adjacent pair whose direction
 * is reversible or was not assessed, arrows from the order for a given-order result — in the SVG
 * (parsed by the JDK's XML parser) and in DOT ({@code dir=none}). Fixtures are hand-written
 * results; the expected shapes follow from those rules, not from the code.
 */
class IdentifiableDirectionsTest {
    /** The consensus graph's {@code <path>} elements as "class:title". */
    static List<String> paths(String html) throws Exception {
        String svg = HtmlReportTest.svgs(html).get(0);
        Document d = HtmlReportTest.parseXml(svg);
        assertEquals("graph", d.getDocumentElement().getAttribute("class"));
        List<String> out = new ArrayList<>();
        NodeList ps = d.getElementsByTagName("path");
        for (int i = 0; i < ps.getLength(); i++) {
            Element p = (Element) ps.item(i);
            if (p.getParentNode().getNodeName().equals("marker")) {
                continue;
            }
            String cls = p.getAttribute("class");
            // an arrowhead exactly on arrows (and on the known edges the figure does not support)
            assertEquals(!cls.equals("line"), !p.getAttribute("marker-end").isEmpty(), cls);
            out.add(cls + ":" + p.getElementsByTagName("title").item(0).getTextContent());
        }
        return out;
    }

    static long count(List<String> paths, String prefix) {
        return paths.stream().filter(s -> s.startsWith(prefix)).count();
    }

    /**
     * The demo's chain (DESIGN.md): P(ambient_heat → season) = 0.934 as a DAG edge, but the pair is
     * reversible in 99% of the essential graphs — drawn as a line; the v-structure's compelled edges
     * as arrows; compressor_age – compressor_wear (0.03) not at all.
     */
    @Test
    void compelledAsArrowsReversibleAsLines() throws Exception {
        EdgeResult r = ReportFixtures.demoChain("structure-modular");
        String html = HtmlReport.render(r, "demo.json", null, null, 0.5);
        List<String> p = paths(html);
        assertEquals(4, p.size(), p.toString());
        assertEquals(2, count(p, "arrow:"), p.toString());
        assertEquals(2, count(p, "line:"), p.toString());
        assertTrue(p.contains("line:season \u2013 ambient_heat: P(adjacent) 0.994; compelled season \u2192 ambient_heat 0.000; "
                + "compelled ambient_heat \u2192 season 0.004; reversible 0.990 (MCSE \u2264 0.0030)"), p.toString());
        assertTrue(p.contains("arrow:compressor_wear \u2013 sensor_fault: P(adjacent) 0.950; compelled compressor_wear \u2192 "
                + "sensor_fault 0.930; compelled sensor_fault \u2192 compressor_wear 0.000; reversible 0.020 (MCSE \u2264 0.0050)"),
                p.toString());
        assertTrue(html.contains("<b>DAG prior: structure-modular.</b>"));
        assertTrue(html.contains("<th>DAG prior</th><td>structure-modular</td>"));
        assertTrue(html.contains("<th>consensus graph (threshold 0.50)</th><td>2 arrows, 2 lines</td>"), html);
        assertTrue(html.contains("draws an <b>arrow only for a compelled direction</b>"));
        // the pair table: adjacent, compelled both ways, reversible, MCSE
        assertTrue(html.contains("<tr><td>season</td><td>ambient_heat</td><td class=\"num\">0.994</td><td class=\"num\">0.000</td>"
                + "<td class=\"num\">0.004</td><td class=\"num\">0.990</td><td class=\"num\">0.0030</td></tr>"), html);
        assertFalse(html.contains("not assessed</td>"));

        String dot = DotWriter.write(r, 0.5, null);
        assertTrue(dot.contains("\"compressor_wear\" -> \"sensor_fault\" [label=\"0.93\", penwidth=5.65, tooltip="), dot);
        assertTrue(dot.contains("\"ambient_heat\" -> \"season\" [label=\"0.99\", penwidth=5.97, dir=none,"), dot);
        assertEquals(2, dot.split(", dir=none").length - 1, dot);
        assertEquals(4, dot.split(" -> ").length - 1, dot);
        assertTrue(dot.contains("// DAG prior: structure-modular."), dot);
    }

    /** A compelled posterior at or below the threshold does not make an arrow; the adjacency still draws a line. */
    @Test
    void thresholdAppliesToTheCompelledPosterior() throws Exception {
        EdgeResult r = ReportFixtures.demoChain("structure-modular");
        List<String> p = paths(HtmlReport.render(r, "demo.json", null, null, 0.93));
        // compressor_wear → sensor_fault compelled 0.930 is not above 0.93: a line (adjacent 0.950 is);
        // compressor_age → sensor_fault (0.920) likewise; the two chain pairs stay lines
        assertEquals(0, count(p, "arrow:"), p.toString());
        assertEquals(4, count(p, "line:"), p.toString());
        assertEquals(0, paths(HtmlReport.render(r, "demo.json", null, null, 0.995)).size());
    }

    /** Without essential-graph posteriors: lines for P(a→b) + P(b→a), directions "not assessed" with the option named. */
    @Test
    void withoutEssentialGraphDirectionsAreNotAssessed() throws Exception {
        EdgeResult r = ReportFixtures.with(ReportFixtures.demoChain("order-modular"), "order-modular", null);
        AssessHint cli = new AssessHint("edges", "--features essential-graph"); // as the CLI names them
        String html = HtmlReport.render(r, "demo.json", null, null, 0.5, cli);
        List<String> p = paths(html);
        // adjacency: season–ambient_heat 0.994, ambient_heat–compressor_wear 0.990, wear–fault 0.95, age–fault 0.94
        assertEquals(4, count(p, "line:"), p.toString());
        assertEquals(0, count(p, "arrow:"), p.toString());
        assertTrue(p.contains("line:season \u2013 ambient_heat: P(adjacent) 0.994 (P(season \u2192 ambient_heat) 0.060 + "
                + "P(ambient_heat \u2192 season) 0.934); direction not assessed"), p.toString());
        assertTrue(html.contains("<td colspan=\"3\" class=\"na\">not assessed</td>"));
        assertTrue(html.contains("run <code>edges</code> with <code>--features essential-graph</code>"));
        assertTrue(html.contains("<b>DAG prior: order-modular.</b>"));
        // MCSE of a sum of two edges is bounded by the sum of their MCSEs (0.004 + 0.004)
        assertTrue(html.contains("<td class=\"num\">\u2264 0.0080</td>"), html);
        String dot = DotWriter.write(r, 0.5, null, cli);
        assertEquals(4, dot.split(", dir=none").length - 1, dot);
        assertTrue(dot.contains("directions not assessed (run edges with --features essential-graph)"), dot);
    }

    /** Given an order: arrows, directed by the order; both DAG priors coincide. */
    @Test
    void givenOrderDrawsArrowsFromTheOrder() throws Exception {
        EdgeResult r = ReportFixtures.fleetGivenOrder(1500);
        String html = HtmlReport.render(r, "r.json", null, null, 0.5);
        List<String> p = paths(html);
        assertTrue(count(p, "arrow:") > 0);
        assertEquals(0, count(p, "line:"));
        assertTrue(p.stream().allMatch(s -> s.endsWith("(direction from the given order)")), p.toString());
        assertTrue(html.contains("given an order, the structure-modular and order-modular DAG priors coincide"));
        assertFalse(DotWriter.write(r, 0.5, null).contains("dir=none"));
    }

    /** With a known network: a line is marked right when the truth joins the pair either way, an arrow marked reversed when it is. */
    @Test
    void truthColoursLinesBySkeleton() throws Exception {
        EdgeResult r = ReportFixtures.demoChain("structure-modular");
        boolean[][] t = new boolean[5][5];
        t[0][1] = true; // season → ambient_heat: the line is right
        t[4][2] = true; // sensor_fault → compressor_wear: the compelled arrow is reversed
        String dot = DotWriter.write(r, 0.5, t);
        // told by a glyph after the posterior and a line style, not by colour (readable in greyscale)
        String heat = line(dot, "\"ambient_heat\" -> \"season\"");
        assertTrue(heat.contains("[label=\"0.99 \u2713\"") && heat.endsWith(", style=solid];"), dot);
        String wear = line(dot, "\"compressor_wear\" -> \"sensor_fault\"");
        assertTrue(wear.contains("[label=\"0.93 \u21c4\"") && wear.endsWith(", style=solid];"), dot);
        String age = line(dot, "\"compressor_age\" -> \"sensor_fault\"");
        assertTrue(age.contains("[label=\"0.92 \u2717\"") && age.endsWith(", style=dotted];"), dot);
        assertFalse(dot.contains("color="), dot);
        // the HTML draws the known edge of an undrawn pair? none here: both known pairs are drawn
        List<String> p = paths(HtmlReport.render(r, "demo.json", null, null, 0.5));
        assertEquals(4, p.size());
    }

    /**
     * Tiers carried into the report (issue 21): with season in a tier before the rest, the pair
     * season – ambient_heat, reversible as far as the data tell (a line without tiers), can only run
     * season → ambient_heat: an arrow labelled as fixed by the tiers, counted in the summary, and the
     * tiers named in the summary and the provenance. Pairs inside one tier stay as the data leave them.
     */
    @Test
    void directionsFixedByTheTiersAreArrowsSaidToBe() throws Exception {
        EdgeResult base = ReportFixtures.demoChain("structure-modular");
        List<List<String>> tiers = List.of(List.of("season"),
                List.of("ambient_heat", "compressor_wear", "compressor_age", "sensor_fault"));
        EdgeResult.Settings s = base.settings();
        EdgeResult r = new EdgeResult(base.method(), base.variables(), base.logEvidence(), base.logEvidenceNormalized(),
                base.evidenceConvention(), base.order(), new EdgeResult.Settings(s.score(), s.ess(), s.prior(), s.maxParents(),
                s.forbid(), s.require(), tiers), base.store(), base.edges(), base.parentSets(), base.bestNetwork(), base.diagnostics(),
                base.features(), base.sensitivity(), base.dagPrior(), base.essentialGraph());
        String html = HtmlReport.render(r, "demo.json", null, null, 0.5);
        List<String> p = paths(html);
        assertEquals(3, count(p, "arrow:"), p.toString());
        assertEquals(1, count(p, "line:"), p.toString());
        assertTrue(p.stream().anyMatch(x -> x.startsWith("arrow:season \u2013 ambient_heat:") && x.endsWith("(direction fixed by the tiers)")),
                p.toString());
        assertTrue(html.contains(">0.99 fixed by the tiers</text>"), html);
        assertTrue(html.contains("<th>consensus graph (threshold 0.50)</th><td>3 arrows (1 fixed by the tiers), 1 line</td>"), html);
        assertTrue(html.contains("<p><b>Tiers you gave</b> (no arrow may point to an earlier tier): season \u2192 ambient_heat, "
                + "compressor_wear, compressor_age, sensor_fault</p>"), html);
        assertTrue(html.contains("<th>tiers</th><td>season ; ambient_heat, compressor_wear, compressor_age, sensor_fault</td>"), html);
        assertTrue(html.contains("<li><b>fixed by the tiers you gave</b>: season \u2192 ambient_heat</li>"), html);
        assertTrue(html.contains("One row per tier, the first tier at the top."), html);
        String dot = DotWriter.write(r, 0.5, null);
        assertTrue(dot.contains("\"season\" -> \"ambient_heat\" [label=\"0.99 fixed by the tiers\", penwidth=5.97, tooltip="), dot);
    }

    static String line(String dot, String start) {
        return dot.lines().filter(l -> l.startsWith("  " + start + " [")).findFirst().orElseThrow(() -> new AssertionError(start + " in " + dot));
    }

    @Test
    void essentialGraphNamesAreEscaped() throws Exception {
        String evil = HtmlReportTest.EVIL;
        EdgeResult t = ReportFixtures.tiny(List.of(evil, "b & 'c'", "\"q\""));
        EdgeResult r = ReportFixtures.with(t, "structure-modular", List.of(
                new EdgeResult.EssentialPair(evil, "b & 'c'", 0.95, 0.9, 0.0, 0.05, 0.004),
                new EdgeResult.EssentialPair("b & 'c'", "\"q\"", 0.9, 0.0, 0.0, 0.9, 0.004)));
        String html = HtmlReport.render(r, "r.json", null, null, 0.5);
        assertFalse(html.contains(evil));
        assertFalse(html.contains("<script"));
        List<String> p = paths(html);
        assertEquals(1, count(p, "arrow:" + evil + " \u2013 b & 'c'"), p.toString());
        assertEquals(1, count(p, "line:b & 'c' \u2013 \"q\""), p.toString());
        String dot = DotWriter.write(r, 0.5, null);
        assertTrue(dot.contains("\"b & 'c'\" -> \"\\\"q\\\"\" [label=\"0.90\", penwidth=5.50, dir=none, tooltip=\"b & 'c' \u2013 "
                + "\\\"q\\\": P(adjacent) 0.900;"), dot);
    }

    @Test
    void malformedEssentialGraphIsTheFilesMistake() {
        EdgeResult t = ReportFixtures.tiny(List.of("a", "b", "c"));
        UserError e = assertThrows(UserError.class, () -> HtmlReport.render(ReportFixtures.with(t, "structure-modular",
                List.of(new EdgeResult.EssentialPair("a", "z", 0.5, 0.5, 0, 0, null))), "r.json", null, null, 0.5));
        assertEquals("result has an essentialGraph entry a - z that is not a pair of two listed variables", e.getMessage());
        e = assertThrows(UserError.class, () -> DotWriter.write(ReportFixtures.with(t, "structure-modular",
                List.of(new EdgeResult.EssentialPair("a", "b", 1.5, 0.5, 0, 1, null))), 0.5, null));
        assertEquals("result has essentialGraph entry a - b with 1.5, not a probability", e.getMessage());
    }

    @Test
    void unrecordedDagPriorIsSaid() {
        EdgeResult r = ReportFixtures.tiny(List.of("a", "b", "c"));
        String html = HtmlReport.render(r, "r.json", null, null, 0.5);
        assertTrue(html.contains("<b>DAG prior: not recorded</b> in this result."));
        assertTrue(html.contains("<th>DAG prior</th><td>not recorded</td>"));
    }
}
