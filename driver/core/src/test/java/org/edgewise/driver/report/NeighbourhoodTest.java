package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.analysis.EdgeAnalysis;
import org.edgewise.driver.analysis.EffectAnalysis;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.effect.EffectEngine;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;

/**
 * The neighbourhood view of a wide report (issue 21, point 5): with an effect asked on a result of
 * more than {@value Neighbourhood#FROM_VARIABLES} variables, the report first draws the variables
 * asked about and every variable the consensus graph joins to one of them, and folds the whole graph
 * below. The expected neighbourhood is read off the result's own edge posteriors (given an order,
 * the consensus graph draws a → b when P(a → b) &gt; 0.5); the boxes drawn are counted in the SVG.
 */
class NeighbourhoodTest {
    @Test
    void theVariablesAskedAboutAndTheirNeighboursComeFirstTheWholeGraphFolded() {
        Network net = RandomNetwork.generate("v", 24, 2, 2, 4, 3.0, 0.02, 24L);
        ScoreStore store = ReportFixtures.tally(net, 1500, 24);
        ScoringOptions so = ScoringOptions.asStored();
        int[] order = java.util.stream.IntStream.range(0, 24).toArray();
        EdgeResult r = EdgeAnalysis.run(store, Path.of("store"), List.of(so), order, null, 2, ProgressListener.NONE, x -> { });
        // an edge of the network: its child's first parent
        int b = 12;
        while (net.parentNames().get(net.names().get(b)).isEmpty()) {
            b++;
        }
        String y = net.names().get(b);
        String x = net.parentNames().get(y).get(0);
        List<EffectResult> effects = EffectAnalysis.run(new EffectAnalysis.Request(LocalScores.build(store, so), order, null,
                List.of(new EffectAnalysis.Question(x + "=s1", y + "=s1", null, x + "=s0", "")),
                new EffectEngine.Settings(100, 3L, 1_000_000L)), ProgressListener.NONE);
        Set<String> expected = new TreeSet<>(List.of(x, y));
        for (EdgeResult.Edge e : r.edges()) {
            if (e.posterior() > 0.5 && (Set.of(x, y).contains(e.from()) || Set.of(x, y).contains(e.to()))) {
                expected.add(e.from());
                expected.add(e.to());
            }
        }
        assertTrue(expected.size() < 24, expected.toString());
        String html = HtmlReport.render(r, "r.json", null, null, 0.5, AssessHint.API, RunHint.API, effects);
        int near = html.indexOf("<h3 id=\"neighbourhood\">Around the variables asked about</h3>");
        int whole = html.indexOf("<details><summary>The whole consensus graph (24 variables)</summary>");
        assertTrue(near > 0 && whole > near, "neighbourhood first, the whole graph folded below");
        String view = html.substring(near, whole);
        assertEquals(expected, boxes(view));
        assertTrue(view.contains(expected.size() + " of 24 variables"), view);
        // the two asked about are emphasised, the others not
        assertEquals(2, count(view, "stroke-width=\"3\"/>"));
        assertEquals(24, boxes(html.substring(whole)).size());
        // a result of few variables keeps its one graph
        String small = HtmlReport.render(Neighbourhood.restrict(r, net.names().subList(0, 20)), "r.json", null, null, 0.5,
                AssessHint.API, RunHint.API, effects);
        assertFalse(small.contains("id=\"neighbourhood\""));
    }

    /** The names in the boxes of an SVG part: each box is a group titled with its variable. */
    static Set<String> boxes(String svg) {
        Set<String> out = new TreeSet<>();
        Matcher m = Pattern.compile("<g><title>([^<( ]+)[^<]*</title><rect").matcher(svg);
        while (m.find()) {
            out.add(m.group(1));
        }
        return out;
    }

    static int count(String s, String part) {
        int k = 0;
        for (int at = s.indexOf(part); at >= 0; at = s.indexOf(part, at + 1)) {
            k++;
        }
        return k;
    }
}
