package org.edgewise.job.input;

import static org.apache.spark.sql.functions.count;
import static org.apache.spark.sql.functions.countDistinct;

import java.io.Serializable;
import java.util.List;
import org.apache.spark.sql.Row;
import org.edgewise.driver.CsvFields;
import org.edgewise.driver.UserError;
import org.edgewise.job.TallyOptions;
import org.edgewise.job.TallyOptions.MissingPolicy;
import org.edgewise.job.input.InputFiles.DataFile;
import scala.Tuple2;

/**
 * The refusals of {@link TableScan}'s one statistics pass, each a one-line {@link UserError} naming
 * the file and the line, column or variable: no rows, malformed rows, missing values under
 * {@code --missing error}, non-numbers in a discretised column, too many states, bytes not valid in
 * the encoding, the missing-value label clashing with a value.
 *
 * <p>Line numbers are found only on this error path, by re-reading the offending file alone with
 * {@code zipWithIndex}, then counting its physical lines up to that row ({@link Table#lineOf}:
 * blank lines and lines inside quoted fields count).
 */
final class InputRefusals {
    private InputRefusals() {
    }

    /** The first bad row of the input: its file, the row, its line (CSV) or row (Parquet) number. */
    record BadRow(DataFile file, Row row, long line) {
    }

    /** A serialisable row predicate for locating the first bad row. */
    interface RowTest extends Serializable {
        boolean test(Row r);
    }

    /** Refuses the input when the pass's statistics show a mistake; returns when there is none. */
    static void check(Table table, TallyOptions o, List<String> names, int[] fields, boolean[] binned, ColumnStats stats) {
        List<String> header = table.columns();
        int n = names.size();
        int corrupt = table.corruptField();
        int wf = o.weight() == null ? -1 : header.indexOf(o.weight());

        if (stats.rows() == 0 && stats.badWeights() == 0 && stats.zeroWeights() == 0) {
            throw new UserError("input " + TableScan.inputs(table) + ": no data rows (only a header)");
        }
        if (stats.malformed() > 0) {
            BadRow bad = first(table, r -> !r.isNullAt(corrupt));
            String text = bad.row().getString(corrupt);
            int got = fieldCount(text, table.delimiter());
            throw new UserError("input " + InputFiles.display(bad.file()) + " line " + bad.line()
                    + ": " + got + (got == 1 ? " field" : " fields") + ", the header has " + header.size()
                    + " (" + stats.malformed() + " malformed " + (stats.malformed() == 1 ? "row" : "rows") + " in all)");
        }
        if (o.weight() != null) {
            checkWeights(table, o.weight(), stats);
        }
        if (stats.rows() == stats.dropped()) {
            throw new UserError("input " + TableScan.inputs(table) + ": every row has a missing value; nothing is left to count"
                    + " after --missing drop");
        }
        if (o.missing() == MissingPolicy.ERROR) {
            long total = 0;
            for (int v = 0; v < n; v++) {
                total += stats.missing(v);
            }
            if (total > 0) {
                BadRow bad = firstCounted(table, wf, r -> {
                    for (int f : fields) {
                        if (ColumnStats.isMissing(r, f)) {
                            return true;
                        }
                    }
                    return false;
                });
                Row r = bad.row();
                String column = null;
                for (int v = 0; v < n && column == null; v++) {
                    if (ColumnStats.isMissing(r, fields[v])) {
                        column = names.get(v);
                    }
                }
                throw new UserError("input " + InputFiles.display(bad.file()) + " " + table.unit() + " "
                        + bad.line() + ", column '" + column + "': missing value (" + total
                        + " missing " + (total == 1 ? "value" : "values") + " in all); choose --missing drop or --missing state");
            }
        }
        for (int v = 0; v < n; v++) {
            if (binned[v] && !stats.numeric(v)) {
                int f = fields[v];
                if (stats.missing(v) + stats.dropped() >= stats.rows()) {
                    throw new UserError("--discretize " + names.get(v) + ": the column has no values");
                }
                BadRow bad = firstCounted(table, wf,
                        r -> !ColumnStats.isMissing(r, f) && Double.isNaN(ColumnStats.parse(r.getString(f))));
                throw new UserError("input " + InputFiles.display(bad.file()) + " " + table.unit() + " "
                        + bad.line() + ", column '" + names.get(v) + "': '" + bad.row().getString(f)
                        + "' is not a number, but --discretize " + names.get(v) + "=" + o.discretize().get(names.get(v))
                        + " needs numbers");
            }
        }
        for (int v = 0; v < n; v++) {
            if (stats.overflow(v)) {
                throw tooManyStates(table, names.get(v), o.maxStates(), stats.numeric(v));
            }
        }
        for (int v = 0; v < n; v++) {
            if (table.isCsv() && !binned[v] && stats.distinct(v).stream().anyMatch(x -> x.indexOf('\uFFFD') >= 0)) {
                throw notInEncoding(table, names.get(v), fields[v], wf);
            }
            if (o.missing() == MissingPolicy.STATE && stats.missing(v) > 0 && stats.distinct(v).contains(TableScan.MISSING_STATE)) {
                throw new UserError("input " + TableScan.inputs(table) + ", column '" + names.get(v) + "': the value '" + TableScan.MISSING_STATE
                        + "' is also the label --missing state gives to empty fields; rename that value or choose"
                        + " --missing drop");
            }
        }
    }

