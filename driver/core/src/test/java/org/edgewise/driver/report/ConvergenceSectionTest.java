package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.edgewise.driver.result.EdgeResult;
import org.junit.jupiter.api.Test;

/**
 * The report's convergence section (what a reader of a sampled result must see: verdict, why the
 * run stopped, the targets, the worst quantities with R̂ / effective sample size / MCSE, what to do next), parsed
 * back from the HTML; and its absence from an exact result, which says "exact".
 */
class ConvergenceSectionTest {
    /** A sampled result that stopped at the time budget with one stuck edge and one edge too noisy. */
    static EdgeResult unconverged() {
        EdgeResult order = ReportFixtures.fleetGivenOrder(1500);
        EdgeResult m = ReportFixtures.asMcmc(order, 1.2);
        EdgeResult.Diagnostics d0 = m.diagnostics();
        List<EdgeResult.Worst> worst = List.of(
                new EdgeResult.Worst("edge a -> <b>", null, null, 0.21, null, "stuck"),
                new EdgeResult.Worst("edge c -> d", 1.004, 812.0, 0.0173, 640.0, "varies"),
                new EdgeResult.Worst("log score", 1.008, 455.0, null, 430.0, "varies"));
        EdgeResult.Diagnostics d = new EdgeResult.Diagnostics(4, 640_000, 640_000, 42, 0.31, Double.POSITIVE_INFINITY, 455,
                false, d0.traces(), d0.traceThin(), 1.01, 400.0, 0.01, 0.21, 430.0, "max-time", 12, 30, 1, 0.005, worst,
                1250, 0.1, 6, 1.5, 298.5, null, null);
        return new EdgeResult(m.method(), m.variables(), null, null, m.evidenceConvention(), null, m.settings(), m.store(),
                m.edges(), m.parentSets(), null, d, m.features(), null, "order-modular", null);
    }

    @Test
    void anUnconvergedRunListsItsWorstQuantitiesAndWhatToDo() {
        String html = HtmlReport.render(unconverged(), "r.json", null, null, 0.5, AssessHint.API,
                new RunHint("--max-time", "--max-steps", "--steps", "no --steps", "--mcse-target", "--chains", "--method exact"));
        assertTrue(html.contains("<h2>Convergence</h2>\n<div class=\"warn\"><b>Not converged: do not use these posteriors yet.</b> "
                + "The run stopped because the time budget ran out before every target was met.</div>"), html);
        assertTrue(html.contains("<tr><th>targets</th><td>R-hat &lt; 1.01, bulk effective sample size &gt;= 400, MCSE &lt;= 0.01 for every edge "
                + "and feature posterior</td></tr>"));
        assertTrue(html.contains("<tr><th>why it stopped</th><td>the time budget ran out before every target was met "
                + "(<code>max-time</code>)</td></tr>"));
        assertTrue(html.contains("<tr><th>reached</th><td>largest R-hat inf, smallest bulk effective sample size 455, largest MCSE 0.2100</td></tr>"));
        Matcher table = Pattern.compile("<table id=\"convergence-worst\">(.*?)</table>", Pattern.DOTALL).matcher(html);
        assertTrue(table.find(), "the worst-quantity table");
        Matcher row = Pattern.compile("<tr><td>(.*?)</td><td>(.*?)</td><td class=\"num\">(.*?)</td><td class=\"num\">(.*?)</td>"
                + "<td class=\"num\">(.*?)</td></tr>").matcher(table.group(1));
        List<List<String>> rows = new ArrayList<>();
        while (row.find()) {
            rows.add(List.of(row.group(1), row.group(2), row.group(3), row.group(4), row.group(5)));
        }
        assertEquals(List.of(
                List.of("edge a -&gt; &lt;b&gt;", "stuck", "\u221e", "\u2013", "0.2100"),
                List.of("edge c -&gt; d", "varies", "1.004", "812", "0.0173"),
                List.of("log score", "varies", "1.008", "455", "\u2013")), rows);
        assertTrue(table.group(1).contains("<th>MCSE (&le; 0.01)</th>"));
        assertTrue(html.contains("<li>Run longer: raise the time budget (--max-time).</li>\n<li>A stuck quantity means the chains "
                + "sit in different modes, which running longer may not cure: try more chains (--chains) or, where the number of "
                + "variables allows, the exact method (--method exact).</li>\n<li>Until then, treat every posterior of this result "
                + "as unreliable.</li>"), html);
        assertTrue(html.contains("Sampled figures carry a Monte Carlo standard error (MCSE)"));
        assertTrue(html.contains("<tr><th>estimates</th><td>sampled by MCMC: every posterior carries its Monte Carlo standard "
                + "error (MCSE)</td></tr>"));
    }

