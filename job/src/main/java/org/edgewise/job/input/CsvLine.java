package org.edgewise.job.input;

import java.util.ArrayList;
import java.util.List;

/**
 * Splits one CSV line into fields (RFC 4180 quoting with {@code "}, doubled quotes inside a quoted
 * field). Used only for the header and for describing a malformed row in an error message; the
 * data itself is parsed by Spark's CSV reader.
 */
public final class CsvLine {
    private CsvLine() {
    }

    public static List<String> split(String line, char delimiter) {
        List<String> out = new ArrayList<>();
        StringBuilder cur = new StringBuilder();
        boolean quoted = false;
        for (int i = 0; i < line.length(); i++) {
            char c = line.charAt(i);
            if (quoted) {
                if (c == '"') {
                    if (i + 1 < line.length() && line.charAt(i + 1) == '"') {
                        cur.append('"');
                        i++;
                    } else {
                        quoted = false;
                    }
                } else {
                    cur.append(c);
                }
            } else if (c == '"') {
                quoted = true;
            } else if (c == delimiter) {
                out.add(cur.toString());
                cur.setLength(0);
            } else {
                cur.append(c);
            }
        }
        out.add(cur.toString());
        return out;
    }
}
