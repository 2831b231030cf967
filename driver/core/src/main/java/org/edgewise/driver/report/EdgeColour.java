package org.edgewise.driver.report;

/**
 * The colour of a drawn edge of the consensus graph (the report's figure and its DOT), judged
 * against a known network when there is one. Declared in the order the figure defines its arrowheads.
 */
enum EdgeColour {
    /** No known network to judge by. */
    PLAIN("#34495e"),
    /** In the known network (a line: the pair is joined either way). */
    TRUE("#1a7f37"),
    /** The reverse of a known edge. */
    REVERSED("#b35c00"),
    /** Not in the known network. */
    EXTRA("#c0254a"),
    /** A known edge the figure does not draw (dashed). */
    MISSED("#8a8a8a");

    /** As {@code #rrggbb}. */
    final String hex;

    EdgeColour(String hex) {
        this.hex = hex;
    }

    /** The colour of the edge a → b ({@code arrow}) or of the line a — b against {@code truth} (null: none). */
    static EdgeColour of(boolean[][] truth, int a, int b, boolean arrow) {
        if (truth == null) {
            return PLAIN;
        }
        return arrow ? (truth[a][b] ? TRUE : truth[b][a] ? REVERSED : EXTRA)
                : (truth[a][b] || truth[b][a] ? TRUE : EXTRA);
    }
}
