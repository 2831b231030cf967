package org.edgewise.driver.report;

import java.util.Locale;
import org.edgewise.driver.result.EdgeResult;

/**
 * The consensus graph in the DOT language (graphviz.org/doc/info/lang.html): every identifier a
 * double-quoted string with backslash and quote escaped and line breaks as {@code \n}; each edge
 * labelled with its posterior and drawn with {@code penwidth} 1 + 5p.
 */
public final class DotWriter {
    private DotWriter() {
    }

    /** A DOT quoted-string identifier. */
    public static String id(String s) {
        StringBuilder sb = new StringBuilder("\"");
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '"' -> sb.append("\\\"");
                case '\\' -> sb.append("\\\\");
                case '\n' -> sb.append("\\n");
                case '\r' -> { }
                default -> sb.append(c);
            }
        }
        return sb.append('"').toString();
    }

    /**
     * The consensus graph of {@code r} at {@code threshold} by the rules of {@link ConsensusEdges}:
     * arrows for compelled directions (or the given order's), {@code dir=none} lines for adjacent
     * pairs whose direction is reversible or not assessed; arrows for pairs whose direction the tiers
     * fix. With {@code truth}: a glyph after the posterior and a line style ({@link EdgeMark}): solid
     * ✓ in the known network, solid ⇄ reversed, dotted ✗ not in it.
     */
    public static String write(EdgeResult r, double threshold, boolean[][] truth) {
        return write(r, threshold, truth, AssessHint.API);
    }

    /** As {@link #write(EdgeResult, double, boolean[][])}, naming how to get essential-graph features as {@code hint}. */
    public static String write(EdgeResult r, double threshold, boolean[][] truth, AssessHint hint) {
        EdgeMatrix m = EdgeMatrix.of(r);
        ConsensusEdges ce = ConsensusEdges.of(r, m);
        StringBuilder sb = new StringBuilder();
        sb.append("// Edgewise consensus graph (threshold ").append(threshold).append("). ")
                .append(ce.givenOrder() ? "Arrows: edges with posterior above the threshold, directed by the given order (an assumption)."
                        : ce.assessed() ? "Arrows: compelled directions with posterior above the threshold; lines (dir=none): "
                        + "adjacent pairs whose direction is mostly reversible."
                        : "Lines (dir=none): adjacent pairs, P(a->b) + P(b->a) above the threshold; directions not assessed "
                        + "(run " + hint.text() + ").")
                .append("\n// DAG prior: ").append(ce.givenOrder() ? "given order (both DAG priors coincide)"
                        : r.dagPrior() == null ? "not recorded" : r.dagPrior())
                .append(". An edge posterior is evidence of statistical dependence under stated assumptions, not proof of causation.\n")
                .append(truth == null ? "" : "// Against the known network (glyph after the posterior, line style): \u2713 solid in it, "
                        + "\u21c4 solid the other way round, \u2717 dotted not in it.\n");
        sb.append("digraph consensus {\n  node [shape=box, style=rounded];\n");
        for (String v : m.variables()) {
            sb.append("  ").append(id(v)).append(";\n");
        }
        for (ConsensusEdges.Drawn d : ce.drawn(threshold)) {
            int a = d.from();
            int b = d.to();
            boolean arrow = d.shape() == ConsensusEdges.Shape.ARROW;
            sb.append("  ").append(id(m.variables().get(a))).append(" -> ").append(id(m.variables().get(b)))
                    .append(String.format(Locale.ROOT, " [label=\"%.2f%s%s\", penwidth=%.2f", d.p(),
                            d.byTiers() ? " fixed by the tiers" : "",
                            truth == null ? "" : " " + EdgeMark.of(truth, a, b, arrow).glyph, 1 + 5 * d.p()));
            if (!arrow) {
                sb.append(", dir=none");
            }
            if (!ce.givenOrder()) {
                sb.append(", tooltip=").append(id(ce.describe(d.pair())));
            }
            if (truth != null) {
                sb.append(", style=").append(EdgeMark.of(truth, a, b, arrow).dotStyle());
            }
            sb.append("];\n");
        }
        return sb.append("}\n").toString();
    }
}
