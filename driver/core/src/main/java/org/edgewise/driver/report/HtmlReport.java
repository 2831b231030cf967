package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;

import java.util.List;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.EffectResult;

/**
 * The HTML report of an {@code edges} result: one self-contained file (inline CSS and SVG, no
 * script, a Content-Security-Policy that forbids every fetch), readable by a person.
 * Sections: cautions, summary, convergence (sampled results), consensus graph, heatmap, strongest
 * edges, parent sets, chain traces (sampled results), ESS sensitivity, recovery of a known network, features, provenance.
 * Every name from the data passes through {@link Html#esc}.
 */
public final class HtmlReport {
    /** An edge whose posterior moves more than this across ESS values is listed as sensitive. */
    public static final double SENSITIVITY_CHANGE = 0.1;
    /** Parent sets shown per variable. */
    public static final int TOP_PARENT_SETS = 3;
    /** Rows of the sensitivity table at most. */
    public static final int MAX_SENSITIVE_ROWS = 100;

    private static final String CSS = """
            body{font-family:system-ui,-apple-system,"Segoe UI",Roboto,sans-serif;margin:24px auto;max-width:1150px;color:#1f2d3d;line-height:1.45;padding:0 16px}
            h1{font-size:26px;margin-bottom:4px}h2{font-size:20px;margin-top:34px;border-bottom:1px solid #dde3ea;padding-bottom:4px}
            .sub{color:#5a6b7d;margin-top:0}
            .caution{border:3px solid #c77700;background:#fff6e5;padding:12px 18px;border-radius:8px;margin:18px 0}
            .caution h2{margin-top:4px;border:none;color:#8a4f00}
            .warn{border:2px solid #c0254a;background:#fdecef;padding:10px 16px;border-radius:8px;margin:14px 0}
            .ok{border:2px solid #1a7f37;background:#eaf6ec;padding:10px 16px;border-radius:8px;margin:14px 0}
            table{border-collapse:collapse;margin:8px 0 12px 0;font-size:14px}
            th,td{border:1px solid #d5dce4;padding:4px 9px;text-align:left;vertical-align:top}
            th{background:#f0f4f8}td.num{text-align:right;font-variant-numeric:tabular-nums}td.na{color:#8a4f00;font-style:italic;text-align:center}
            .fig{overflow-x:auto;margin:8px 0}.cap{color:#5a6b7d;font-size:14px;max-width:900px}
            .key span{display:inline-block;margin-right:16px}.sw{display:inline-block;width:22px;height:4px;vertical-align:middle;margin-right:5px}
            code{background:#f0f4f8;padding:0 3px;border-radius:3px}
            .answer{border:2px solid #2c5d8a;background:#f5f9fd;padding:8px 18px;border-radius:8px;margin:14px 0}
            .answer ul.cols{columns:2 330px;margin:4px 0}.answer ul.dirs{margin:2px 0 6px 0}.caution h3{margin:4px 0;color:#8a4f00}
            details{margin:10px 0}details>summary{cursor:pointer;color:#2c5d8a;font-weight:600}
            .legend svg{vertical-align:middle;margin-right:6px}.legend span{display:inline-block;margin:2px 18px 2px 0}
            """;

    private HtmlReport() {
    }

    /**
     * Renders the report.
     *
     * @param r          the result
     * @param resultName how to name the result file in the report
     * @param truth      a known network, or null
     * @param truthName  how to name the truth file
     * @param threshold  consensus graph: edges with posterior above it
     */
    public static String render(EdgeResult r, String resultName, Network truth, String truthName, double threshold) {
        return render(r, resultName, truth, truthName, threshold, AssessHint.API);
    }

    /** As {@link #render(EdgeResult, String, Network, String, double)}, naming how to get essential-graph features as {@code hint}. */
    public static String render(EdgeResult r, String resultName, Network truth, String truthName, double threshold,
                                AssessHint hint) {
        return render(r, resultName, truth, truthName, threshold, hint, RunHint.API);
    }

    /** As {@link #render(EdgeResult, String, Network, String, double, AssessHint)}, naming how to run longer as {@code run}. */
    public static String render(EdgeResult r, String resultName, Network truth, String truthName, double threshold,
                                AssessHint hint, RunHint run) {
        return render(r, resultName, truth, truthName, threshold, hint, run, null);
    }