    /**
     * A table of counts: the first bad weight (blank, negative, a fraction, not a number, too large)
     * is refused naming its line; so are weights that add up to more rows than a long holds, and a
     * table whose every weight is 0.
     */
    private static void checkWeights(Table table, String column, ColumnStats stats) {
        int field = table.columns().indexOf(column);
        if (stats.badWeights() > 0) {
            BadRow bad = first(table, r -> Weights.problem(r.isNullAt(field) ? null : r.getString(field)) != null);
            Row r = bad.row();
            throw new UserError("input " + InputFiles.display(bad.file()) + " " + table.unit() + " " + bad.line()
                    + ", column '" + column + "': " + Weights.problem(r.isNullAt(field) ? null : r.getString(field))
                    + "; --weight " + column + " needs a whole number of rows (0 or more) on every " + table.unit()
                    + " (" + stats.badWeights() + " bad " + (stats.badWeights() == 1 ? "weight" : "weights") + " in all)");
        }
        if (stats.weightOverflow()) {
            throw new UserError("input " + TableScan.inputs(table) + ", column '" + column + "': the weights add up to more than "
                    + Long.MAX_VALUE + " rows");
        }
        if (stats.rows() == 0) {
            throw new UserError("input " + TableScan.inputs(table) + ", column '" + column + "': every weight is 0;"
                    + " nothing is left to count");
        }
    }

    private static UserError tooManyStates(Table table, String name, int maxStates, boolean numeric) {
        Row r = table.rows().select(countDistinct(TableScan.quoted(name)), count(TableScan.quoted(name))).first();
        long distinct = r.getLong(0);
        long present = r.getLong(1);
        String head = "input " + TableScan.inputs(table) + ": column '" + name + "' has " + distinct + " distinct"
                + (numeric ? " numeric" : "") + " values, more than --max-states " + maxStates + "; ";
        if (distinct >= TableScan.ID_SHARE * present) {
            return new UserError(head + "it looks like an ID column (nearly every value is distinct): leave it out with --exclude "
                    + name);
        }
        boolean canRaise = maxStates < 255; // the most the counting kernels' byte codes hold
        if (numeric) {
            return new UserError(head + "discretise it, e.g. --discretize " + name + "=4"
                    + (canRaise ? ", or raise --max-states" : ""));
        }
        return new UserError(head + (canRaise ? "raise --max-states or leave" : "leave") + " it out with --exclude " + name);
    }

    /**
     * Bytes that are not valid in the encoding arrive from Spark's CSV reader as U+FFFD, silently;
     * they are refused here, naming the first line that holds one.
     */
    private static UserError notInEncoding(Table table, String name, int field, int weightField) {
        BadRow bad = firstCounted(table, weightField,
                r -> !r.isNullAt(field) && r.getString(field).indexOf('\uFFFD') >= 0);
        return new UserError("input " + InputFiles.display(bad.file()) + " " + table.unit() + " "
                + bad.line() + ", column '" + name + "': bytes that are not valid "
                + table.encoding().name() + "; pass --encoding with the file's encoding, e.g. --encoding ISO-8859-1");
    }

    /** The first row (in file order) that passes {@code test}: its file, the row and its line or row number. */
    private static BadRow first(Table table, RowTest test) {
        for (DataFile f : table.files()) {
            List<Tuple2<Row, Long>> hit = table.rowsOf(f).javaRDD().zipWithIndex()
                    .filter(t -> test.test(t._1())).take(1);
            if (!hit.isEmpty()) {
                return new BadRow(f, hit.get(0)._1(), table.lineOf(f, hit.get(0)._2()));
            }
        }
        throw new IllegalStateException("a bad row was counted but not found again");
    }

    /**
     * As {@link #first}, among the rows that are counted: with a weight column ({@code weightField} ≥ 0)
     * a line of weight 0 stands for no row, so it is never the one a refusal names.
     */
    private static BadRow firstCounted(Table table, int weightField, RowTest test) {
        if (weightField < 0) {
            return first(table, test);
        }
        return first(table, r -> !Weights.isZero(r.isNullAt(weightField) ? null : r.getString(weightField)) && test.test(r));
    }

    /** Fields of a malformed row for the message; a row with a broken quote counts up to its bad field. */
    private static int fieldCount(String text, char delimiter) {
        try {
            return CsvFields.split(text, delimiter).size();
        } catch (CsvFields.Malformed e) {
            return e.column();
        }
    }
}
