package org.edgewise.driver.query;

import java.io.BufferedReader;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.CsvFields;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.Manifest;

/**
 * A CSV table of cases to predict: a header of variable names (any subset, any
 * order), then one case per line; a blank cell is a hidden variable. Fields follow RFC 4180
 * quoting on one line (read by {@link CsvFields}). Every mistake names the file, line and column.
 *
 * <p>Memory: the raw lines plus one int per cell.
 */
public record CaseTable(List<String> header, List<String> lines, int[][] cases, int[] lineNumbers, int extraColumn,
                        List<String> extra) {

    /** Reads {@code file}; {@code what} names the input in messages about the file as a whole. */
    public static CaseTable read(Path file, Manifest m, String what) {
        return read(file, m, what, null, false);
    }

    /**
     * Reads {@code file}, with one column that is not a variable when {@code extra} names one of the
     * header (its trimmed cells kept in {@link #extra}, its index from 0 in {@link #extraColumn}; -1 and
     * null when absent or when {@code extra} names a variable: then it is read as one); a line whose
     * variable cells are all blank is kept only when {@code blankRows}.
     */
    public static CaseTable read(Path file, Manifest m, String what, String extra, boolean blankRows) {
        if (!Files.isRegularFile(file)) {
            throw new UserError(what + ": file " + file + " does not exist");
        }
        List<String> raw;
        try (BufferedReader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            raw = new ArrayList<>();
            for (String line; (line = r.readLine()) != null; ) {
                raw.add(line);
            }
        } catch (IOException e) {
            throw new UserError(what + ": cannot read " + file + ": " + e.getMessage());
        }
        if (raw.isEmpty()) {
            throw new UserError(file + ": empty file; the first line must name the variables");
        }
        String first = raw.get(0);
        if (first.startsWith("\uFEFF")) {
            first = first.substring(1);
        }
        List<String> header = fields(file, 1, first);
        int[] column = new int[header.size()];
        boolean[] seen = new boolean[m.variableCount()];
        int extraAt = -1;
        for (int c = 0; c < header.size(); c++) {
            if (extra != null && header.get(c).trim().equals(extra) && m.variableIndex(extra) < 0) {
                extraAt = c;
                column[c] = -1;
                continue;
            }
            String where = file + ": line 1, column " + (c + 1);
            int v = CaseParser.variable(m, header.get(c).trim(), where);
            if (seen[v]) {
                throw new UserError(where + ": variable '" + header.get(c).trim() + "' appears twice in the header");
            }
            seen[v] = true;
            column[c] = v;
        }
        List<String> lines = new ArrayList<>();
        List<int[]> cases = new ArrayList<>();
        List<Integer> numbers = new ArrayList<>();
        List<String> extraCells = extraAt < 0 ? null : new ArrayList<>();
        for (int i = 1; i < raw.size(); i++) {
            String line = raw.get(i);
            if (line.isEmpty()) {
                continue;
            }
            List<String> f = fields(file, i + 1, line);
            if (f.size() != header.size()) {
                throw new UserError(file + ": line " + (i + 1) + " has " + f.size() + " fields, the header has " + header.size());
            }
            int[] states = new int[m.variableCount()];
            Arrays.fill(states, CaseParser.HIDDEN);
            boolean any = false;
            for (int c = 0; c < f.size(); c++) {
                String cell = f.get(c).trim();
                if (c == extraAt) {
                    extraCells.add(cell);
                } else if (!cell.isEmpty()) {
                    states[column[c]] = CaseParser.state(m.variables().get(column[c]), cell,
                            file + ": line " + (i + 1) + ", column " + (c + 1));
                    any = true;
                }
            }
            if (!any && !blankRows) { // every variable hidden: P = 1 whatever the data, an answer to no question
                throw new UserError(file + ": line " + (i + 1) + " sets no variable (every field is blank); a case"
                        + " needs at least one name=state, and an empty one has probability 1 by definition");
            }
            lines.add(line);
            cases.add(states);
            numbers.add(i + 1);
        }
        return new CaseTable(header, lines, cases.toArray(new int[0][]), numbers.stream().mapToInt(Integer::intValue).toArray(),
                extraAt, extraCells);
    }

    /** Splits one line into fields (RFC 4180, {@link CsvFields}); a malformed quote names its column. */
    public static List<String> fields(Path file, int lineNo, String line) {
        try {
            return CsvFields.split(line, ',');
        } catch (CsvFields.Malformed e) {
            throw new UserError(file + ": line " + lineNo + ", column " + e.column() + ": "
                    + (e.unterminated() ? "unterminated quote (opened at character " + e.quoteAt() + ")"
                    : "text after a closing quote"));
        }
    }
}
