package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;
import static org.edgewise.driver.report.Html.num;
import static org.edgewise.driver.report.Html.row;

import org.edgewise.driver.result.EdgeResult;

/**
 * The report's "Convergence" section for a sampled (MCMC) result: converged or not, why the run
 * stopped, the targets (R̂, bulk effective sample size, MCSE), how the chains ran (warm-up,
 * acceptance), the worst quantities with their R̂, effective sample size and MCSE (table
 * {@code id="convergence-worst"}, the report's only such table, from {@code diagnostics.worst}), what
 * to do next, and that sampled figures carry an MCSE — the words of {@link ConvergenceAdvice}; then
 * the chains' traces. An exact result has no such section: its summary says "exact" ({@link #estimates}).
 */
final class ConvergenceSection {
    private ConvergenceSection() {
    }

    /** How the result's figures were obtained, for the summary table (HTML). */
    static String estimates(EdgeResult r) {
        String m = r.method() == null ? "" : r.method();
        boolean drawn = r.features() != null && !r.features().isEmpty() || r.essentialGraph() != null;
        return switch (m) {
            case "order" -> "exact given the order (summed, not sampled: no Monte Carlo error)";
            case "exact" -> "exact edge posteriors (summed over every order or DAG: no Monte Carlo error)"
                    + (drawn ? "; the features are drawn from the exact posterior and carry their MCSE" : "");
            case "mcmc" -> "sampled by MCMC: every posterior carries its Monte Carlo standard error (MCSE)";
            default -> esc(m);
        };
    }

    static void write(StringBuilder h, EdgeResult r, RunHint hint) {
        EdgeResult.Diagnostics d = r.diagnostics();
        if (d == null) {
            return;
        }
        h.append("<h2>Convergence</h2>\n<div class=\"").append(d.converged() ? "ok" : "warn").append("\"><b>")
                .append(d.converged() ? "Converged." : "Not converged: do not use these posteriors yet.")
                .append("</b> The run stopped because ").append(esc(ConvergenceAdvice.stopped(d))).append(".</div>\n");
        h.append("<table>\n");
        row(h, "verdict", esc(ConvergenceAdvice.verdict(d)));
        row(h, "why it stopped", esc(ConvergenceAdvice.stopped(d)) + (d.stopReason() == null ? ""
                : " (<code>" + esc(d.stopReason()) + "</code>)"));
        row(h, "targets", esc(ConvergenceAdvice.targets(d)));
        row(h, "reached", esc(ConvergenceAdvice.reached(d)));
        row(h, "run", d.chains() + " chains \u00d7 " + d.steps() + " steps kept (after " + d.burnIn()
                + " warm-up), seed " + d.seed() + ", acceptance rate " + f(d.acceptance(), 3));
        h.append("</table>\n");
        if (d.worst() != null && !d.worst().isEmpty()) {
            String rt = num(ConvergenceAdvice.rhatTarget(d));
            String et = num(ConvergenceAdvice.effectiveSampleSizeTarget(d));
            String mt = d.mcseTarget() == null ? "none" : num(d.mcseTarget());
            h.append("<table id=\"convergence-worst\">\n<tr><th>quantity</th><th>state</th><th>R\u0302 (target &lt; ").append(rt)
                    .append(")</th><th>bulk effective sample size (&ge; ").append(et).append(")</th><th>MCSE (&le; ").append(mt).append(")</th></tr>\n");
            for (EdgeResult.Worst w : d.worst()) {
                h.append("<tr><td>").append(esc(w.quantity())).append("</td><td>").append(esc(w.state()))
                        .append("</td><td class=\"num\">").append(w.rhat() == null ? "\u221e" : f(w.rhat(), 3))
                        .append("</td><td class=\"num\">").append(w.bulkEffectiveSampleSize() == null ? "\u2013" : f(w.bulkEffectiveSampleSize(), 0))
                        .append("</td><td class=\"num\">").append(w.mcse() == null ? "\u2013" : f(w.mcse(), 4))
                        .append("</td></tr>\n");
            }
            h.append("</table>\n<p class=\"cap\">").append(d.converged() ? "The quantities closest to a target"
                    : "The quantities furthest from the targets").append(", worst first. <i>stuck</i>: constant within each "
                    + "chain but different between chains (R\u0302 \u221e); <i>trap</i>: the same value in every draw of "
                    + "every chain, all of which started on one side of it.</p>\n");
        }
        String agreed = ConvergenceAdvice.agreement(d);
        if (agreed != null) {
            h.append("<p>Quantities whose draws agree: ").append(esc(agreed)).append(".</p>\n");
        }
        h.append("<p><b>What to do next:</b></p>\n<ul>\n");
        for (String s : ConvergenceAdvice.next(d, hint)) {
            h.append("<li>").append(esc(s)).append("</li>\n");
        }
        h.append("</ul>\n<p class=\"cap\">").append(esc(ConvergenceAdvice.mcseNote())).append("</p>\n");
    }

    /** The chains' trace plot, captioned with what the trace holds under the result's sampler. */
    static void traces(StringBuilder h, EdgeResult r) {
        EdgeResult.Diagnostics d = r.diagnostics();
        if (d == null || d.traces() == null || d.traces().isEmpty()) {
            return;
        }
        h.append("<h2>Chain traces</h2>\n<div class=\"fig\">").append(Charts.traces(d.traces(), d.traceThin())).append("</div>\n")
                .append("<p class=\"cap\">").append(partitionMcmc(r)
                        ? "Log score of the current DAG of each partition chain: log P(G) + log P(D | G), up to a constant, "
                        + "of the DAG the chain holds in its current partition."
                        : "Log evidence of the current order in each chain.")
                .append(" Chains that have mixed overlap and wander over the same band; a chain stuck at a different level "
                        + "signals a separate mode.</p>\n");
    }

    /** Whether a sampled result comes from partition MCMC (structure-modular DAG prior), else order MCMC. */
    static boolean partitionMcmc(EdgeResult r) {
        return "mcmc".equals(r.method()) && "structure-modular".equals(r.dagPrior());
    }
}
