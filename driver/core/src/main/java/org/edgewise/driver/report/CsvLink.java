package org.edgewise.driver.report;

import java.net.URLEncoder;
import java.nio.charset.StandardCharsets;
import java.util.List;

/**
 * A table's full rows as a CSV file inside the report: a link whose target is a {@code data:} URI
 * (RFC 2397) with the {@code download} attribute, so the report stays one self-contained file that
 * fetches nothing. Fields are quoted as RFC 4180 says when they hold a comma, quote or line break.
 */
final class CsvLink {
    private CsvLink() {
    }

    /** One CSV field. */
    static String field(String s) {
        return s.indexOf(',') >= 0 || s.indexOf('"') >= 0 || s.indexOf('\n') >= 0 || s.indexOf('\r') >= 0
                ? '"' + s.replace("\"", "\"\"") + '"' : s;
    }

    /** One CSV record (CRLF-terminated, as RFC 4180 writes it). */
    static String record(List<String> fields) {
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < fields.size(); i++) {
            sb.append(i == 0 ? "" : ",").append(field(fields.get(i)));
        }
        return sb.append("\r\n").toString();
    }

    /** The link (HTML): {@code words} as its text, {@code csv} as the file {@code fileName}. */
    static String link(String fileName, String csv, String words) {
        String data = URLEncoder.encode(csv, StandardCharsets.UTF_8).replace("+", "%20");
        return "<a download=\"" + Html.esc(fileName) + "\" href=\"data:text/csv;charset=utf-8," + data + "\">" + words + "</a>";
    }
}
