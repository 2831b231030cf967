package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.HexFormat;
import java.util.List;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.query.CasePredictor;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

/**
 * {@code predict --cases F --target y} end to end (issue 19 point 4): per-row conditionals against
 * the library's conditional P(t | e) = P(t, e) / P(e) (P(e) summed out on its own, not as the sum over
 * y's states the command normalises by), held-out scores re-derived from their definitions on the
 * rows printed, the truth never evidence, blank truths not scored, the saved sample named by path and
 * SHA-256, the interval sampled and nested across levels, and every refusal word for word.
 */
class ScoringCasesTest extends StoreFixture {
    static final int[] ORD = {3, 0, 4, 1, 2};
    static final int H = -1;
    Path cases;

    @Override
    long seed() {
        return 64_646_464L;
    }

    @BeforeEach
    void cases() throws Exception {
        // target v2 (states s0, s1); the fourth row has no truth
        cases = Files.writeString(dir.resolve("cases.csv"), "v0,v1,v2,v4\ns0,s1,s0,s2\ns1,,s1,s0\n,s2,s1,\ns1,s0,,s1\n");
    }

    /** predict with --cases and --target v2 unless {@code more} gives its own. */
    CliRun predict(String... more) {
        List<String> m = List.of(more);
        List<String> a = new java.util.ArrayList<>(List.of("predict", "--store", store.toString()));
        if (!m.contains("--cases")) {
            a.addAll(List.of("--cases", cases.toString()));
        }
        if (!m.contains("--target")) {
            a.addAll(List.of("--target", "v2"));
        }
        a.addAll(m);
        return CliRun.of(a.toArray(String[]::new));
    }

    JsonNode json(String... more) throws Exception {
        List<String> a = new java.util.ArrayList<>(List.of(more));
        a.addAll(List.of("--format", "json"));
        CliRun r = predict(a.toArray(String[]::new));
        assertEquals(0, r.status(), r.err());
        return JSON.readTree(r.out());
    }

    @Test
    void perRowConditionalsAndScores() throws Exception {
        JsonNode j = json("--order", ORDER, "--tail-mass", "0");
        assertEquals("target-prediction", j.get("kind").asText());
        assertEquals(1, j.get("formatVersion").asInt());
        assertEquals("exact", j.get("estimate").asText());
        CasePredictor avg = CasePredictor.averaged(OrderPosterior.of(LocalScores.build(mem, ScoringOptions.asStored()), ORD), 0);
        int[][] evidence = {{0, 1, H, H, 2}, {1, H, H, H, 0}, {H, 2, H, H, H}, {1, 0, H, H, 1}};
        int[] truth = {0, 1, 1, -1};
        double logLoss = 0;
        double brier = 0;
        for (int i = 0; i < evidence.length; i++) {
            JsonNode row = j.get("predictions").get(i);
            assertEquals(i + 2, row.get("line").asInt());
            for (int k = 0; k < 2; k++) {
                int[] t = {H, H, k, H, H};
                double want = Math.exp(avg.logConditional(t, evidence[i]));
                assertEquals(want, row.get("probability").get(k).asDouble(), 1e-12, "row " + (i + 1) + " state " + k);
            }
            if (truth[i] >= 0) {
                assertEquals("s" + truth[i], row.get("truth").asText());
                double p = row.get("probability").get(truth[i]).asDouble();
                logLoss -= Math.log(p);
                brier += 2 * (1 - p) * (1 - p); // two states: (1 − p)² for the true one, p'² = (1 − p)² for the other
            } else {
                assertTrue(row.get("truth") == null, "a blank truth is none");
            }
        }
        assertEquals(3, j.get("scoredRows").asInt());
        assertEquals(1, j.get("unscoredRows").asInt());
        assertEquals("v2", j.get("truthColumn").asText());
        JsonNode s = j.get("scores");
        assertEquals(logLoss / 3, s.get("logLoss").asDouble(), 1e-12);
        assertEquals(brier / 3, s.get("brier").asDouble(), 1e-12);
        assertEquals("binary", s.get("aucOf").asText());
        // AUC from the definition: P(s1) of the two s1 rows against the one s0 row
        double neg = j.get("predictions").get(0).get("probability").get(1).asDouble();
        double auc = 0;
        for (int i : new int[] {1, 2}) {
            double pos = j.get("predictions").get(i).get("probability").get(1).asDouble();
            auc += pos > neg ? 1 : pos == neg ? 0.5 : 0;
        }
        assertEquals(auc / 2, s.get("auc").asDouble(), 1e-12);
        assertEquals("s1", s.get("calibration").get(0).get("state").asText());
        // the readable table says what was left out
        CliRun t = predict("--order", ORDER);
        assertEquals(0, t.status(), t.err());
        assertTrue(t.out().contains("held-out scores over 3 rows with a truth (from column v2); 1 row without one was predicted, "
                + "not scored:"), t.out());
    }

