package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.c;

/**
 * A chart's frame: the figure's {@code width} × {@code height} and the margins around its plot
 * area, which is {@link #plotWidth} × {@link #plotHeight} from ({@code left}, {@code top}).
 */
record Frame(double width, double height, double left, double right, double top, double bottom) {
    /** A figure of this size without margins (a drawing rather than a plot). */
    static Frame of(double width, double height) {
        return new Frame(width, height, 0, 0, 0, 0);
    }

    double plotWidth() {
        return width - left - right;
    }

    double plotHeight() {
        return height - top - bottom;
    }

    /** The opening {@code <svg>} tag of class {@code cls}, this size, a matching view box, sans-serif at {@code fontSize}. */
    StringBuilder open(String cls, int fontSize) {
        return new StringBuilder().append("<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"").append(cls)
                .append("\" role=\"img\" width=\"").append(c(width)).append("\" height=\"").append(c(height))
                .append("\" viewBox=\"0 0 ").append(c(width)).append(' ').append(c(height))
                .append("\" font-family=\"sans-serif\" font-size=\"").append(fontSize).append("\">\n");
    }
}
