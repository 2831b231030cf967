package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.awt.image.BufferedImage;
import java.io.File;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.concurrent.TimeUnit;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The report renders in a real browser: headless Chromium (Debian package {@code chromium})
 * loads the file and takes a screenshot, which must be a real picture — not missing, not tiny,
 * not one colour. Skipped (with a message) where Chromium is not installed, unless
 * {@code EDGEWISE_REQUIRE_BROWSER=1} (set by .ci/run once it has installed it): then it must run.
 */
class ReportBrowserTest {
    @TempDir
    Path dir;

    static String chromium() {
        String override = System.getenv("EDGEWISE_CHROMIUM");
        if (override != null && !override.isBlank()) {
            return override;
        }
        for (String name : List.of("chromium", "chromium-browser")) {
            for (String d : System.getenv().getOrDefault("PATH", "").split(File.pathSeparator)) {
                if (Files.isExecutable(Path.of(d, name))) {
                    return Path.of(d, name).toString();
                }
            }
        }
        return null;
    }

    @Test
    void rendersInHeadlessChromium() throws Exception {
        String browser = chromium();
        if (browser == null) {
            if ("1".equals(System.getenv("EDGEWISE_REQUIRE_BROWSER"))) {
                fail("EDGEWISE_REQUIRE_BROWSER=1 but no chromium on PATH");
            }
            Assumptions.abort("chromium is not installed (apt-get install -y chromium); browser rendering test skipped");
        }
        Path html = dir.resolve("report.html");
        Files.writeString(html, HtmlReport.render(ReportFixtures.fleetGivenOrder(1500), "r.json", ReportFixtures.fleet(),
                "fleet-network.json", 0.5));
        Path png = dir.resolve("shot.png");
        Path profile = Files.createDirectory(dir.resolve("profile"));
        ProcessBuilder pb = new ProcessBuilder(browser, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
                "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync",
                "--user-data-dir=" + profile, "--screenshot=" + png, "--window-size=1200,2000", html.toUri().toString())
                .redirectErrorStream(true).redirectOutput(dir.resolve("chromium.log").toFile());
        Process p = pb.start();
        if (!p.waitFor(120, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            fail("chromium did not finish within 120 s; log: " + Files.readString(dir.resolve("chromium.log")));
        }
        assertTrue(Files.isRegularFile(png), "no screenshot; chromium log: " + Files.readString(dir.resolve("chromium.log")));
        assertTrue(Files.size(png) > 20_000, "screenshot is only " + Files.size(png) + " bytes");
        BufferedImage img = ImageIO.read(png.toFile());
        assertEquals(1200, img.getWidth());
        assertEquals(2000, img.getHeight());
        Set<Integer> colours = new HashSet<>();
        long dark = 0;
        long samples = 0;
        for (int y = 0; y < img.getHeight(); y += 3) {
            for (int x = 0; x < img.getWidth(); x += 3) {
                int rgb = img.getRGB(x, y) & 0xffffff;
                colours.add(rgb);
                int lum = ((rgb >> 16) & 255) + ((rgb >> 8) & 255) + (rgb & 255);
                dark += lum < 3 * 128 ? 1 : 0;
                samples++;
            }
        }
        assertTrue(colours.size() > 50, "only " + colours.size() + " colours: the page did not render its figures");
        // text, boxes and dark heatmap cells cover some of the page, but it is not a black screen
        double share = dark / (double) samples;
        assertTrue(share > 0.005 && share < 0.5, "dark share " + share);
        // the caution box's amber border is on screen (it is first on the page)
        boolean amber = false;
        for (int y = 0; y < 600 && !amber; y++) {
            for (int x = 0; x < img.getWidth() && !amber; x++) {
                amber = (img.getRGB(x, y) & 0xffffff) == 0xc77700;
            }
        }
        assertTrue(amber, "the caution box's border colour #c77700 is visible near the top");
    }
}