    @Test
    void theTruthIsNeverEvidence() throws Exception {
        cases = Files.writeString(dir.resolve("same.csv"), "v0,v2,v4\ns1,s0,s2\ns1,s1,s2\ns1,,s2\n");
        JsonNode j = json("--order", ORDER);
        JsonNode p = j.get("predictions");
        for (int i = 1; i < 3; i++) {
            assertEquals(p.get(0).get("probability"), p.get(i).get("probability"), "row " + (i + 1));
        }
        // a truth column of its own: the target's column is then neither truth nor evidence
        cases = Files.writeString(dir.resolve("own.csv"), "v0,v2,v4,y\ns1,s0,s2,s1\n");
        JsonNode k = json("--order", ORDER, "--truth-column", "y");
        assertEquals(p.get(0).get("probability"), k.get("predictions").get(0).get("probability"));
        assertEquals("s1", k.get("predictions").get(0).get("truth").asText());
        assertEquals("y", k.get("truthColumn").asText());
    }

    @Test
    void csvHasOneColumnPerState() throws Exception {
        Path out = dir.resolve("scored.csv");
        CliRun r = predict("--order", ORDER, "--out", out.toString());
        assertEquals(0, r.status(), r.err());
        assertTrue(r.err().startsWith("predict: wrote " + out + " (csv, 4 rows; over 3 rows with a truth: log loss "), r.err());
        List<String> lines = Files.readAllLines(out);
        assertEquals("v0,v1,v2,v4,P(v2=s0),P(v2=s1)", lines.get(0));
        assertEquals(5, lines.size());
        JsonNode j = json("--order", ORDER);
        for (int i = 0; i < 4; i++) {
            String[] f = lines.get(i + 1).split(",", -1);
            assertEquals(j.get("predictions").get(i).get("probability").get(0).asDouble(), Double.parseDouble(f[4]), 0.0);
            assertEquals(j.get("predictions").get(i).get("probability").get(1).asDouble(), Double.parseDouble(f[5]), 0.0);
        }
    }

    @Test
    void aSavedSampleIsNamedByPathAndFingerprint() throws Exception {
        Path sample = dir.resolve("sample");
        CliRun s = CliRun.of("sample", "--store", store.toString(), "--out", sample.toString(), "--method", "exact", "--dags", "300");
        assertEquals(0, s.status(), s.err());
        MessageDigest md = MessageDigest.getInstance("SHA-256"); // the fingerprint's definition: both files, manifest first
        md.update(Files.readAllBytes(sample.resolve("sample.json")));
        md.update(Files.readAllBytes(sample.resolve("dags.bin")));
        String sha = HexFormat.of().formatHex(md.digest());
        JsonNode j = json("--sample", sample.toString(), "--interval", "0.9", "--interval-draws", "60");
        assertEquals(sample.toString(), j.get("sample").get("path").asText());
        assertEquals(sha, j.get("sample").get("fingerprint").asText());
        assertEquals(mem.manifest().input().fingerprint(), j.get("sample").get("storeFingerprint").asText());
        assertEquals("sampled", j.get("estimate").asText());
        assertEquals(300, j.get("samples").asInt());
        JsonNode row = j.get("predictions").get(0);
        assertTrue(row.get("mcse").get(0).asDouble() > 0, "sampled: an MCSE per probability");
        assertTrue(j.get("interval").get("of").asText().contains("(sampled)"));
        // one case too
        CliRun one = CliRun.of("predict", "--store", store.toString(), "--sample", sample.toString(), "--case", "v2=s1", "--format", "json");
        assertEquals(0, one.status(), one.err());
        assertEquals(sha, JSON.readTree(one.out()).get("sample").get("fingerprint").asText());
    }

    /** Source: quantiles are monotone in the level, so over the same draws (same seed) a 50% interval lies inside the 95% one. */
    @Test
    void intervalsNestAcrossLevels() throws Exception {
        JsonNode wide = json("--order", ORDER, "--interval", "0.95", "--interval-draws", "200", "--seed", "4");
        JsonNode narrow = json("--order", ORDER, "--interval", "0.5", "--interval-draws", "200", "--seed", "4");
        for (int i = 0; i < 4; i++) {
            for (int k = 0; k < 2; k++) {
                double wl = wide.get("predictions").get(i).get("lower").get(k).asDouble();
                double wu = wide.get("predictions").get(i).get("upper").get(k).asDouble();
                double nl = narrow.get("predictions").get(i).get("lower").get(k).asDouble();
                double nu = narrow.get("predictions").get(i).get("upper").get(k).asDouble();
                assertTrue(0 <= wl && wl <= nl && nl <= nu && nu <= wu && wu <= 1, wl + " " + nl + " " + nu + " " + wu);
            }
        }
        assertEquals(200, wide.get("interval").get("draws").asInt());
        assertEquals(0.95, wide.get("interval").get("level").asDouble(), 0.0);
    }