    @Test
    void onlyTheMcseMissingSaysSo() {
        EdgeResult r = unconverged();
        EdgeResult.Diagnostics d = r.diagnostics().withVerdict(false, 0.0173,
                List.of(new EdgeResult.Worst("edge c -> d", 1.004, 812.0, 0.0173, 640.0, "varies")));
        assertEquals(List.of("Run longer: raise the time budget (maxSeconds); the chains agree, only the Monte Carlo error is "
                        + "still above its target.",
                "Or accept a larger Monte Carlo error with a larger MCSE target (mcseTarget): two runs then rarely differ on an "
                        + "edge by more than about 3.5 x that target.",
                "Until then, treat every posterior of this result as unreliable."), ConvergenceAdvice.next(d, RunHint.API));
    }

    @Test
    void anExactResultSaysExactAndHasNoConvergenceSection() {
        EdgeResult order = ReportFixtures.fleetGivenOrder(1500);
        EdgeResult exact = new EdgeResult("exact", order.variables(), -1234.5, null, "order-modular", null, order.settings(),
                order.store(), order.edges(), order.parentSets(), null, null, null, null, "structure-modular", null);
        String html = HtmlReport.render(exact, "r.json", null, null, 0.5);
        assertFalse(html.contains("<h2>Convergence</h2>"));
        assertFalse(html.contains("MCSE"));
        assertTrue(html.contains("<tr><th>method</th><td>exact</td></tr>"));
        assertTrue(html.contains("<tr><th>estimates</th><td>exact edge posteriors (summed over every order or DAG: no Monte "
                + "Carlo error)</td></tr>"), html);
        String given = HtmlReport.render(order, "r.json", null, null, 0.5);
        assertFalse(given.contains("<h2>Convergence</h2>"));
        assertTrue(given.contains("<tr><th>estimates</th><td>exact given the order (summed, not sampled: no Monte Carlo error)</td></tr>"));
    }

    @Test
    void aConvergedRunSaysSo() {
        String html = HtmlReport.render(ReportFixtures.asMcmc(ReportFixtures.fleetGivenOrder(1500), 1.004), "r.json", null, null, 0.5);
        assertTrue(html.contains("<div class=\"ok\"><b>Converged.</b>"));
        assertTrue(html.contains("<li>Nothing more is needed. Each posterior carries its MCSE; two runs with other seeds differ on "
                + "an edge by about 1.4 x its MCSE (the spread of a difference of two independent estimates).</li>"));
    }
    /** The report's words for the MCMC: "effective sample size" (never "ESS", BDeu's word) and "warm-up" (never "burn-in"). */
    @Test
    void oneWordPerMeaningEffectiveSampleSizeAndWarmUp() {
        String html = HtmlReport.render(unconverged(), "r.json", null, null, 0.5);
        assertTrue(html.contains("<tr><th>run</th><td>4 chains \u00d7 640000 steps kept (after 640000 warm-up), seed 42, "
                + "acceptance rate 0.310</td></tr>"), html);
        assertTrue(html.contains("<th>bulk effective sample size (&ge; 400)</th>"));
        assertFalse(html.contains("burn-in"), "one word for the discarded steps: warm-up");
        assertFalse(html.contains("bulk ESS"));
        assertFalse(html.contains("effective sample size</th><td>"), "no second, differently sourced figure");
    }

