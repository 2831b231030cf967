package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.StringReader;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.xml.parsers.DocumentBuilderFactory;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.NetworkReader;
import org.edgewise.driver.result.EdgeResult;
import org.junit.jupiter.api.Test;
import org.w3c.dom.Document;
import org.xml.sax.InputSource;

/** The HTML report: well-formed SVG (JDK XML parser), escaped names, the sections a reader needs. */
class HtmlReportTest {
    static final String EVIL = "<script>alert(1)</script>";
    static final String EVIL_ESCAPED = "&lt;script&gt;alert(1)&lt;/script&gt;";

    static List<String> svgs(String html) {
        List<String> out = new ArrayList<>();
        Matcher m = Pattern.compile("<svg[\\s>].*?</svg>", Pattern.DOTALL).matcher(html);
        while (m.find()) {
            out.add(m.group());
        }
        return out;
    }

    /** Parses with the JDK's XML parser (namespace-aware), failing on any well-formedness error. */
    static Document parseXml(String xml) throws Exception {
        DocumentBuilderFactory f = DocumentBuilderFactory.newInstance();
        f.setNamespaceAware(true);
        f.setFeature("http://apache.org/xml/features/disallow-doctype-decl", true);
        var b = f.newDocumentBuilder();
        b.setErrorHandler(null);
        return b.parse(new InputSource(new StringReader(xml)));
    }

    static Network evilTruth() {
        String evil = EVIL.replace("\"", "\\\"");
        return NetworkReader.parse("evil", "{\"edgewiseNetwork\":1,\"variables\":["
                + "{\"name\":\"" + evil + "\",\"states\":[\"0\",\"1\"],\"cpt\":[[0.5,0.5]]},"
                + "{\"name\":\"b & 'c'\",\"states\":[\"0\",\"1\"],\"parents\":[\"" + evil + "\"],\"cpt\":[[0.9,0.1],[0.1,0.9]]},"
                + "{\"name\":\"\\\"q\\\"\",\"states\":[\"0\",\"1\"],\"parents\":[\"b & 'c'\"],\"cpt\":[[0.9,0.1],[0.1,0.9]]}]}");
    }

    @Test
    void svgPartsAreWellFormedXml() throws Exception {
        EdgeResult r = ReportFixtures.asMcmc(ReportFixtures.fleetGivenOrder(1500), 1.002);
        String html = HtmlReport.render(r, "r.json", ReportFixtures.fleet(), "fleet-network.json", 0.5);
        List<String> all = svgs(html);
        for (String svg : all) {
            parseXml(svg);
        }
        // the key to the comparison with the known network draws one sample line per mark
        List<String> svgs = all.stream().filter(x -> !x.contains("aria-hidden")).toList();
        assertEquals(4, all.size() - svgs.size(), "four line samples in the known network's key");
        assertEquals(3, svgs.size(), "graph, heatmap and trace plot");
        for (String svg : svgs) {
            Document d = parseXml(svg);
            assertEquals("http://www.w3.org/2000/svg", d.getDocumentElement().getNamespaceURI());
        }
        // the heatmap has one cell per ordered pair plus the diagonal (13² rects with a fill colour
        // other than none, plus the legend)
        Document heat = parseXml(svgs.get(1));
        assertEquals("heatmap", heat.getDocumentElement().getAttribute("class"));
        assertTrue(heat.getElementsByTagName("rect").getLength() >= 13 * 13 + 1);
    }

