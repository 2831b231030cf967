package org.edgewise.driver.report;

import java.util.Locale;

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

    public static String write(EdgeMatrix m, double threshold, boolean[][] truth) {
        boolean[][] g = m.consensus(threshold);
        StringBuilder sb = new StringBuilder();
        sb.append("// Edgewise consensus graph: edges with posterior > ").append(threshold)
                .append(". An edge posterior is evidence of statistical dependence, not proof of causation.\n");
        sb.append("digraph consensus {\n  node [shape=box, style=rounded];\n");
        for (String v : m.variables()) {
            sb.append("  ").append(id(v)).append(";\n");
        }
        for (int a = 0; a < m.size(); a++) {
            for (int b = 0; b < m.size(); b++) {
                if (g[a][b]) {
                    double p = m.p()[a][b];
                    sb.append("  ").append(id(m.variables().get(a))).append(" -> ").append(id(m.variables().get(b)))
                            .append(String.format(Locale.ROOT, " [label=\"%.2f\", penwidth=%.2f", p, 1 + 5 * p));
                    if (truth != null) {
                        sb.append(", color=\"").append(truth[a][b] ? Charts.TRUE_COLOUR : truth[b][a] ? Charts.REVERSED_COLOUR
                                : Charts.EXTRA_COLOUR).append('"');
                    }
                    sb.append("];\n");
                }
            }
        }
        return sb.append("}\n").toString();
    }
}
