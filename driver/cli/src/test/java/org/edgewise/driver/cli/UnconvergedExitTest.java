package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.ErrorReport;
import org.junit.jupiter.api.Test;

/**
 * Issue 20, point 4: an MCMC run that ends unconverged writes its result, prints its warning and
 * exits with status 3 — the warning's last sentence says so — unless {@code --allow-unconverged}
 * (then 0); 2 stays a user's mistake, 1 a bug ({@link ErrorReport}, the one place). The short fixed
 * runs here (2 chains × 40 steps, seed 1: reproducible step for step) end unconverged on this store.
 */
class UnconvergedExitTest extends StoreFixture {
    @Override
    long seed() {
        return 20_004L;
    }

    static final String[] SHORT = {"--method", "mcmc", "--steps", "40", "--draws", "20", "--chains", "2", "--seed", "1"};

    static final String EXIT_3 = "Exit status 3 (not converged; the result is written): give --allow-unconverged to accept an "
            + "unconverged run with exit status 0.";
    static final String EXIT_0 = "Exit status 0: --allow-unconverged accepts an unconverged run.";

    CliRun run(String command, List<String> rest, boolean allow) {
        List<String> a = new ArrayList<>(List.of(command, "--store", store.toString()));
        a.addAll(rest);
        a.addAll(List.of(SHORT));
        if (allow) {
            a.add("--allow-unconverged");
        }
        return CliRun.of(a.toArray(String[]::new));
    }

    /** The one warning line of a run on standard error. */
    static String warning(CliRun r, String command) {
        List<String> w = r.err().lines().filter(l -> l.startsWith(command + ": WARNING")).toList();
        assertEquals(1, w.size(), r.err());
        return w.get(0);
    }

    @Test
    void theStatusesAreDecidedInOnePlace() {
        assertEquals(3, ErrorReport.NOT_CONVERGED);
        assertEquals(3, ErrorReport.finished(false, false));
        assertEquals(0, ErrorReport.finished(false, true));
        assertEquals(0, ErrorReport.finished(true, false));
        assertEquals(0, ErrorReport.finished(null, false)); // nothing sampled by MCMC: no verdict
        assertEquals(2, ErrorReport.USER_MISTAKE);
        assertEquals(1, ErrorReport.BUG);
    }

    @Test
    void edgesWritesItsResultWarnsAndExitsThree() throws Exception {
        Path out = dir.resolve("edges.json");
        CliRun r = run("edges", List.of("--out", out.toString()), false);
        assertEquals(ErrorReport.NOT_CONVERGED, r.status(), r.err());
        String w = warning(r, "edges");
        assertTrue(w.startsWith("edges: WARNING: not converged (a fixed number of steps was run, with no check until converged; "
                + "needs R-hat < 1.01, bulk effective sample size >= 400, MCSE <= 0.01 for every edge and feature posterior): "
                + "the posteriors are not reliable. Worst: "), w);
        assertTrue(w.endsWith(". Run longer: raise the steps per chain (--steps) or run until converged instead (no --steps, "
                + "or --rhat-target). " + EXIT_3), w);
        JsonNode json = JSON.readTree(out.toFile());
        assertFalse(json.get("diagnostics").get("converged").asBoolean(), json.toString());
        assertEquals("edges: wrote " + out, r.err().strip().lines().reduce((x, y) -> y).orElseThrow());

        CliRun ok = run("edges", List.of("--format", "json"), true);
        assertEquals(0, ok.status(), ok.err());
        assertTrue(warning(ok, "edges").endsWith(". " + EXIT_0), ok.err());
        assertEquals(JSON.readTree(ok.out()).get("edges"), json.get("edges")); // the same run, only the status differs
    }

    @Test
    void predictEffectAndSampleExitThreeToo() {
        CliRun p = run("predict", List.of("--case", "v2=s1,v0=s0"), false);
        assertEquals(3, p.status(), p.err());
        assertTrue(warning(p, "predict").endsWith(" " + EXIT_3), p.err());
        assertFalse(p.out().isEmpty(), "the prediction is printed before the status");
        assertEquals(0, run("predict", List.of("--case", "v2=s1,v0=s0"), true).status());

        CliRun e = run("effect", List.of("--do", "v3=s1", "--target", "v2=s0", "--effect-draws", "50"), false);
        assertEquals(3, e.status(), e.err());
        String ew = warning(e, "effect");
        assertTrue(ew.matches("effect: WARNING: the chains have not converged \\(largest split-R-hat \\d\\.\\d{3}, target < 1\\.01; "
                + "and every edge posterior needs MCSE <= its target\\): the effect is not reliable; run longer: raise the steps "
                + "per chain \\(--steps\\) or run until converged instead \\(no --steps, or --rhat-target\\)\\. "
                + java.util.regex.Pattern.quote(EXIT_3)), ew);
        assertEquals(0, run("effect", List.of("--do", "v3=s1", "--target", "v2=s0", "--effect-draws", "50"), true).status());

        Path s = dir.resolve("s");
        CliRun sm = run("sample", List.of("--out", s.toString()), false);
        assertEquals(3, sm.status(), sm.err());
        assertTrue(Files.exists(s.resolve("sample.json")), "the sample is written before the status");
        String sw = warning(sm, "sample");
        assertTrue(sw.matches("sample: WARNING: not converged \\(largest R-hat \\d+\\.\\d{3}, smallest effective sample size \\d+\\): "
                + "the saved DAGs do not yet represent the posterior; run longer: raise the steps per chain \\(--steps\\) or run "
                + "until converged instead \\(no --steps, or --rhat-target\\)\\. " + java.util.regex.Pattern.quote(EXIT_3)), sw);
        assertTrue(sm.out().contains("; NOT converged (largest R-hat"), sm.out());

        // effect answered from that sample carries its verdict: the same status
        List<String> q = List.of("effect", "--store", store.toString(), "--sample", s.toString(), "--do", "v3=s1", "--target",
                "v2=s0", "--effect-draws", "50", "--format", "json");
        CliRun from = CliRun.of(q.toArray(String[]::new));
        assertEquals(3, from.status(), from.err());
        List<String> qa = new ArrayList<>(q);
        qa.add("--allow-unconverged");
        assertEquals(0, CliRun.of(qa.toArray(String[]::new)).status());
    }

    @Test
    void refusedWhereNothingIsSampledByMcmc() {
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--order", ORDER, "--allow-unconverged");
        assertEquals(2, r.status());
        assertEquals("edges: --allow-unconverged does not apply with --order: only a run sampled by --method mcmc can end "
                + "unconverged", r.errLine());
        CliRun x = CliRun.of("predict", "--store", store.toString(), "--method", "exact", "--case", "v0=s0", "--allow-unconverged");
        assertEquals(2, x.status());
        assertEquals("predict: --allow-unconverged does not apply with --method exact: only a run sampled by --method mcmc can "
                + "end unconverged", x.errLine());
    }
}