    /** One worst table, from diagnostics.worst: the second list ("the ten edges with the largest R̂") is gone. */
    @Test
    void oneSectionOwnsTheOneWorstTable() {
        String html = HtmlReport.render(unconverged(), "r.json", null, null, 0.5);
        assertEquals(1, html.split("<table id=\"convergence-worst\">", -1).length - 1);
        assertFalse(html.contains("largest R\u0302"), html);
        assertFalse(html.contains("MCMC diagnostics"));
        assertEquals(1, html.split("<h2>Convergence</h2>", -1).length - 1);
    }

    /** The trace caption says what the trace holds: the order's log evidence (order MCMC), the DAG's log score (partition MCMC). */
    @Test
    void theTraceCaptionFollowsTheSampler() {
        EdgeResult order = unconverged();
        String orderHtml = HtmlReport.render(order, "r.json", null, null, 0.5);
        assertTrue(orderHtml.contains("<p class=\"cap\">Log evidence of the current order in each chain."), orderHtml);
        EdgeResult partition = new EdgeResult(order.method(), order.variables(), null, null, order.evidenceConvention(), null,
                order.settings(), order.store(), order.edges(), order.parentSets(), null, order.diagnostics(), order.features(),
                null, "structure-modular", null);
        String html = HtmlReport.render(partition, "r.json", null, null, 0.5);
        assertFalse(html.contains("current order"), "partition MCMC samples partitions, not orders");
        assertTrue(html.contains("<p class=\"cap\">Log score of the current DAG of each partition chain: log P(G) + log P(D | G), "
                + "up to a constant, of the DAG the chain holds in its current partition."), html);
    }

    /** After a fixed run (stopReason "steps") the advice raises the steps or runs until converged, never the time budget. */
    @Test
    void aFixedRunIsToldToRaiseItsStepsNotTheTimeBudget() {
        EdgeResult r = unconverged();
        EdgeResult.Diagnostics d = r.diagnostics();
        EdgeResult.Diagnostics fixed = new EdgeResult.Diagnostics(d.chains(), d.steps(), d.burnIn(), d.seed(), d.acceptance(),
                d.rhat(), d.bulkEffectiveSampleSize(), false, d.traces(), d.traceThin(), d.rhatTarget(),
                d.effectiveSampleSizeTarget(), d.mcseTarget(), d.mcse(), d.tailEffectiveSampleSize(), "steps", d.constant(),
                d.settled(), d.stuck(), d.settleSpan(), List.of(new EdgeResult.Worst("edge c -> d", 1.004, 812.0, 0.0173, 640.0,
                "varies")), d.drawsPerChain(), d.relocateShare(), d.checks(), d.checkSeconds(), d.samplingSeconds(), null, null);
        RunHint cli = new RunHint("--max-time", "--max-steps", "--steps", "no --steps, or --until-rhat", "--mcse-target",
                "--chains", "--method exact");
        List<String> next = ConvergenceAdvice.next(fixed, cli);
        assertEquals("Run longer: raise the steps per chain (--steps) or run until converged instead (no --steps, or "
                + "--until-rhat).", next.get(0));
        assertFalse(String.join(" ", next).contains("--max-time"), next.toString());
        assertFalse(ConvergenceAdvice.warning(fixed, cli).contains("--max-time"));
        assertEquals("run longer: raise the steps per chain (--steps) or run until converged instead (no --steps, or "
                + "--until-rhat)", ConvergenceAdvice.runLonger("steps", cli));
        assertEquals("run longer: raise the time budget (--max-time)", ConvergenceAdvice.runLonger(null, cli));
    }
}
