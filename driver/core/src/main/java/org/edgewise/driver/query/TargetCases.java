package org.edgewise.driver.query;

import java.nio.file.Path;
import java.util.Arrays;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.Variable;

/**
 * A table of cases to score for one target variable y: per row the evidence (the row's non-blank
 * cells and the shared evidence, never the row's own cell of y) and the row's true state of y when
 * known — from a truth column that is not a variable, or else from y's own column. A row whose truth
 * is blank is predicted and left out of the scores.
 *
 * @param target      the target variable
 * @param evidence    per row the states the prediction is conditioned on ({@link CaseParser#HIDDEN} elsewhere; y hidden)
 * @param truth       per row the true state of y, or -1 when unknown
 * @param lineNumbers per row its line in the file (from 1, the header being line 1)
 * @param truthFrom   the column the truths were read from, or null when there is none
 */
public record TargetCases(int target, int[][] evidence, int[] truth, int[] lineNumbers, String truthFrom) {

    /**
     * The cases of {@code table} (read with {@code truthColumn} as its extra column) for {@code target}.
     *
     * @param given       evidence added to every row, or null
     * @param truthColumn the column holding the truths as named by the caller, or null: y's own column when present
     */
    public static TargetCases of(CaseTable table, Manifest m, int target, int[] given, Path file, String truthColumn,
                                 InputNames in) {
        Variable y = m.variables().get(target);
        if (given != null && given[target] != CaseParser.HIDDEN) {
            throw new UserError(in.given() + " observes the target " + y.name() + "; a prediction of it cannot be conditioned on it");
        }
        int rows = table.cases().length;
        if (rows == 0) {
            throw new UserError(file + ": no row to predict (only the header)");
        }
        int targetColumn = -1;
        for (int c = 0; c < table.header().size(); c++) {
            if (table.header().get(c).trim().equals(y.name())) {
                targetColumn = c;
            }
        }
        String truthFrom = null;
        boolean fromExtra = false;
        if (truthColumn != null) {
            int v = m.variableIndex(truthColumn);
            if (v >= 0 && v != target) {
                throw new UserError("the truth column " + truthColumn + " is the variable " + truthColumn + ", not the target "
                        + y.name() + "; name the column that holds the true states of " + y.name());
            }
            if (v < 0 && table.extraColumn() < 0) {
                throw new UserError(file + ": line 1: no column '" + truthColumn + "' (columns: " + String.join(", ", table.header())
                        + ")");
            }
            if (v == target && targetColumn < 0) {
                throw new UserError(file + ": line 1: no column '" + truthColumn + "' (columns: " + String.join(", ", table.header())
                        + ")");
            }
            fromExtra = v < 0;
            truthFrom = truthColumn;
        } else if (targetColumn >= 0) {
            truthFrom = y.name();
        }
        int[] column = new int[m.variableCount()];
        Arrays.fill(column, -1);
        for (int c = 0; c < table.header().size(); c++) {
            int v = m.variableIndex(table.header().get(c).trim());
            if (v >= 0 && c != table.extraColumn()) {
                column[v] = c;
            }
        }
        int[][] evidence = new int[rows][];
        int[] truth = new int[rows];
        for (int i = 0; i < rows; i++) {
            int line = table.lineNumbers()[i];
            int[] row = table.cases()[i];
            int[] e = row.clone();
            e[target] = CaseParser.HIDDEN; // the row's own cell of y is what is predicted, never evidence
            if (given != null) {
                for (int v = 0; v < e.length; v++) {
                    if (given[v] == CaseParser.HIDDEN) {
                        continue;
                    }
                    if (e[v] != CaseParser.HIDDEN && e[v] != given[v]) {
                        Variable x = m.variables().get(v);
                        throw new UserError(file + ": line " + line + ", column " + (column[v] + 1) + ": " + x.name() + "="
                                + x.states().get(e[v]) + " contradicts " + in.given() + " " + x.name() + "=" + x.states().get(given[v]));
                    }
                    e[v] = given[v];
                }
            }
            evidence[i] = e;
            if (fromExtra) {
                String cell = table.extra().get(i);
                truth[i] = cell.isEmpty() ? -1 : CaseParser.state(y, cell, file + ": line " + line + ", column "
                        + (table.extraColumn() + 1) + " (truth)");
            } else {
                truth[i] = truthFrom == null ? -1 : row[target];
            }
        }
        return new TargetCases(target, evidence, truth, table.lineNumbers(), truthFrom);
    }

    /** Rows with a truth. */
    public int scored() {
        int s = 0;
        for (int t : truth) {
            s += t >= 0 ? 1 : 0;
        }
        return s;
    }
}
