package org.edgewise.driver.report;

/**
 * How a drawn edge of the consensus graph (the report's figure and its DOT) compares with a known
 * network, when there is one: a line pattern and a glyph beside the posterior, all in one ink, so
 * the comparison reads in greyscale and without colour vision. The legend spells each in words
 * ({@link #words}). Declared in the order the legend lists them.
 */
enum EdgeMark {
    /** No known network to judge by. */
    PLAIN("", "", ""),
    /** In the known network (a line: the pair is joined either way): solid, a tick. */
    TRUE("", "\u2713", "in the known network (for a line: joined there either way)"),
    /** The reverse of a known edge: solid, a double arrow. */
    REVERSED("", "\u21c4", "in the known network, but the other way round"),
    /** Not in the known network: dotted, a cross. */
    EXTRA("2,4", "\u2717", "not in the known network"),
    /** A known edge the figure does not draw: thin, long dashes, a hollow circle. */
    MISSED("9,5", "\u25cb", "an edge of the known network the posteriors do not support (not drawn above the threshold)");

    /** The SVG {@code stroke-dasharray} ("" for solid). */
    final String dash;
    /** The glyph written after the posterior. */
    final String glyph;
    /** The legend's words. */
    final String words;

    EdgeMark(String dash, String glyph, String words) {
        this.dash = dash;
        this.glyph = glyph;
        this.words = words;
    }

    /** The mark of the edge a → b ({@code arrow}) or of the line a — b against {@code truth} (null: none). */
    static EdgeMark of(boolean[][] truth, int a, int b, boolean arrow) {
        if (truth == null) {
            return PLAIN;
        }
        return arrow ? (truth[a][b] ? TRUE : truth[b][a] ? REVERSED : EXTRA)
                : (truth[a][b] || truth[b][a] ? TRUE : EXTRA);
    }

    /** The DOT {@code style} of this mark. */
    String dotStyle() {
        return this == EXTRA ? "dotted" : this == MISSED ? "dashed" : "solid";
    }
}