    /** The report draws one reliability diagram per calibration table, one dot per non-empty bin, at (mean predicted, observed). */
    @Test
    void reportDrawsTheCalibrationCurve() throws Exception {
        Path result = dir.resolve("scored.json");
        CliRun r = predict("--order", ORDER, "--format", "json", "--out", result.toString());
        assertEquals(0, r.status(), r.err());
        Path html = dir.resolve("scored.html");
        CliRun rep = CliRun.of("report", "--result", result.toString(), "--out", html.toString());
        assertEquals(0, rep.status(), rep.err());
        String page = Files.readString(html);
        JsonNode cal = JSON.readTree(result.toFile()).get("scores").get("calibration");
        assertEquals(1, cal.size());
        assertEquals(1, page.split("<svg ", -1).length - 1, "one diagram: two states, the second state's table");
        int dots = 0;
        for (JsonNode b : cal.get(0).get("bins")) {
            if (b.get("count").asInt() > 0) {
                dots++;
                // the dot's centre: x0 + mean·SIDE, y0 − observed·SIDE (46 + p·300, 312 − o·300)
                String cx = org.edgewise.driver.report.Html.c(46 + b.get("meanPredicted").asDouble() * 300);
                String cy = org.edgewise.driver.report.Html.c(312 - b.get("observedFrequency").asDouble() * 300);
                assertTrue(page.contains("<circle cx=\"" + cx + "\" cy=\"" + cy + "\""), cx + "," + cy);
            }
        }
        assertEquals(dots, page.split("<circle ", -1).length - 1);
        assertTrue(page.contains("Brier score") && page.contains("log loss") && page.contains("AUC"));
        assertEquals("report: --threshold does not apply with a target-prediction result: a target-prediction result has no edges "
                + "to draw a consensus graph from", CliRun.of("report", "--result", result.toString(), "--threshold", "0.3").errLine());
    }

    @Test
    void refusals() throws Exception {
        String s = store.toString();
        String c = cases.toString();
        refused("predict: --target: unknown variable 'zz' (variables: v0, v1, v2, v3, v4)",
                "--order", ORDER, "--target", "zz");
        Path bad = Files.writeString(dir.resolve("bad.csv"), "v0,v2\ns0,s1\ns7,s0\n");
        refused("predict: " + bad + ": line 3, column 1: variable 'v0' has no state 's7' (valid states: s0, s1)",
                "--order", ORDER, "--cases", bad.toString());
        Path truth = Files.writeString(dir.resolve("truth.csv"), "v0,y\ns0,s1\ns1,yes\n");
        refused("predict: " + truth + ": line 3, column 2 (truth): variable 'v2' has no state 'yes' (valid states: s0, s1)",
                "--order", ORDER, "--cases", truth.toString(), "--truth-column", "y");
        refused("predict: " + c + ": line 1: no column 'y' (columns: v0, v1, v2, v4)", "--order", ORDER, "--truth-column", "y");
        refused("predict: --given observes the target v2; a prediction of it cannot be conditioned on it",
                "--order", ORDER, "--given", "v2=s0");
        refused("predict: " + c + ": line 3, column 1: v0=s1 contradicts --given v0=s0", "--order", ORDER, "--given", "v0=s0");
        refused("predict: --interval must be a probability strictly between 0 and 1 (e.g. 0.95), got 1.5",
                "--order", ORDER, "--interval", "1.5");
        refused("predict: --exact-cases does not apply with --target: it computes the joint probability of complete cases; a "
                + "prediction of the target conditions on the rest of each row", "--method", "exact", "--dag-prior", "order-modular",
                "--exact-cases");
        assertEquals("predict: --target does not apply without --cases: it predicts the target for every row of a table of cases",
                CliRun.of("predict", "--store", s, "--order", ORDER, "--case", "v0=s0", "--target", "v2").errLine());
        assertEquals("predict: --truth-column does not apply without --target: it names the column of the target's true states",
                CliRun.of("predict", "--store", s, "--order", ORDER, "--cases", c, "--truth-column", "v2").errLine());
        assertEquals("predict: --interval does not apply without --target: it is an interval of each row's predicted "
                + "probabilities of the target", CliRun.of("predict", "--store", s, "--order", ORDER, "--cases", c, "--interval", "0.9").errLine());
        assertEquals("predict: --interval-draws does not apply without --interval: it sets how many draws the interval is taken over",
                CliRun.of("predict", "--store", s, "--order", ORDER, "--cases", c, "--target", "v2", "--interval-draws", "50").errLine());
        assertEquals("predict: --format must be table or json (csv: with --cases --target), got 'csv'",
                CliRun.of("predict", "--store", s, "--order", ORDER, "--case", "v0=s0", "--format", "csv").errLine());
    }

    void refused(String message, String... more) {
        CliRun r = predict(more);
        assertEquals(EdgewiseCli.USER_ERROR, r.status(), r.out() + r.err());
        assertEquals(message, r.errLine());
    }
}
