package org.edgewise.driver.analysis;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.UserError;
import org.edgewise.driver.analysis.EffectAnalysis.Question;
import org.edgewise.driver.query.CaseTable;

/**
 * A CSV file of effect questions: a header naming the columns {@code do} and {@code target}, and
 * optionally {@code given} and {@code versus} (any order, once each), then one question per line.
 * Every mistake names the file, line and column.
 */
public final class EffectQuestions {
    private EffectQuestions() {
    }

    /** The questions of a CSV: header with {@code do} and {@code target}, optionally {@code given} and {@code versus}. */
    public static List<Question> read(Path file, String what) {
        if (!Files.isRegularFile(file)) {
            throw new UserError(what + ": file " + file + " does not exist");
        }
        List<String> lines;
        try {
            lines = Files.readAllLines(file, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UserError(what + ": cannot read " + file + ": " + e.getMessage());
        }
        if (lines.isEmpty()) {
            throw new UserError(file + ": empty file; the first line must be do,target[,given][,versus]");
        }
        List<String> head = CaseTable.fields(file, 1, lines.get(0).replace("\uFEFF", ""));
        int[] col = {-1, -1, -1, -1};
        String[] names = {"do", "target", "given", "versus"};
        for (int c = 0; c < head.size(); c++) {
            String h = head.get(c).trim().toLowerCase(Locale.ROOT);
            int k = List.of(names).indexOf(h);
            if (k < 0 || col[k] >= 0) {
                throw new UserError(file + ": line 1, column " + (c + 1) + ": expected do, target, given or versus (once each), got '"
                        + head.get(c).trim() + "'");
            }
            col[k] = c;
        }
        if (col[0] < 0 || col[1] < 0) {
            throw new UserError(file + ": line 1: the header must name the columns do and target");
        }
        List<Question> out = new ArrayList<>();
        for (int i = 1; i < lines.size(); i++) {
            if (lines.get(i).isBlank()) {
                continue;
            }
            List<String> f = CaseTable.fields(file, i + 1, lines.get(i));
            if (f.size() != head.size()) {
                throw new UserError(file + ": line " + (i + 1) + " has " + f.size() + " fields, the header has " + head.size());
            }
            out.add(new Question(f.get(col[0]), f.get(col[1]), col[2] < 0 ? null : f.get(col[2]),
                    col[3] < 0 ? null : f.get(col[3]), file + ": line " + (i + 1) + ": "));
        }
        if (out.isEmpty()) {
            throw new UserError(file + ": no questions after the header");
        }
        return out;
    }
}