    /**
     * As {@link #render(EdgeResult, String, Network, String, double, AssessHint, RunHint)}, with the
     * interventions of {@code effects} (null: none) in the summary and in a section right after it.
     */
    public static String render(EdgeResult r, String resultName, Network truth, String truthName, double threshold,
                                AssessHint hint, RunHint run, List<EffectResult> effects) {
        // the n × n parts are planned before any is built: a refusal with the figure, not an OutOfMemoryError
        TooLargeToReport.check(r.variables() == null ? 0 : r.variables().size(), Runtime.getRuntime().maxMemory());
        EdgeMatrix m = EdgeMatrix.of(r);
        ConsensusEdges ce = ConsensusEdges.of(r, m);
        List<ConsensusEdges.Drawn> shown = ce.drawn(threshold);
        boolean[][] g = ce.layoutGraph(shown);
        boolean[][] t = truth == null ? null : EdgeRecovery.truthMatrix(m, truth, truthName);
        EdgeRecovery rec = truth == null ? null : EdgeRecovery.of(m, truth, truthName, threshold);
        boolean[][] drawn = new boolean[m.size()][m.size()];
        for (int a = 0; a < m.size(); a++) {
            for (int b = 0; b < m.size(); b++) {
                drawn[a][b] = g[a][b] || t != null && t[a][b] && !g[a][b] && !g[b][a];
            }
        }
        ConsensusLayout lay = ConsensusLayout.of(m, g, drawn, "order".equals(r.method()) ? r.order() : null,
                r.settings() == null ? null : r.settings().tiers());
        StringBuilder h = new StringBuilder(64 * 1024);
        h.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
                .append("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'; img-src data:\">\n")
                .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
                .append("<title>Edgewise report: ").append(esc(resultName)).append("</title>\n<style>\n").append(CSS)
                .append("</style>\n</head>\n<body>\n");
        h.append("<h1>Edge posteriors</h1>\n<p class=\"sub\">Edgewise report of <code>").append(esc(resultName))
                .append("</code> \u2014 ").append(esc(methodName(r))).append(", ").append(m.size()).append(" variables")
                .append(r.store() != null ? ", " + r.store().rows() + " rows" : "").append("</p>\n");
        SummarySection.write(h, r, m, ce, shown, rec, threshold, effects);
        if (effects != null && !effects.isEmpty()) {
            h.append(EffectSection.section(effects));
        }
        h.append("<h2>Consensus graph</h2>\n");
        List<String> near = m.size() > Neighbourhood.FROM_VARIABLES
                ? Neighbourhood.of(m, shown, Neighbourhood.queried(effects)) : null;
        boolean fold = near != null && near.size() < m.size();
        if (fold) {
            neighbourhood(h, r, near, Neighbourhood.queried(effects), truth, truthName, threshold, hint);
            h.append("<details><summary>The whole consensus graph (").append(m.size()).append(" variables)</summary>\n");
        }
        h.append("<div class=\"fig\">").append(Charts.graph(m, ce, shown, lay, t)).append("</div>\n");
        h.append("<p class=\"cap\">").append(Cautions.graphCaption(ce, threshold, hint)).append(' ').append(layoutWords(r, lay, m))
                .append(" Hover over an edge for all its posteriors.</p>\n");
        if (fold) {
            h.append("</details>\n");
        }
        if (t != null) {
            legend(h);
        }
        Cautions.write(h, r, ce, hint);
        ConvergenceSection.write(h, r, run);

        h.append("<h2>Edge posterior heatmap</h2>\n<div class=\"fig\">").append(Charts.heatmap(m, t)).append("</div>\n");
        h.append("<p class=\"cap\">Each cell is P(row \u2192 column | data), averaged over structures. "
                + "Cells are pale for unsupported edges and dark for strongly supported ones; a dependence supported "
                + "in both directions shows as two mid-tone cells mirrored across the diagonal.</p>\n");

        PairTable.write(h, m, ce, t, r, hint);
        StrongestEdges.write(h, m, t, r);
        ParentSetSection.write(h, r);
        ConvergenceSection.traces(h, r);
        SensitivitySection.write(h, r, m);
        if (rec != null) {
            RecoverySection.write(h, rec, truthName);
        }
        FeatureSection.write(h, r);
        ProvenanceSection.write(h, r, resultName);
        h.append("<p class=\"cap\">Written by Edgewise. This file is self-contained and loads nothing from the network.</p>\n");
        return h.append("</body>\n</html>\n").toString();
    }