    /** Forty variables with random posteriors (a dense, messy consensus graph) still give well-formed SVG. */
    @Test
    void manyVariablesStayWellFormed() throws Exception {
        int n = 40;
        List<String> names = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            names.add("variable_" + i);
        }
        java.util.SplittableRandom rng = new java.util.SplittableRandom(1);
        List<EdgeResult.Edge> edges = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a != b) {
                    edges.add(new EdgeResult.Edge(names.get(a), names.get(b), Math.pow(rng.nextDouble(), 6)));
                }
            }
        }
        EdgeResult r = new EdgeResult("mcmc", names, null, null, null, null, null, null, edges, null, null, null, null, null, null, null);
        String html = HtmlReport.render(r, "big.json", null, null, 0.3);
        List<String> svgs = svgs(html);
        assertEquals(2, svgs.size());
        for (String svg : svgs) {
            parseXml(svg);
        }
        assertTrue(html.contains("(the strongest " + StrongestEdges.MAX_ROWS + " of "), "the strongest-edges table is capped");
        assertTrue(html.contains("<a download=\"edges.csv\" href=\"data:text/csv;charset=utf-8,from%2Cto%2Cposterior%0D%0A"),
                "the rest of the table is a CSV inside the report");
        assertEquals("-0.1 0.0 12.3 -12.3", Html.c(-0.06) + " " + Html.c(0.04) + " " + Html.c(12.34) + " " + Html.c(-12.34));
    }

    @Test
    void namesFromTheDataAreEscaped() throws Exception {
        EdgeResult r = ReportFixtures.tiny(List.of(EVIL, "b & 'c'", "\"q\""));
        String html = HtmlReport.render(r, "r.json", evilTruth(), EVIL + ".json", 0.5);
        assertFalse(html.contains(EVIL), "the raw script tag must not appear");
        assertTrue(html.contains(EVIL_ESCAPED));
        assertTrue(html.contains("b &amp; &#39;c&#39;"));
        assertFalse(html.contains("<script"), "no script element at all");
        for (String svg : svgs(html)) {
            parseXml(svg);
        }
        String dot = DotWriter.write(r, 0.5, null);
        assertTrue(dot.contains("\"<script>alert(1)</script>\" -> \"b & 'c'\" [label=\"0.95\", penwidth=5.75, dir=none"), dot);
        assertTrue(dot.contains("\"\\\"q\\\"\""), "DOT quotes are backslash-escaped: " + dot);
    }

    @Test
    void showsCautionsProvenanceAndRecovery() {
        EdgeResult r = ReportFixtures.tiny(List.of("a", "b", "c"));
        Network truth = NetworkReader.parse("t", "{\"edgewiseNetwork\":1,\"variables\":["
                + "{\"name\":\"a\",\"states\":[\"0\",\"1\"],\"cpt\":[[0.5,0.5]]},"
                + "{\"name\":\"b\",\"states\":[\"0\",\"1\"],\"parents\":[\"a\"],\"cpt\":[[0.9,0.1],[0.1,0.9]]},"
                + "{\"name\":\"c\",\"states\":[\"0\",\"1\"],\"parents\":[\"b\"],\"cpt\":[[0.9,0.1],[0.1,0.9]]}]}");
        String html = HtmlReport.render(r, "r.json", truth, "t.json", 0.5);
        assertTrue(html.contains("not proof of causation"));
        assertTrue(html.contains("Direction is often not identifiable"));
        assertTrue(html.contains("domain experts"));
        assertTrue(html.contains("no hidden confounders"));
        assertTrue(html.contains("<th>data fingerprint</th><td>f00d</td>"));
        assertTrue(html.contains("<th>rows</th><td>100</td>"));
        // consensus {a→b 0.9, b→c 0.6} equals the truth: SHD 0; directed AUROC: positives 0.9, 0.6 vs
        // negatives 0.05, 0.3, 0.1, 0.2 — all 8 pairs ordered: 1.000
        assertTrue(html.contains("<th>structural Hamming distance</th><td>0 = 0 missing + 0 extra + 0 reversed</td>"), html);
        assertTrue(html.contains("directed AUROC 1.000"));
        assertFalse(html.contains("Chain traces"), "no MCMC section for an exact result");
        assertFalse(html.contains("http://") && !html.contains("http://www.w3.org/2000/svg"), "no external references");
        assertFalse(html.contains("https://"));
    }

    @Test
    void mcmcWarningAndSensitivity() {
        EdgeResult order = ReportFixtures.fleetGivenOrder(1500);
        String bad = HtmlReport.render(ReportFixtures.asMcmc(order, 1.2), "r.json", null, null, 0.5);
        assertTrue(bad.contains("<b>Not converged: do not use these posteriors yet.</b>"), bad);
        assertTrue(bad.contains("<tr><th>reached</th><td>largest R-hat 1.2000, smallest bulk effective sample size 413, "
                + "largest MCSE -</td></tr>"), bad);
        String good = HtmlReport.render(ReportFixtures.asMcmc(order, 1.004), "r.json", null, null, 0.5);
        assertFalse(good.contains("Not converged"));
        assertTrue(good.contains("<b>Converged.</b>"));

        // sensitivity: a hand-made entry moves a -> b from 0.9 to 0.3 (listed) and b -> c from 0.6 to 0.65 (not)
        EdgeResult t = ReportFixtures.tiny(List.of("a", "b", "c"));
        List<EdgeResult.Edge> moved = List.of(new EdgeResult.Edge("a", "b", 0.3), new EdgeResult.Edge("b", "a", 0.05),
                new EdgeResult.Edge("b", "c", 0.65), new EdgeResult.Edge("c", "b", 0.3),
                new EdgeResult.Edge("a", "c", 0.1), new EdgeResult.Edge("c", "a", 0.2));
        EdgeResult withSens = new EdgeResult(t.method(), t.variables(), t.logEvidence(), null, null, null, t.settings(),
                t.store(), t.edges(), null, null, null, null, List.of(new EdgeResult.Sensitivity(10, -1300.0, moved)), t.dagPrior(), t.essentialGraph());
        String html = HtmlReport.render(withSens, "r.json", null, null, 0.5);
        assertTrue(html.contains("<th>ESS 1</th><th>ESS 10</th>"), "main ESS joins the sensitivity columns");
        assertTrue(html.contains("<tr><td>a \u2192 b</td>"));
        assertFalse(html.contains("<tr><td>b \u2192 c</td>"));
    }

    @Test
    void fragileHeadlinePosteriorsInTheCautionsAndTheSummary() {
        String html = HtmlReport.render(org.edgewise.driver.result.FragilityTest.swept(), "r.json", null, null, 0.5);
        assertTrue(html.contains("<li><b>Fragile under the ESS sweep:</b> a \u2192 b 0.90 (0.95 at ESS 0.1, 0.30 at ESS 10); "
                + "a \u2192 c compelled 0.80 (0.85 at ESS 10, 0.40 at ESS 0.1). These posteriors are above 0.5 in the result but "
                + "below 0.5 at another equivalent sample size: the choice of ESS, not the data, decides whether they would be "
                + "drawn. Treat them as unsettled.</li>"), html);
        assertTrue(html.contains("<tr><th>fragile under the ESS sweep</th><td><b>a \u2192 b 0.90 (0.95 at ESS 0.1, 0.30 at ESS 10)"
                + "<br>a \u2192 c compelled 0.80 (0.85 at ESS 10, 0.40 at ESS 0.1)</b> (above 0.5 here, below 0.5 at another ESS)"
                + "</td></tr>"), html);
        assertFalse(html.contains("b \u2192 c 0.60"), "b -> c stays above 0.5 across the sweep");
        assertTrue(html.contains("not proof of causation"));
        // without a sweep: no row, no bullet
        String plain = HtmlReport.render(ReportFixtures.tiny(List.of("a", "b", "c")), "r.json", null, null, 0.5);
        assertFalse(plain.contains("fragile under the ESS sweep") || plain.contains("Fragile under the ESS sweep"));
    }
}
