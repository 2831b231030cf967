package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.c;
import static org.edgewise.driver.report.Html.esc;

import java.util.List;
import java.util.Locale;

/**
 * The report's inline SVG figures. Each method returns one well-formed {@code <svg>} element
 * (XML: numeric character references only, every name escaped by {@link Html#esc}).
 */
public final class Charts {
    /** ColorBrewer "Blues" (9 classes; Brewer, colorbrewer2.org), interpolated linearly. */
    private static final int[] BLUES = {0xf7fbff, 0xdeebf7, 0xc6dbef, 0x9ecae1, 0x6baed6, 0x4292c6, 0x2171b5,
        0x08519c, 0x08306b};
    /** Distinct line colours for chains (the "Tableau 10" set, common practice). */
    private static final String[] CHAIN = {"#4e79a7", "#f28e2b", "#e15759", "#76b7b2", "#59a14f", "#edc948",
        "#b07aa1", "#ff9da7", "#9c755f", "#bab0ac"};

    private Charts() {
    }

    /** The colour of posterior p in [0, 1] on the Blues scale, as #rrggbb. */
    public static String colour(double p) {
        double x = Math.max(0, Math.min(1, p)) * (BLUES.length - 1);
        int i = Math.min((int) Math.floor(x), BLUES.length - 2);
        double t = x - i;
        int a = BLUES[i];
        int b = BLUES[i + 1];
        int r = (int) Math.round(((a >> 16) & 255) * (1 - t) + ((b >> 16) & 255) * t);
        int g = (int) Math.round(((a >> 8) & 255) * (1 - t) + ((b >> 8) & 255) * t);
        int bl = (int) Math.round((a & 255) * (1 - t) + (b & 255) * t);
        return String.format(Locale.ROOT, "#%02x%02x%02x", r, g, bl);
    }

