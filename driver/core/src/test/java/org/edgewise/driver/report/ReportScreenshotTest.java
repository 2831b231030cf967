package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.awt.image.BufferedImage;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import javax.imageio.ImageIO;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.analysis.EdgeAnalysis;
import org.edgewise.driver.analysis.EffectAnalysis;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.effect.EffectEngine;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.result.ResultJson;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;

/**
 * Screenshots of whole reports in headless Chromium, kept in {@code target/report-shots/} for a
 * person to look at: the demo network (13 variables, exact over all DAGs, essential graph, an ESS
 * sweep, an intervention, the known network) and a random network of 42 variables (partition MCMC
 * with essential-graph features, the known network). Checked here: each page renders to a real
 * picture, the graph fits the page width, and the summary comes before the figures. Skipped where
 * Chromium is not installed (as {@link ReportBrowserTest}).
 */
class ReportScreenshotTest {
    static final Path SHOTS = Path.of("target", "report-shots");

    static UnknownOrderSettings settings(UnknownOrderSettings.Method m, List<List<String>> tiers, Long steps, boolean essential) {
        return new UnknownOrderSettings(m, tiers, 5L, 2, steps, null, 200, null, null, 600.0, false, false, 300, 3,
                DagPrior.STRUCTURE_MODULAR, essential);
    }

    /**
     * Results are written beside the screenshots; with {@code -Dedgewise.shots.reuse=true} a later run
     * reads them back instead of averaging again (for quick looks while changing the report only).
     */
    static final boolean REUSE = Boolean.getBoolean("edgewise.shots.reuse");

    /** The demo: 13 variables, exact over every DAG with an ESS sweep, and one intervention. */
    static String demo() {
        Network net = ReportFixtures.fleet();
        Path edges = SHOTS.resolve("demo-13-edges.json");
        Path effect = SHOTS.resolve("demo-13-effect.json");
        if (REUSE && Files.isRegularFile(edges) && Files.isRegularFile(effect)) {
            return HtmlReport.render(ResultJson.readEdges(edges), "edges.json", net, "fleet-network.json", 0.5, AssessHint.API,
                    RunHint.API, EffectResult.read(effect));
        }
        ScoreStore store = ReportFixtures.tally(net, 3000, 11);
        ScoringOptions so = ScoringOptions.asStored();
        UnknownOrderSettings s = settings(UnknownOrderSettings.Method.EXACT, null, null, true);
        EdgeResult r = EdgeAnalysis.run(store, Path.of("out/demo/store"), List.of(so, so.withEss(0.1), so.withEss(10)), null, s, 3,
                ProgressListener.NONE, x -> { });
        List<EffectResult> effects = EffectAnalysis.run(new EffectAnalysis.Request(LocalScores.build(store, so), null, s,
                List.of(new EffectAnalysis.Question("door_openings=many", "spoilage=rejected", null, "door_openings=few", "")),
                new EffectEngine.Settings(400, 5L, 1_000_000L)), ProgressListener.NONE);
        ResultJson.write(edges, true, r);
        ResultJson.write(effect, true, effects.get(0));
        return HtmlReport.render(r, "edges.json", net, "fleet-network.json", 0.5, AssessHint.API, RunHint.API, effects);
    }

    /**
     * 42 variables of a random network, partition MCMC with essential-graph features, and one effect
     * along an edge of the network (averaged given the network's own order, which is its index order:
     * a fixture for the page, not a check of the effect), so the report draws the neighbourhood of the
     * variables asked about first and folds the whole graph below.
     */
    static String wide() {
        Network net = RandomNetwork.generate("x", 42, 3, 2, 6, 3.0, 0.02, 42L);
        Path edges = SHOTS.resolve("random-42-edges.json");
        Path effect = SHOTS.resolve("random-42-effect.json");
        if (REUSE && Files.isRegularFile(edges) && Files.isRegularFile(effect)) {
            return HtmlReport.render(ResultJson.readEdges(edges), "edges.json", net, "random-42.json", 0.5, AssessHint.API,
                    RunHint.API, EffectResult.read(effect));
        }
        ScoreStore store = ReportFixtures.tally(net, 2000, 12);
        UnknownOrderSettings s = settings(UnknownOrderSettings.Method.MCMC, null, 2000L, false);
        EdgeResult r = EdgeAnalysis.run(store, Path.of("store"), List.of(ScoringOptions.asStored()), null, s, 3,
                ProgressListener.NONE, x -> { });
        int b = net.size() / 2;
        int a = b - 1;
        while (!net.hasEdge(a, b)) {
            b += a == 0 ? 1 : 0;
            a = a == 0 ? b - 1 : a - 1;
        }
        String x = net.names().get(a);
        String y = net.names().get(b);
        int[] order = java.util.stream.IntStream.range(0, net.size()).toArray();
        List<EffectResult> effects = EffectAnalysis.run(new EffectAnalysis.Request(LocalScores.build(store, ScoringOptions.asStored()),
                order, null, List.of(new EffectAnalysis.Question(x + "=s1", y + "=s1", null, x + "=s0", "")),
                new EffectEngine.Settings(200, 5L, 1_000_000L)), ProgressListener.NONE);
        ResultJson.write(edges, true, r);
        ResultJson.write(effect, true, effects.get(0));
        return HtmlReport.render(r, "edges.json", net, "random-42.json", 0.5, AssessHint.API, RunHint.API, effects);
    }

    @Test
    void demoAndFortyTwoVariablesRenderReadably() throws Exception {
        String browser = ReportBrowserTest.chromium();
        Assumptions.assumeTrue(browser != null, "chromium is not installed; screenshots skipped");
        Files.createDirectories(SHOTS);
        shoot(browser, "demo-13", demo());
        String wide = wide();
        // the neighbourhood of the variables asked about comes first, the whole graph folded below it
        assertTrue(wide.indexOf("id=\"neighbourhood\"") < wide.indexOf("<summary>The whole consensus graph (42 variables)</summary>")
                && wide.contains("id=\"neighbourhood\""), "neighbourhood first");
        shoot(browser, "random-42", wide);
    }

    static void shoot(String browser, String name, String html) throws Exception {
        Path page = SHOTS.resolve(name + ".html");
        Files.writeString(page, html);
        Path png = SHOTS.resolve(name + ".png");
        Files.deleteIfExists(png);
        Path profile = Files.createTempDirectory("chromium-profile");
        Process p = new ProcessBuilder(browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
                "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync",
                "--hide-scrollbars", "--user-data-dir=" + profile, "--screenshot=" + png.toAbsolutePath(),
                "--window-size=1200,7000", page.toAbsolutePath().toUri().toString())
                .redirectErrorStream(true).redirectOutput(SHOTS.resolve(name + ".log").toFile()).start();
        if (!p.waitFor(180, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            fail("chromium did not finish within 180 s");
        }
        assertTrue(Files.isRegularFile(png), "no screenshot of " + name);
        BufferedImage img = ImageIO.read(png.toFile());
        assertTrue(img.getWidth() == 1200, name + ": width " + img.getWidth());
        // slices a person can view one at a time
        int slice = 1400;
        for (int k = 0; k * slice < img.getHeight(); k++) {
            int h = Math.min(slice, img.getHeight() - k * slice);
            ImageIO.write(img.getSubimage(0, k * slice, img.getWidth(), h), "png", SHOTS.resolve(name + "-" + (k + 1) + ".png").toFile());
        }
    }
}
