package org.edgewise.driver;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;

/**
 * The one CSV field reader and writer of single lines (headers, cases, malformed rows named in
 * messages): reading is Apache Commons CSV with RFC 4180 rules (fields quoted with {@code "},
 * a doubled quote inside a quoted field is one quote, nothing trimmed); writing quotes a field
 * only when it holds the delimiter, a quote or a line break. Bulk data is read by Spark's own
 * CSV source in the job, never here.
 */
public final class CsvFields {
    private static final CSVFormat COMMA = CSVFormat.RFC4180;

    private CsvFields() {
    }

    /** A line that is not RFC 4180: which field (1-based) and where its opening quote is (1-based). */
    public static final class Malformed extends RuntimeException {
        private final int column;
        private final int quoteAt;
        private final boolean unterminated;

        Malformed(int column, int quoteAt, boolean unterminated) {
            super((unterminated ? "unterminated quote" : "text after a closing quote") + " in field " + column);
            this.column = column;
            this.quoteAt = quoteAt;
            this.unterminated = unterminated;
        }

        public int column() {
            return column;
        }

        /** 1-based character position of the field's opening quote. */
        public int quoteAt() {
            return quoteAt;
        }

        /** True for a quote never closed, false for text after a closing quote. */
        public boolean unterminated() {
            return unterminated;
        }
    }

    /**
     * The fields of one line (without its line break); an empty line is one empty field.
     *
     * @throws Malformed when a quoted field is not closed or text follows its closing quote
     */
    public static List<String> split(String line, char delimiter) {
        List<String> fields = parse(line, delimiter);
        if (fields != null) {
            return fields;
        }
        // Locate the bad field: the last quote opening a field whose preceding text is well formed.
        int start = 0;
        int column = 1;
        for (int p = 0; p < line.length(); p++) {
            if (line.charAt(p) == '"' && (p == 0 || line.charAt(p - 1) == delimiter)) {
                List<String> before = p == 0 ? List.of() : parse(line.substring(0, p), delimiter);
                if (before != null) {
                    start = p;
                    column = Math.max(1, before.size());
                }
            }
        }
        boolean unterminated = parse(line + '"', delimiter) != null;
        throw new Malformed(column, start + 1, unterminated);
    }

    /** The fields, or null when the line is not well formed. */
    private static List<String> parse(String line, char delimiter) {
        if (line.isEmpty()) {
            return new ArrayList<>(List.of(""));
        }
        CSVFormat format = delimiter == ',' ? COMMA : CSVFormat.RFC4180.builder().setDelimiter(delimiter).build();
        try (CSVParser parser = CSVParser.parse(line, format)) {
            List<CSVRecord> records = parser.getRecords();
            if (records.size() != 1) {
                return null;
            }
            return new ArrayList<>(records.get(0).toList());
        } catch (IOException | UncheckedIOException | IllegalStateException e) {
            return null;
        }
    }

    /** RFC 4180: the field, quoted (inner quotes doubled) when it holds a comma, quote or line break. */
    public static String quote(String s) {
        if (s.indexOf(',') < 0 && s.indexOf('"') < 0 && s.indexOf('\n') < 0 && s.indexOf('\r') < 0) {
            return s;
        }
        return '"' + s.replace("\"", "\"\"") + '"';
    }
}