    /**
     * Heatmap of P(row → column): rows are parents ("from"), columns children ("to"). With
     * {@code truth} non-null, cells of true edges get a green outline. A colour legend on the right.
     */
    public static String heatmap(EdgeMatrix m, boolean[][] truth) {
        int n = m.size();
        double cell = n <= 16 ? 32 : Math.max(9, 520.0 / n);
        int maxLen = 0;
        for (String v : m.variables()) {
            maxLen = Math.max(maxLen, Html.shorten(v, 24).length());
        }
        double label = 7.2 * maxLen + 12;
        double top = label * 0.72 + 14;
        // names left and above, the legend right, the key below
        Frame f = new Frame(label + n * cell + 110, top + n * cell + 40, label, 110, top, 40);
        double left = f.left();
        boolean values = cell >= 24;
        StringBuilder s = f.open("heatmap", 12);
        s.append("<title>Edge posterior heatmap: row = parent (from), column = child (to)</title>\n");
        s.append("<defs><linearGradient id=\"hm-scale\" x1=\"0\" y1=\"1\" x2=\"0\" y2=\"0\">");
        for (int i = 0; i < BLUES.length; i++) {
            s.append(String.format(Locale.ROOT, "<stop offset=\"%.3f\" stop-color=\"#%06x\"/>", i / (double) (BLUES.length - 1), BLUES[i]));
        }
        s.append("</linearGradient></defs>\n");
        for (int i = 0; i < n; i++) {
            String name = esc(Html.shorten(m.variables().get(i), 24));
            double y = top + i * cell + cell / 2 + 4;
            s.append("<text x=\"").append(c(left - 6)).append("\" y=\"").append(c(y))
                    .append("\" text-anchor=\"end\">").append(name).append("</text>\n");
            double x = left + i * cell + cell / 2;
            s.append("<text transform=\"translate(").append(c(x + 4)).append(',').append(c(top - 6))
                    .append(") rotate(-45)\">").append(name).append("</text>\n");
        }
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                double x = left + b * cell;
                double y = top + a * cell;
                if (a == b) {
                    s.append("<rect x=\"").append(c(x)).append("\" y=\"").append(c(y)).append("\" width=\"").append(c(cell))
                            .append("\" height=\"").append(c(cell)).append("\" fill=\"#e6e6e6\"/>\n");
                    continue;
                }
                double p = m.p()[a][b];
                s.append("<rect x=\"").append(c(x)).append("\" y=\"").append(c(y)).append("\" width=\"").append(c(cell))
                        .append("\" height=\"").append(c(cell)).append("\" fill=\"").append(colour(p))
                        .append("\" stroke=\"#ffffff\" stroke-width=\"0.5\"><title>")
                        .append(esc(m.variables().get(a) + " \u2192 " + m.variables().get(b) + ": " + Html.f(p, 3)))
                        .append(truth != null && truth[a][b] ? " (true edge)" : "").append("</title></rect>\n");
                if (truth != null && truth[a][b]) {
                    s.append("<rect x=\"").append(c(x + 2)).append("\" y=\"").append(c(y + 2)).append("\" width=\"")
                            .append(c(cell - 4)).append("\" height=\"").append(c(cell - 4))
                            .append("\" fill=\"none\" stroke=\"#000000\" stroke-width=\"2\" stroke-dasharray=\"3,2\"/>\n");
                }
                if (values && p >= 0.005) {
                    s.append("<text x=\"").append(c(x + cell / 2)).append("\" y=\"").append(c(y + cell / 2 + 4))
                            .append("\" text-anchor=\"middle\" font-size=\"10\" fill=\"").append(p > 0.55 ? "#ffffff" : "#1f2d3d")
                            .append("\">").append(esc(Html.prob(p))).append("</text>\n");
                }
            }
        }
        double lx = left + n * cell + 24;
        double lh = Math.max(100, n * cell);
        s.append("<rect x=\"").append(c(lx)).append("\" y=\"").append(c(top)).append("\" width=\"16\" height=\"")
                .append(c(lh)).append("\" fill=\"url(#hm-scale)\" stroke=\"#999999\" stroke-width=\"0.5\"/>\n");
        for (int i = 0; i <= 4; i++) {
            double y = top + lh * (1 - i / 4.0);
            s.append("<line x1=\"").append(c(lx + 16)).append("\" x2=\"").append(c(lx + 20)).append("\" y1=\"").append(c(y))
                    .append("\" y2=\"").append(c(y)).append("\" stroke=\"#555555\"/>");
            s.append("<text x=\"").append(c(lx + 23)).append("\" y=\"").append(c(y + 4)).append("\">")
                    .append(Html.f(i / 4.0, 2)).append("</text>\n");
        }
        s.append("<text x=\"").append(c(lx)).append("\" y=\"").append(c(top - 16)).append("\">posterior</text>\n");
        s.append("<text x=\"").append(c(left)).append("\" y=\"").append(c(top + n * cell + 24))
                .append("\" fill=\"#444444\">row = from (parent), column = to (child)")
                .append(truth != null ? "; dashed black outline = edge of the known network" : "").append("</text>\n");
        return s.append("</svg>").toString();
    }

    /** The ink of every edge and label of the consensus graph (the known network is told by patterns and glyphs). */
    static final String INK = "#2c3e50";
    /** The ink of a known edge the figure does not support. */
    static final String MISSED_INK = "#7a7a7a";

    /**
     * The consensus graph: the pairs {@link ConsensusEdges#drawn} gives — arrows (compelled
     * directions, directions fixed by the tiers, or the given order's) and undirected lines
     * (adjacent, direction reversible or not assessed) — stroke width 1 + 5p, an arrowhead that
     * grows with the stroke, and a label p set beside the line, laid out by {@link ConsensusLayout}.
     * With {@code truth}, each drawn edge carries an {@link EdgeMark} (line pattern and glyph) and the
     * known edges of pairs not drawn are thin long dashes.
     */
    /** The consensus graph shrinks to the page's width down to this share of its size, and scrolls beyond. */
    static final double MIN_SCALE = 0.8;

    public static String graph(EdgeMatrix m, ConsensusEdges ce, List<ConsensusEdges.Drawn> drawn, ConsensusLayout lay,
                               boolean[][] truth) {
        return graph(m, ce, drawn, lay, truth, java.util.Set.of());
    }

    /** As above, the boxes of the variables named in {@code emphasis} drawn heavier and tinted (the variables asked about). */
    static String graph(EdgeMatrix m, ConsensusEdges ce, List<ConsensusEdges.Drawn> drawn, ConsensusLayout lay,
                        boolean[][] truth, java.util.Set<String> emphasis) {
        int n = m.size();
        double boxH = ConsensusLayout.BOX_H;
        StringBuilder s = Frame.of(lay.width(), lay.height()).open("graph", 12);
        // the figure shrinks to the page's width rather than run off it, but not below four fifths of its
        // size (labels stay readable): a wider one scrolls sideways in its box
        int at = s.indexOf("role=\"img\"");
        s.insert(at, "style=\"max-width:100%;height:auto;min-width:" + c(MIN_SCALE * lay.width()) + "px\" ");
        s.append("<title>Consensus graph</title>\n<defs>");
        StringBuilder defs = s;
        int[] order = lay.order();
        int[] pos = new int[n];
        for (int i = 0; i < n; i++) {
            pos[order[i]] = i;
        }
        boolean[][] pairDrawn = new boolean[n][n];
        for (ConsensusEdges.Drawn d : drawn) {
            pairDrawn[d.from()][d.to()] = true;
            pairDrawn[d.to()][d.from()] = true;
        }
        StringBuilder body = new StringBuilder();
        StringBuilder labels = new StringBuilder();
        int markers = 0;
        // what a label must not cover: every box, then every label placed before it
        List<double[]> taken = new java.util.ArrayList<>();
        for (int v = 0; v < n; v++) {
            taken.add(new double[] {lay.x(v) - lay.boxW(v) / 2, lay.y(v) - boxH / 2, lay.x(v) + lay.boxW(v) / 2, lay.y(v) + boxH / 2});
        }
        for (ConsensusEdges.Drawn d : drawn) {
            int a = d.from();
            int b = d.to();
            boolean arrow = d.shape() == ConsensusEdges.Shape.ARROW;
            EdgeMark mark = EdgeMark.of(truth, a, b, arrow);
            String title = arrow && ce.givenOrder()
                    ? m.variables().get(a) + " \u2192 " + m.variables().get(b) + ": posterior " + Html.f(d.p(), 3)
                            + " (direction from the given order)"
                    : ce.describe(d.pair()) + (d.byTiers() ? " (direction fixed by the tiers)" : "");
            double width = 1 + 5 * d.p();
            String marker = arrow ? marker(defs, markers++, width, INK) : null;
            String label = Html.prob(d.p()) + (d.byTiers() ? " fixed by the tiers" : "")
                    + (mark.glyph.isEmpty() ? "" : " " + mark.glyph);
            path(body, labels, taken, lay, a, b, INK, width, mark.dash, marker, title, label);
        }
        if (truth != null) {
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (truth[a][b] && !pairDrawn[a][b]) {
                        String marker = marker(defs, markers++, 1.2, MISSED_INK);
                        path(body, labels, taken, lay, a, b, MISSED_INK, 1.2, EdgeMark.MISSED.dash, marker, m.variables().get(a) + " \u2192 "
                                + m.variables().get(b) + ": edge of the known network, not drawn (P(adjacent) "
                                + Html.f(ce.pair(a, b).adjacent(), 3) + ")", EdgeMark.MISSED.glyph);
                    }
                }
            }
        }
        s.append("</defs>\n").append(body).append(labels);
        if (lay.layerNames() != null) {
            for (int l = 0; l < lay.layerNames().size(); l++) {
                double y = ConsensusLayout.MARGIN + l * ConsensusLayout.LAYER + boxH / 2 + 14;
                s.append("<text x=\"6\" y=\"").append(c(y)).append("\" fill=\"#5a6b7d\" font-style=\"italic\">")
                        .append(esc(lay.layerNames().get(l))).append("</text>\n");
            }
        }
        if (!Double.isNaN(lay.aloneY())) {
            s.append("<text x=\"").append(c(ConsensusLayout.MARGIN)).append("\" y=\"").append(c(lay.aloneY() + 12))
                    .append("\" fill=\"#5a6b7d\" font-style=\"italic\">Joined to no other variable above the threshold:</text>\n");
        }
        for (int v = 0; v < n; v++) {
            String name = m.variables().get(v);
            double x = lay.x(v);
            double y = lay.y(v);
            s.append("<g><title>").append(esc(name)).append(lay.free() ? "" : " (position " + (pos[v] + 1) + " in the order)")
                    .append("</title>")
                    .append("<rect x=\"").append(c(x - lay.boxW(v) / 2)).append("\" y=\"").append(c(y - boxH / 2))
                    .append("\" width=\"").append(c(lay.boxW(v))).append("\" height=\"").append(c(boxH))
                    .append(emphasis.contains(name) ? "\" rx=\"8\" fill=\"#fdebc8\" stroke=\"#1f2d3d\" stroke-width=\"3\"/>"
                            : "\" rx=\"8\" fill=\"#f4f7fb\" stroke=\"#34495e\" stroke-width=\"1.2\"/>")
                    .append("<text x=\"").append(c(x)).append("\" y=\"").append(c(y + 4))
                    .append(emphasis.contains(name) ? "\" font-weight=\"bold" : "")
                    .append("\" text-anchor=\"middle\">").append(esc(Html.shorten(name, 20))).append("</text></g>\n");
        }
        return s.append("</svg>").toString();
    }

    /**
     * An arrowhead for a stroke of {@code width}, defined in {@code defs} as marker {@code k}: in user
     * space, 9 + 2.6 × width long, so it stays larger than the line it ends (a marker scaled by the
     * stroke alone is too small on thin lines and huge on thick ones). Returns its id.
     */
    private static String marker(StringBuilder defs, int k, double width, String ink) {
        double size = 9 + 2.6 * width;
        String id = "head-" + k;
        defs.append("<marker id=\"").append(id).append("\" viewBox=\"0 0 10 10\" refX=\"9\" refY=\"5\" ")
                .append("markerUnits=\"userSpaceOnUse\" markerWidth=\"").append(c(size)).append("\" markerHeight=\"")
                .append(c(size)).append("\" orient=\"auto\"><path d=\"M0,0 L10,5 L0,10 z\" fill=\"").append(ink)
                .append("\"/></marker>");
        return id;
    }

    /** Where the segment from the centre of a box at (x, y) towards (tx, ty) leaves the box (plus a gap of 2). */
    private static double[] border(double x, double y, double w, double tx, double ty) {
        double dx = tx - x;
        double dy = ty - y;
        double hw = w / 2 + 2;
        double hh = ConsensusLayout.BOX_H / 2 + 2;
        double t = Math.min(dx == 0 ? Double.POSITIVE_INFINITY : hw / Math.abs(dx), dy == 0 ? Double.POSITIVE_INFINITY : hh / Math.abs(dy));
        return new double[] {x + dx * Math.min(1, t), y + dy * Math.min(1, t)};
    }

    /**
     * One edge's path (with the arrowhead {@code marker} when it is non-null) and its label, set beside
     * the path rather than on it: perpendicular to a straight edge, to the right of a vertical one.
     */
    private static void path(StringBuilder s, StringBuilder labels, List<double[]> taken, ConsensusLayout lay, int a, int b,
                             String col, double width, String dash, String marker, String title, String label) {
        double boxW = ConsensusLayout.BOX_W;
        double boxH = ConsensusLayout.BOX_H;
        StringBuilder d = new StringBuilder();
        double lx;
        double ly;
        String anchor = "start";
        double[][] pts = lay.free() ? null : lay.route(a, b);
        if (lay.free()) { // straight, from box border to box border, the label off its middle
            double[] p = border(lay.x(a), lay.y(a), lay.boxW(a), lay.x(b), lay.y(b));
            double[] q = border(lay.x(b), lay.y(b), lay.boxW(b), lay.x(a), lay.y(a));
            d.append('M').append(c(p[0])).append(',').append(c(p[1])).append(" L").append(c(q[0])).append(',').append(c(q[1]));
            double dx = q[0] - p[0];
            double dy = q[1] - p[1];
            double len = Math.max(1e-9, Math.hypot(dx, dy));
            double nx = -dy / len;
            double ny = dx / len;
            if (ny > 0 || ny == 0 && nx < 0) { // the normal that points up (or right)
                nx = -nx;
                ny = -ny;
            }
            double off = width / 2 + 5;
            // the side above the line first, then below; no room on either side (a crowded knot): no
            // label, the edge's tooltip still gives every posterior
            lx = Double.NaN;
            ly = Double.NaN;
            double tw = label == null ? 0 : 6.3 * label.length();
            for (int side = 1; side >= -1 && label != null; side -= 2) {
                double cx = (p[0] + q[0]) / 2 + side * nx * off;
                double cy = (p[1] + q[1]) / 2 + side * ny * off - 2;
                String an = Math.abs(nx) < 0.35 ? "middle" : side * nx > 0 ? "start" : "end";
                double x0 = an.equals("start") ? cx : an.equals("end") ? cx - tw : cx - tw / 2;
                double[] box = {x0, cy - 7, x0 + tw, cy + 7};
                if (taken.stream().noneMatch(t -> t[0] < box[2] && box[0] < t[2] && t[1] < box[3] && box[1] < t[3])) {
                    taken.add(box);
                    lx = cx;
                    ly = cy;
                    anchor = an;
                    break;
                }
            }
            if (Double.isNaN(lx)) {
                label = null;
            }
        } else if (pts != null) { // downward: vertical S-curves through the virtual slots
            d.append('M').append(c(pts[0][0])).append(',').append(c(pts[0][1]));
            for (int i = 0; i + 1 < pts.length; i++) {
                double k = (pts[i + 1][1] - pts[i][1]) / 2;
                d.append(" C").append(c(pts[i][0])).append(',').append(c(pts[i][1] + k)).append(' ')
                        .append(c(pts[i + 1][0])).append(',').append(c(pts[i + 1][1] - k)).append(' ')
                        .append(c(pts[i + 1][0])).append(',').append(c(pts[i + 1][1]));
            }
            int mid = (pts.length - 1) / 2;
            lx = (pts.length % 2 == 1 ? pts[mid][0] : (pts[mid][0] + pts[mid + 1][0]) / 2) + width / 2 + 5;
            ly = pts.length % 2 == 1 ? pts[mid][1] : (pts[mid][1] + pts[mid + 1][1]) / 2;
        } else if (lay.layer(a) == lay.layer(b)) { // same layer (kept out of the layering): arc below
            double x1 = lay.x(a);
            double x2 = lay.x(b);
            double y1 = lay.y(a) + boxH / 2;
            d.append('M').append(c(x1)).append(',').append(c(y1)).append(" Q").append(c((x1 + x2) / 2)).append(',')
                    .append(c(y1 + 48)).append(' ').append(c(x2)).append(',').append(c(y1));
            lx = (x1 + x2) / 2;
            ly = y1 + 24 + width / 2 + 12;
            anchor = "middle";
        } else { // against the layering (a cycle): arc out to the right
            double x1 = lay.x(a) + boxW / 2;
            double x2 = lay.x(b) + boxW / 2 + 1;
            double cx = Math.max(x1, x2) + 60;
            double cy = (lay.y(a) + lay.y(b)) / 2;
            d.append('M').append(c(x1)).append(',').append(c(lay.y(a))).append(" Q").append(c(cx)).append(',')
                    .append(c(cy)).append(' ').append(c(x2)).append(',').append(c(lay.y(b)));
            lx = 0.25 * x1 + 0.5 * cx + 0.25 * x2 + width / 2 + 5;
            ly = cy;
        }
        s.append("<path class=\"").append(marker != null && !col.equals(MISSED_INK) ? "arrow" : marker != null ? "known" : "line")
                .append("\" d=\"").append(d)
                .append("\" fill=\"none\" stroke=\"").append(col).append("\" stroke-width=\"").append(c(width)).append('"')
                .append(dash.isEmpty() ? "" : " stroke-dasharray=\"" + dash + "\"");
        if (marker != null) {
            s.append(" marker-end=\"url(#").append(marker).append(")\"");
        }
        s.append("><title>").append(esc(title)).append("</title></path>\n");
        if (label != null && !label.isEmpty()) {
            labels.append("<text x=\"").append(c(lx)).append("\" y=\"").append(c(ly + 4))
                    .append("\" text-anchor=\"").append(anchor).append("\" font-size=\"11\" fill=\"").append(col)
                    .append("\" stroke=\"#ffffff\" stroke-width=\"3\" paint-order=\"stroke\">")
                    .append(esc(label)).append("</text>\n");
        }
    }

    /** Trace plot: the log-score trace of each chain (what it holds depends on the sampler) against the trace sample index. */
    public static String traces(List<List<Double>> traces, int thin) {
        Frame f = new Frame(760, 260, 80, 110, 14, 40); // the chains' key in the right margin
        double left = f.left();
        double top = f.top();
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        int len = 1;
        for (List<Double> t : traces) {
            len = Math.max(len, t.size());
            for (Double v : t) {
                if (v != null && Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
        }
        if (!(lo <= hi)) {
            lo = 0;
            hi = 1;
        }
        if (hi - lo < 1e-9) {
            lo -= 1;
            hi += 1;
        }
        double pw = f.plotWidth();
        double ph = f.plotHeight();
        StringBuilder s = f.open("trace", 11).append("<title>Log evidence per chain</title>\n");
        s.append("<rect x=\"").append(c(left)).append("\" y=\"").append(c(top)).append("\" width=\"").append(c(pw))
                .append("\" height=\"").append(c(ph)).append("\" fill=\"#fbfbfb\" stroke=\"#999999\"/>\n");
        for (int i = 0; i <= 4; i++) {
            double v = lo + (hi - lo) * i / 4;
            double yy = top + ph * (1 - i / 4.0);
            s.append("<line x1=\"").append(c(left - 4)).append("\" x2=\"").append(c(left)).append("\" y1=\"").append(c(yy))
                    .append("\" y2=\"").append(c(yy)).append("\" stroke=\"#555555\"/><text x=\"").append(c(left - 6))
                    .append("\" y=\"").append(c(yy + 4)).append("\" text-anchor=\"end\">").append(Html.f(v, 1)).append("</text>\n");
        }
        for (int i = 0; i <= 4; i++) {
            double xx = left + pw * i / 4.0;
            long step = Math.round((len - 1) * i / 4.0) * Math.max(thin, 1);
            s.append("<line x1=\"").append(c(xx)).append("\" x2=\"").append(c(xx)).append("\" y1=\"").append(c(top + ph))
                    .append("\" y2=\"").append(c(top + ph + 4)).append("\" stroke=\"#555555\"/><text x=\"").append(c(xx))
                    .append("\" y=\"").append(c(top + ph + 16)).append("\" text-anchor=\"middle\">").append(step).append("</text>\n");
        }
        s.append("<text x=\"").append(c(left + pw / 2)).append("\" y=\"").append(c(f.height() - 6))
                .append("\" text-anchor=\"middle\">step (trace kept every ").append(Math.max(thin, 1)).append(" steps)</text>\n");
        s.append("<text transform=\"translate(14,").append(c(top + ph / 2)).append(") rotate(-90)\" text-anchor=\"middle\">log evidence of the order</text>\n");
        for (int k = 0; k < traces.size(); k++) {
            List<Double> t = traces.get(k);
            String col = CHAIN[k % CHAIN.length];
            double key = f.width() - f.right();
            StringBuilder pts = new StringBuilder();
            for (int i = 0; i < t.size(); i++) {
                Double v = t.get(i);
                if (v == null || !Double.isFinite(v)) {
                    continue;
                }
                double xx = left + (len == 1 ? 0 : pw * i / (len - 1.0));
                double yy = top + ph * (1 - (v - lo) / (hi - lo));
                pts.append(c(xx)).append(',').append(c(yy)).append(' ');
            }
            s.append("<polyline fill=\"none\" stroke=\"").append(col).append("\" stroke-width=\"1.2\" points=\"")
                    .append(pts.toString().trim()).append("\"/>\n");
            s.append("<line x1=\"").append(c(key + 12)).append("\" x2=\"").append(c(key + 32)).append("\" y1=\"")
                    .append(c(top + 10 + 16 * k)).append("\" y2=\"").append(c(top + 10 + 16 * k)).append("\" stroke=\"")
                    .append(col).append("\" stroke-width=\"2\"/><text x=\"").append(c(key + 36)).append("\" y=\"")
                    .append(c(top + 14 + 16 * k)).append("\">chain ").append(k + 1).append("</text>\n");
        }
        return s.append("</svg>").toString();
    }
}
