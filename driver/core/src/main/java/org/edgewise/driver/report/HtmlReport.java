package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.result.EdgeResult;

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
        ConsensusLayout lay = ConsensusLayout.of(m, g, drawn, "order".equals(r.method()) ? r.order() : null);
        StringBuilder h = new StringBuilder(64 * 1024);
        h.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
                .append("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'; img-src data:\">\n")
                .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
                .append("<title>Edgewise report: ").append(esc(resultName)).append("</title>\n<style>\n").append(CSS)
                .append("</style>\n</head>\n<body>\n");
        h.append("<h1>Edge posteriors</h1>\n<p class=\"sub\">Edgewise report of <code>").append(esc(resultName))
                .append("</code> \u2014 ").append(esc(methodName(r))).append(", ").append(m.size()).append(" variables")
                .append(r.store() != null ? ", " + r.store().rows() + " rows" : "").append("</p>\n");
        Cautions.write(h, r, ce, hint);
        summary(h, r, m, shown, rec, threshold);
        ConvergenceSection.write(h, r, run);

        h.append("<h2>Consensus graph</h2>\n<div class=\"fig\">").append(Charts.graph(m, ce, shown, lay, t)).append("</div>\n");
        h.append("<p class=\"cap\">").append(Cautions.graphCaption(ce, threshold, hint)).append(" Variables are layered by ")
                .append("order".equals(r.method()) ? "the given order" : "a most probable order derived from the posteriors")
                .append(" (").append(esc(lay.describe(m.variables()))).append("); hover over an edge for all its posteriors.</p>\n");
        if (t != null) {
            h.append("<p class=\"key cap\"><span><i class=\"sw\" style=\"background:").append(Charts.TRUE_COLOUR)
                    .append("\"></i>in the known network (a line: joined either way)</span><span><i class=\"sw\" style=\"background:")
                    .append(Charts.REVERSED_COLOUR)
                    .append("\"></i>reverse of a known edge</span><span><i class=\"sw\" style=\"background:").append(Charts.EXTRA_COLOUR)
                    .append("\"></i>not in the known network</span><span><i class=\"sw\" style=\"background:").append(Charts.MISSED_COLOUR)
                    .append("\"></i>known edge not drawn (dashed)</span></p>\n");
        }

        h.append("<h2>Edge posterior heatmap</h2>\n<div class=\"fig\">").append(Charts.heatmap(m, t)).append("</div>\n");
        h.append("<p class=\"cap\">Each cell is P(row \u2192 column | data), averaged over structures. "
                + "Cells are pale for unsupported edges and dark for strongly supported ones; a dependence supported "
                + "in both directions shows as two mid-tone cells mirrored across the diagonal.</p>\n");

        PairTable.write(h, m, ce, t, r, hint);
        strongest(h, m, t, r);
        parentSets(h, r);
        ConvergenceSection.traces(h, r);
        sensitivity(h, r, m);
        if (rec != null) {
            recovery(h, rec, truthName);
        }
        features(h, r);
        provenance(h, r, resultName);
        h.append("<p class=\"cap\">Written by Edgewise. This file is self-contained and loads nothing from the network.</p>\n");
        return h.append("</body>\n</html>\n").toString();
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

    private static void summary(StringBuilder h, EdgeResult r, EdgeMatrix m, List<ConsensusEdges.Drawn> shown,
                                EdgeRecovery rec, double threshold) {
        int arrows = 0;
        for (ConsensusEdges.Drawn d : shown) {
            arrows += d.shape() == ConsensusEdges.Shape.ARROW ? 1 : 0;
        }
        h.append("<h2>Summary</h2>\n<table>\n");
        row(h, "method", esc(r.method()));
        row(h, "variables", String.valueOf(m.size()));
        row(h, "estimates", ConvergenceSection.estimates(r));
        if (r.logEvidence() != null) {
            row(h, "log evidence", f(r.logEvidence(), 3) + (r.evidenceConvention() != null ? " (" + esc(r.evidenceConvention()) + ")" : ""));
        }
        if (r.order() != null && !r.order().isEmpty()) {
            row(h, "order", esc(String.join(", ", r.order())));
        }
        row(h, "DAG prior", "order".equals(r.method()) ? "given order (both DAG priors coincide)"
                : r.dagPrior() == null ? "not recorded" : esc(r.dagPrior()));
        row(h, "consensus graph (threshold " + f(threshold, 2) + ")", arrows + " arrow" + (arrows == 1 ? "" : "s") + ", "
                + (shown.size() - arrows) + " line" + (shown.size() - arrows == 1 ? "" : "s"));
        if (rec != null) {
            row(h, "recovery of the known network", "directed AUROC " + fig(rec.directed().auroc()) + ", skeleton AUROC "
                    + fig(rec.skeleton().auroc()) + ", SHD " + rec.consensus().shd());
        }
        h.append("</table>\n");
    }

    private static void strongest(StringBuilder h, EdgeMatrix m, boolean[][] t, EdgeResult r) {
        int n = m.size();
        Map<String, Double> mcse = new TreeMap<>();
        Map<String, Double> rhat = new TreeMap<>();
        for (EdgeResult.Edge e : r.edges()) {
            if (e.mcse() != null) {
                mcse.put(e.from() + "\u0000" + e.to(), e.mcse());
            }
            if (e.rhat() != null) {
                rhat.put(e.from() + "\u0000" + e.to(), e.rhat());
            }
        }
        List<int[]> pairs = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a != b && m.p()[a][b] >= 0.1) {
                    pairs.add(new int[] {a, b});
                }
            }
        }
        pairs.sort(Comparator.comparingDouble((int[] e) -> -m.p()[e[0]][e[1]]).thenComparingInt(e -> e[0]).thenComparingInt(e -> e[1]));
        h.append("<h2>Strongest edges</h2>\n");
        if (pairs.isEmpty()) {
            h.append("<p>No edge has a posterior of 0.1 or more.</p>\n");
            return;
        }
        boolean mc = !mcse.isEmpty();
        h.append("<table>\n<tr><th>from</th><th>to</th><th>P(from \u2192 to)</th><th>P(to \u2192 from)</th><th>P(adjacent)</th>")
                .append(mc ? "<th>MCSE</th><th>R\u0302</th>" : "").append(t != null ? "<th>known network</th>" : "").append("</tr>\n");
        int shown = 0;
        for (int[] e : pairs) {
            if (shown++ == 60) {
                break;
            }
            int a = e[0];
            int b = e[1];
            String key = m.variables().get(a) + "\u0000" + m.variables().get(b);
            h.append("<tr><td>").append(esc(m.variables().get(a))).append("</td><td>").append(esc(m.variables().get(b)))
                    .append("</td><td class=\"num\">").append(f(m.p()[a][b], 3)).append("</td><td class=\"num\">")
                    .append(f(m.p()[b][a], 3)).append("</td><td class=\"num\">").append(f(m.adjacency(a, b), 3)).append("</td>");
            if (mc) {
                h.append("<td class=\"num\">").append(mcse.containsKey(key) ? f(mcse.get(key), 4) : "").append("</td><td class=\"num\">")
                        .append(rhat.containsKey(key) ? f(rhat.get(key), 3) : "").append("</td>");
            }
            if (t != null) {
                h.append("<td>").append(t[a][b] ? "yes" : t[b][a] ? "reversed" : "no").append("</td>");
            }
            h.append("</tr>\n");
        }
        h.append("</table>\n<p class=\"cap\">Edges with a posterior of at least 0.1").append(pairs.size() > 60 ? " (the first 60)" : "")
                .append(". P(adjacent) = P(from \u2192 to) + P(to \u2192 from), the posterior that the two are directly dependent "
                        + "in either direction.")
                .append("order".equals(r.method()) ? "" : " Over unknown orders P(from \u2192 to) counts every network with that "
                        + "arrow, reversible ones included, so it depends on the DAG prior; read directions from the adjacency and "
                        + "direction table.")
                .append("</p>\n");
    }

    private static void parentSets(StringBuilder h, EdgeResult r) {
        if (r.parentSets() == null || r.parentSets().isEmpty()) {
            return;
        }
        h.append("<h2>Most probable parent sets</h2>\n<table>\n<tr><th>variable</th><th>parent set</th><th>posterior</th>")
                .append(r.bestNetwork() != null ? "<th>in the best network</th>" : "").append("</tr>\n");
        for (EdgeResult.VariableParents vp : r.parentSets()) {
            List<EdgeResult.ParentSet> top = vp.top() == null ? List.of() : vp.top();
            int k = Math.min(top.size(), TOP_PARENT_SETS);
            List<String> best = r.bestNetwork() != null && r.bestNetwork().parents() != null
                    ? r.bestNetwork().parents().get(vp.variable()) : null;
            for (int i = 0; i < k; i++) {
                EdgeResult.ParentSet ps = top.get(i);
                h.append("<tr>");
                if (i == 0) {
                    h.append("<td rowspan=\"").append(k).append("\">").append(esc(vp.variable())).append("</td>");
                }
                h.append("<td>").append(ps.parents().isEmpty() ? "<i>none</i>" : esc(String.join(", ", ps.parents())))
                        .append("</td><td class=\"num\">").append(f(ps.posterior(), 3)).append("</td>");
                if (r.bestNetwork() != null) {
                    h.append("<td>").append(best != null && sameSet(best, ps.parents()) ? "\u2713" : "").append("</td>");
                }
                h.append("</tr>\n");
            }
        }
        h.append("</table>\n<p class=\"cap\">Up to five parent sets per variable with their posterior probability of being "
                + "exactly the variable's parents.")
                .append(r.bestNetwork() != null ? " \u2713 marks the set in the single highest-scoring network (log score "
                        + f(r.bestNetwork().logScore(), 3) + ")." : "").append("</p>\n");
    }

    private static boolean sameSet(List<String> a, List<String> b) {
        return a.size() == b.size() && a.containsAll(b);
    }

    private static void sensitivity(StringBuilder h, EdgeResult r, EdgeMatrix main) {
        if (r.sensitivity() == null || r.sensitivity().isEmpty()) {
            return;
        }
        TreeMap<Double, EdgeMatrix> byEss = new TreeMap<>();
        TreeMap<Double, Double> evidence = new TreeMap<>();
        for (EdgeResult.Sensitivity s : r.sensitivity()) {
            byEss.put(s.ess(), EdgeMatrix.of(r.variables(), s.edges(), "sensitivity entry ESS " + num(s.ess())));
            evidence.put(s.ess(), s.logEvidence());
        }
        if (r.settings() != null && r.settings().ess() != null && !byEss.containsKey(r.settings().ess())) {
            byEss.put(r.settings().ess(), main);
            evidence.put(r.settings().ess(), r.logEvidence());
        }
        int n = main.size();
        List<int[]> changed = new ArrayList<>();
        List<Double> spread = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a == b) {
                    continue;
                }
                double lo = 1;
                double hi = 0;
                for (EdgeMatrix em : byEss.values()) {
                    lo = Math.min(lo, em.p()[a][b]);
                    hi = Math.max(hi, em.p()[a][b]);
                }
                if (hi - lo > SENSITIVITY_CHANGE) {
                    changed.add(new int[] {a, b});
                    spread.add(hi - lo);
                }
            }
        }
        h.append("<h2>Sensitivity to the equivalent sample size</h2>\n");
        h.append("<p class=\"cap\">The same store rescored with BDeu at each ESS. BDeu edge posteriors are known to depend on "
                + "the ESS (Silander, Kontkanen &amp; Myllym\u00e4ki 2007); edges listed here change by more than "
                + f(SENSITIVITY_CHANGE, 1) + " across the values tried and deserve caution.</p>\n");
        h.append("<table>\n<tr><th>edge</th>");
        for (double e : byEss.keySet()) {
            h.append("<th>ESS ").append(esc(num(e))).append("</th>");
        }
        h.append("<th>change</th></tr>\n<tr><td><i>log evidence</i></td>");
        for (double e : byEss.keySet()) {
            Double v = evidence.get(e);
            h.append("<td class=\"num\">").append(v == null ? "" : f(v, 2)).append("</td>");
        }
        h.append("<td></td></tr>\n");
        Integer[] idx = new Integer[changed.size()];
        for (int i = 0; i < idx.length; i++) {
            idx[i] = i;
        }
        java.util.Arrays.sort(idx, Comparator.comparingDouble(i -> -spread.get(i)));
        int shown = 0;
        for (int i : idx) {
            if (shown++ == MAX_SENSITIVE_ROWS) {
                break;
            }
            int a = changed.get(i)[0];
            int b = changed.get(i)[1];
            h.append("<tr><td>").append(esc(main.variables().get(a) + " \u2192 " + main.variables().get(b))).append("</td>");
            for (EdgeMatrix em : byEss.values()) {
                h.append("<td class=\"num\" style=\"background:").append(Charts.colour(em.p()[a][b])).append(";color:")
                        .append(em.p()[a][b] > 0.55 ? "#fff" : "#1f2d3d").append("\">").append(f(em.p()[a][b], 3)).append("</td>");
            }
            h.append("<td class=\"num\">").append(f(spread.get(i), 3)).append("</td></tr>\n");
        }
        h.append("</table>\n");
        if (changed.size() > MAX_SENSITIVE_ROWS) {
            h.append("<p class=\"cap\">").append(changed.size()).append(" edges change; the ").append(MAX_SENSITIVE_ROWS)
                    .append(" that change most are shown.</p>\n");
        }
        if (changed.isEmpty()) {
            h.append("<p>No edge posterior changes by more than ").append(f(SENSITIVITY_CHANGE, 1))
                    .append(" across these ESS values.</p>\n");
        }
    }

    private static void recovery(StringBuilder h, EdgeRecovery rec, String truthName) {
        h.append("<h2>Recovery of the known network</h2>\n<p class=\"cap\">Compared with <code>").append(esc(truthName))
                .append("</code> (").append(rec.trueEdges()).append(" edges). This is only possible for data simulated from a known "
                        + "network; it measures the method, not the world.</p>\n");
        h.append("<table>\n<tr><th></th><th>AUROC</th><th>average precision</th><th>positives</th><th>negatives</th></tr>\n");
        rankRow(h, "directed edges (ordered pairs, scored by P(a \u2192 b))", rec.directed());
        rankRow(h, "skeleton (unordered pairs, scored by P(adjacent))", rec.skeleton());
        h.append("</table>\n");
        EdgeRecovery.Consensus c = rec.consensus();
        h.append("<table>\n");
        row(h, "consensus edges (posterior &gt; " + f(rec.threshold(), 2) + ")", String.valueOf(c.edges()));
        row(h, "correctly directed", String.valueOf(c.correct()));
        row(h, "precision / recall", fig(c.precision()) + " / " + fig(c.recall()));
        row(h, "skeleton precision / recall", fig(c.skeletonPrecision()) + " / " + fig(c.skeletonRecall()));
        row(h, "structural Hamming distance", c.shd() + " = " + c.missing().size() + " missing + " + c.extra().size()
                + " extra + " + c.reversed().size() + " reversed");
        if (!c.missing().isEmpty()) {
            row(h, "missing", esc(String.join(", ", c.missing())));
        }
        if (!c.extra().isEmpty()) {
            row(h, "extra", esc(String.join(", ", c.extra())));
        }
        if (!c.reversed().isEmpty()) {
            row(h, "reversed (true direction shown)", esc(String.join(", ", c.reversed())));
        }
        if (!rec.truthOnly().isEmpty()) {
            row(h, "known variables not in the result", esc(String.join(", ", rec.truthOnly())));
        }
        h.append("</table>\n<p class=\"cap\">AUROC: the probability that a randomly chosen true edge gets a higher posterior than a "
                + "randomly chosen non-edge (ties count half; 0.5 is chance, 1 is perfect). Average precision: the mean precision "
                + "over the ranks at which true edges are found. SHD counts each missing, extra or reversed edge of the consensus "
                + "graph once. Reversed edges are expected where the direction is not identifiable.</p>\n");
    }

    private static void features(StringBuilder h, EdgeResult r) {
        if (r.features() == null || r.features().isEmpty()) {
            return;
        }
        List<EdgeResult.Feature> fs = new ArrayList<>(r.features());
        fs.sort(Comparator.comparingDouble((EdgeResult.Feature x) -> -x.posterior()));
        h.append("<h2>Other features</h2>\n<table>\n<tr><th>kind</th><th>from</th><th>to</th><th>posterior</th></tr>\n");
        for (EdgeResult.Feature x : fs.subList(0, Math.min(30, fs.size()))) {
            h.append("<tr><td>").append(esc(x.kind())).append("</td><td>").append(esc(x.from())).append("</td><td>")
                    .append(esc(x.to())).append("</td><td class=\"num\">").append(f(x.posterior(), 3)).append("</td></tr>\n");
        }
        h.append("</table>\n<p class=\"cap\">The strongest features beyond single edges (up to 30): <i>ancestor</i> is the posterior "
                + "that a directed path leads from one variable to the other; <i>markov-blanket</i> that one is in the other's "
                + "Markov blanket.</p>\n");
    }

    private static void provenance(StringBuilder h, EdgeResult r, String resultName) {
        h.append("<h2>Provenance</h2>\n<table>\n");
        row(h, "result file", esc(resultName));
        EdgeResult.Provenance p = r.store();
        if (p != null) {
            row(h, "score store", esc(p.path()));
            row(h, "input", p.input() == null ? "" : esc(String.join(", ", p.input())));
            row(h, "rows", String.valueOf(p.rows()));
            row(h, "data fingerprint", esc(p.fingerprint()));
            row(h, "store written", esc(p.createdAt()));
            row(h, "stored score", esc(p.storedScore()) + ", ESS " + esc(num(p.storedEss())));
        }
        EdgeResult.Settings s = r.settings();
        if (s != null) {
            row(h, "score used", esc(s.score()) + (s.ess() == null ? " (no ESS)" : ", ESS " + esc(num(s.ess()))));
            row(h, "structure prior", esc(s.prior()));
            row(h, "maximum parents (d)", String.valueOf(s.maxParents()));
            if (s.forbid() != null && !s.forbid().isEmpty()) {
                row(h, "forbidden edges", esc(String.join(", ", s.forbid())));
            }
            if (s.require() != null && !s.require().isEmpty()) {
                row(h, "required edges", esc(String.join(", ", s.require())));
            }
            if (s.tiers() != null && !s.tiers().isEmpty()) {
                List<String> tiers = new ArrayList<>();
                for (List<String> tier : s.tiers()) {
                    tiers.add(String.join(", ", tier));
                }
                row(h, "tiers", esc(String.join(" ; ", tiers)));
            }
        }
        row(h, "DAG prior", "order".equals(r.method()) ? "given order (both DAG priors coincide)"
                : r.dagPrior() == null ? "not recorded" : esc(r.dagPrior()));
        if (r.evidenceConvention() != null) {
            row(h, "evidence convention", esc(r.evidenceConvention()));
        }
        h.append("</table>\n");
    }

    private static void rankRow(StringBuilder h, String name, EdgeRecovery.Ranking k) {
        h.append("<tr><td>").append(name).append("</td><td class=\"num\">").append(fig(k.auroc())).append("</td><td class=\"num\">")
                .append(fig(k.averagePrecision())).append("</td><td class=\"num\">").append(k.positives())
                .append("</td><td class=\"num\">").append(k.negatives()).append("</td></tr>\n");
    }

    /** A table row; {@code valueHtml} must already be escaped. */
    private static void row(StringBuilder h, String keyHtml, String valueHtml) {
        h.append("<tr><th>").append(keyHtml).append("</th><td>").append(valueHtml == null ? "" : valueHtml).append("</td></tr>\n");
    }

    static String fig(Double v) {
        return v == null ? "n/a" : f(v, 3);
    }

    static String num(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? String.valueOf((long) v) : String.valueOf(v);
    }
}
