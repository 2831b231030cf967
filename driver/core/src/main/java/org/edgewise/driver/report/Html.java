package org.edgewise.driver.report;

import java.util.Locale;

/** Escaping and number formatting shared by the HTML and SVG writers. */
public final class Html {
    private Html() {
    }

    /**
     * Escapes text for HTML and XML content and for quoted attribute values: {@code & < > " '}
     * become character references (numeric for the apostrophe, so the result is also valid XML
     * inside inline SVG). Control characters other than tab and line breaks, which XML 1.0 does
     * not allow, become U+FFFD.
     */
    public static String esc(String s) {
        if (s == null) {
            return "";
        }
        StringBuilder sb = new StringBuilder(s.length() + 16);
        for (int i = 0; i < s.length(); i++) {
            char c = s.charAt(i);
            switch (c) {
                case '&' -> sb.append("&amp;");
                case '<' -> sb.append("&lt;");
                case '>' -> sb.append("&gt;");
                case '"' -> sb.append("&quot;");
                case '\'' -> sb.append("&#39;");
                default -> {
                    if (c < 0x20 && c != '\t' && c != '\n' && c != '\r' || c == 0xFFFE || c == 0xFFFF) {
                        sb.append('\uFFFD');
                    } else {
                        sb.append(c);
                    }
                }
            }
        }
        return sb.toString();
    }

    /** A name shortened to at most {@code max} characters (with an ellipsis), for drawing. */
    public static String shorten(String s, int max) {
        return s.length() <= max ? s : s.substring(0, max - 1) + "\u2026";
    }

    /** Fixed decimals, Locale.ROOT. */
    public static String f(double v, int decimals) {
        return String.format(Locale.ROOT, "%." + decimals + "f", v);
    }

    /** A coordinate for SVG (one decimal). */
    public static String c(double v) {
        long tenths = Math.round(v * 10); // as "%.1f" but without the formatter (SVGs hold many coordinates)
        String sign = tenths < 0 ? "-" : "";
        long t = Math.abs(tenths);
        return sign + t / 10 + "." + t % 10;
    }

    /** A probability for people: two decimals, "&lt;0.01" / "&gt;0.99" near the ends. */
    public static String prob(double p) {
        if (p > 0 && p < 0.005) {
            return "<0.01";
        }
        if (p < 1 && p > 0.995) {
            return ">0.99";
        }
        return f(p, 2);
    }

    /** A table row of a key and a value, both HTML already escaped (a null value: an empty cell). */
    static void row(StringBuilder h, String keyHtml, String valueHtml) {
        h.append("<tr><th>").append(keyHtml).append("</th><td>").append(valueHtml == null ? "" : valueHtml).append("</td></tr>\n");
    }

    /** A figure with three decimals, "n/a" when absent. */
    static String fig(Double v) {
        return v == null ? "n/a" : f(v, 3);
    }

    /** A number as a person writes it: whole numbers without decimals (400, not 400.0), others as they are. */
    static String num(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e15 ? String.valueOf((long) v) : String.valueOf(v);
    }
}