    /**
     * The neighbourhood of the variables asked about ({@link Neighbourhood}), drawn by the same rules as
     * the whole graph on the result restricted to it, the asked variables emphasised.
     */
    private static void neighbourhood(StringBuilder h, EdgeResult r, List<String> near, java.util.Set<String> queried,
                                      Network truth, String truthName, double threshold, AssessHint hint) {
        EdgeResult sub = Neighbourhood.restrict(r, near);
        EdgeMatrix sm = EdgeMatrix.of(sub);
        ConsensusEdges sce = ConsensusEdges.of(sub, sm);
        List<ConsensusEdges.Drawn> sshown = sce.drawn(threshold);
        boolean[][] g = sce.layoutGraph(sshown);
        boolean[][] t = truth == null ? null : EdgeRecovery.truthMatrix(sm, truth, truthName);
        boolean[][] drawn = new boolean[sm.size()][sm.size()];
        for (int a = 0; a < sm.size(); a++) {
            for (int b = 0; b < sm.size(); b++) {
                drawn[a][b] = g[a][b] || t != null && t[a][b] && !g[a][b] && !g[b][a];
            }
        }
        ConsensusLayout lay = ConsensusLayout.of(sm, g, drawn, "order".equals(sub.method()) ? sub.order() : null,
                sub.settings() == null ? null : sub.settings().tiers());
        List<String> asked = new java.util.ArrayList<>(queried);
        asked.retainAll(near);
        h.append("<h3 id=\"neighbourhood\">Around the variables asked about</h3>\n<div class=\"fig\">")
                .append(Charts.graph(sm, sce, sshown, lay, t, queried)).append("</div>\n")
                .append("<p class=\"cap\">The variables asked about (heavy boxes: ").append(esc(String.join(", ", asked)))
                .append(") and every variable joined to one of them with posterior above ").append(Html.f(threshold, 2))
                .append(": ").append(near.size()).append(" of ").append(r.variables().size())
                .append(" variables, drawn by the same rules as the whole graph, which is folded below. ")
                .append(Cautions.graphCaption(sce, threshold, hint)).append("</p>\n");
    }

    /** How the graph is laid out, in words (HTML). */
    private static String layoutWords(EdgeResult r, ConsensusLayout lay, EdgeMatrix m) {
        if (lay.layerNames() != null) {
            return "One row per tier, the first tier at the top.";
        }
        if (!lay.free()) {
            return "Variables are layered by " + ("order".equals(r.method()) ? "the given order" : "a most probable order")
                    + " (" + esc(lay.describe(m.variables())) + ").";
        }
        return "Each group of joined variables is drawn on its own, placed so that joined variables sit close; "
                + "position says nothing about direction (only arrowheads do).";
    }

    /** The key to the comparison with a known network: each line pattern drawn, with its glyph and its meaning in words. */
    private static void legend(StringBuilder h) {
        h.append("<p class=\"legend cap\">Compared with the known network (the label after each posterior):<br>");
        for (EdgeMark k : new EdgeMark[] {EdgeMark.TRUE, EdgeMark.REVERSED, EdgeMark.EXTRA, EdgeMark.MISSED}) {
            boolean missed = k == EdgeMark.MISSED;
            h.append("<span><svg xmlns=\"http://www.w3.org/2000/svg\" width=\"46\" height=\"12\" aria-hidden=\"true\">")
                    .append("<line x1=\"2\" y1=\"6\" x2=\"44\" y2=\"6\" stroke=\"").append(missed ? Charts.MISSED_INK : Charts.INK)
                    .append("\" stroke-width=\"").append(missed ? "1.5" : "3.5").append('"')
                    .append(k.dash.isEmpty() ? "" : " stroke-dasharray=\"" + k.dash + "\"").append("/></svg><b>")
                    .append(k.glyph).append("</b> ").append(esc(k.words)).append("</span>");
        }
        h.append("</p>\n");
    }

    private static String methodName(EdgeResult r) {
        String m = r.method() == null ? "unknown method" : r.method();
        boolean structure = "structure-modular".equals(r.dagPrior());
        return switch (m) {
            case "order" -> "averaged over the structures consistent with a given order";
            case "exact" -> structure ? "averaged exactly over all DAGs (structure-modular DAG prior)"
                    : "averaged exactly over all orders (order-modular DAG prior)";
            case "mcmc" -> structure ? "averaged over DAGs sampled by partition MCMC (structure-modular DAG prior)"
                    : "averaged over orders sampled by order MCMC (order-modular DAG prior)";
            default -> m;
        };
    }
}
