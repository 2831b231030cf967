package org.edgewise.driver.cli;

/** RFC 4180 quoting for CSV output. */
public final class Csv {
    private Csv() {
    }

    /** The field, quoted when it holds a comma, quote or line break. */
    public static String field(String s) {
        if (s.indexOf(',') < 0 && s.indexOf('"') < 0 && s.indexOf('\n') < 0 && s.indexOf('\r') < 0) {
            return s;
        }
        return '"' + s.replace("\"", "\"\"") + '"';
    }
}
