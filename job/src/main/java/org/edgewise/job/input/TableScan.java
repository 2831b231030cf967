package org.edgewise.job.input;

import static org.apache.spark.sql.functions.col;
import static org.apache.spark.sql.functions.count;
import static org.apache.spark.sql.functions.countDistinct;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.Collections;
import java.util.Comparator;
import java.util.List;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.sql.Column;
import org.apache.spark.sql.Encoders;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.catalyst.InternalRow;
import org.apache.spark.storage.StorageLevel;
import org.edgewise.driver.CsvFields;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.Variable;
import org.edgewise.job.TallyOptions;
import org.edgewise.job.TallyOptions.MissingPolicy;
import org.edgewise.job.input.InputFiles.DataFile;
import scala.Tuple2;

/**
 * Picks the variables, runs the one statistics pass over the input, refuses bad input with a
 * one-line {@link UserError} (naming the file and the line, column or variable), and derives the
 * {@link Encoding}: ordered states per variable (numeric order when every value is a number,
 * otherwise lexicographic), bins for discretised columns, the missing-value state.
 *
 * <p>Line numbers are found only on the error path, by re-reading the offending file alone with
 * {@code zipWithIndex}, then counting its physical lines up to that row ({@link Table#lineOf}:
 * blank lines and lines inside quoted fields count).
 *
 * <p>Quoted fields spanning lines (RFC 4180) are found without a pass of their own: a CSV file
 * read line by line splits such a row into pieces whose field counts differ from the header's (for
 * any header of two or more columns), so the one pass counts malformed rows. Only then are the
 * files with malformed rows checked (an even number of {@code "} in all: no quote left open) and
 * read again whole ({@code multiLine}), which replaces the first reading (a row still malformed is
 * then truly so, and refused as before); a file with a quote left open is refused as read line by
 * line. A file read whole is one task, so its rows are
 * spread over the cluster's default parallelism before counting (counts do not depend on the
 * partitioning).
 */
public final class TableScan {
    /** Label of the extra state of a variable with missing values under {@code --missing state}. */
    public static final String MISSING_STATE = "(missing)";
    /** Relative error of the approximate quantiles behind {@code --discretize}. */
    public static final double QUANTILE_ERROR = 1e-4;
    /** A column is called ID-like when at least this share of its values are distinct (common practice). */
    static final double ID_SHARE = 0.9;

    private TableScan() {
    }

    /** The outcome: the encoding, the raw rows to encode, and the statistics. */
    public record Result(Encoding encoding, JavaRDD<RawBlock> rawBlocks, ColumnStats stats) {
        /** Rows that will be counted. */
        public long countedRows() {
            return stats.rows() - stats.dropped();
        }
    }

    /** The first bad row of the input: its file, the row, its line (CSV) or row (Parquet) number. */
    record BadRow(DataFile file, Row row, long line) {
    }

    /** The one pass's output: the blocks kept for encoding and the merged statistics. */
    private record Pass(JavaRDD<RawBlock> rawBlocks, ColumnStats stats) {
    }

    /** A serialisable row predicate for locating the first bad row. */
    interface RowTest extends Serializable {
        boolean test(Row r);
    }

    /** The selected variables' names, in column order; unknown names in --columns/--exclude/--discretize refused. */
    public static List<String> selected(Table table, TallyOptions o) {
        List<String> header = table.columns();
        for (String c : o.columns()) {
            if (!header.contains(c)) {
                throw new UserError("--columns: no column '" + c + "' in " + inputs(table) + " (columns: "
                        + String.join(", ", header) + ")");
            }
        }
        for (String c : o.exclude()) {
            if (!header.contains(c)) {
                throw new UserError("--exclude: no column '" + c + "' in " + inputs(table) + " (columns: "
                        + String.join(", ", header) + ")");
            }
        }
        List<String> names = new ArrayList<>();
        for (int i = 0; i < header.size(); i++) {
            String c = header.get(i);
            if ((o.columns().isEmpty() || o.columns().contains(c)) && !o.exclude().contains(c)) {
                names.add(c);
            }
        }
        if (names.isEmpty()) {
            throw new UserError("no variables left after --columns/--exclude");
        }
        for (String c : o.discretize().keySet()) {
            if (!names.contains(c)) {
                throw new UserError("--discretize: no variable '" + c + "' among the selected columns ("
                        + String.join(", ", names) + ")");
            }
        }
        return names;
    }

    public static Result scan(Table table, TallyOptions o) {
        List<String> header = table.columns();
        List<String> names = selected(table, o);
        List<Integer> fieldList = new ArrayList<>();
        for (String name : names) {
            fieldList.add(header.indexOf(name));
        }
        int n = names.size();
        int[] fields = fieldList.stream().mapToInt(Integer::intValue).toArray();
        boolean[] binned = new boolean[n];
        for (int v = 0; v < n; v++) {
            binned[v] = o.discretize().containsKey(names.get(v));
        }

        Pass pass = pass(table, o, fields, binned);
        if (table.isCsv() && pass.stats().malformed() > 0 && !table.anyMultiLine()) {
            Table whole = wholeFileCandidates(table);
            if (whole != null) {
                // read whole, a row is what RFC 4180 says it is: rows still malformed are truly so
                pass.rawBlocks().unpersist(false);
                table = whole;
                pass = pass(whole, o, fields, binned);
            }
        }
        try {
            return finish(table, o, names, fields, binned, pass.rawBlocks(), pass.stats());
        } catch (RuntimeException e) {
            pass.rawBlocks().unpersist(false);
            throw e;
        }
    }

    /** The one read of the input: block-local codes plus per-block statistics, kept for encoding. */
    private static Pass pass(Table table, TallyOptions o, int[] fields, boolean[] binned) {
        JavaRDD<InternalRow> raw = table.internalRows();
        if (o.partitions() != null) {
            raw = raw.map(InternalRow::copy).repartition(o.partitions());
        } else if (table.anyMultiLine()) {
            int spread = Math.max(table.spark().sparkContext().defaultParallelism(), raw.getNumPartitions());
            raw = raw.map(InternalRow::copy).repartition(spread);
        }
        boolean drop = o.missing() == MissingPolicy.DROP;
        ColumnStats template = new ColumnStats(fields, binned, Math.min(o.maxStates(), 255), drop, table.corruptField());
        JavaRDD<RawBlock> rawBlocks = raw.mapPartitions(it -> RawBlock.read(it, template))
                .persist(StorageLevel.MEMORY_AND_DISK_SER());
        try {
            return new Pass(rawBlocks, rawBlocks.map(b -> b.stats().empty().merge(b.stats())).reduce(ColumnStats::merge));
        } catch (Exception e) { // SparkException is checked but thrown undeclared from Scala
            rawBlocks.unpersist(false);
            throw ReadFailure.of(table, e);
        }
    }

    /**
     * The table with its files that have malformed rows read whole, when each of them has an even
     * number of quote characters (a quote left open would otherwise swallow the rest of the file into
     * one field); null when there is none such.
     */
    private static Table wholeFileCandidates(Table table) {
        List<DataFile> whole = new ArrayList<>();
        int corrupt = table.corruptField();
        for (DataFile f : table.files()) {
            // on the RDD: a Dataset filter on the malformed-row column alone would not parse the rows
            boolean malformed = table.files().size() == 1
                    || !table.rowsOf(f).javaRDD().filter(r -> !r.isNullAt(corrupt)).take(1).isEmpty();
            if (malformed && quotesBalanced(table, f)) {
                whole.add(f);
            }
        }
        return whole.isEmpty() ? null : table.withMultiLine(whole);
    }

    /** True when the file holds an even number of {@code "} (counted over its lines by Spark, in parallel). */
    private static boolean quotesBalanced(Table table, DataFile f) {
        Column v = col("value");
        Row r = table.spark().read().text(f.uri())
                .select(org.apache.spark.sql.functions.sum(org.apache.spark.sql.functions.length(v)
                        .minus(org.apache.spark.sql.functions.length(
                                org.apache.spark.sql.functions.regexp_replace(v, "\"", ""))))).first();
        return r.isNullAt(0) || r.getLong(0) % 2 == 0;
    }

    private static Result finish(Table table, TallyOptions o, List<String> names, int[] fields, boolean[] binned,
                                 JavaRDD<RawBlock> rawBlocks, ColumnStats stats) {
        List<String> header = table.columns();
        int n = names.size();
        int corrupt = table.corruptField();

        if (stats.rows() == 0) {
            throw new UserError("input " + inputs(table) + ": no data rows (only a header)");
        }
        if (stats.malformed() > 0) {
            BadRow bad = first(table, r -> !r.isNullAt(corrupt));
            String text = bad.row().getString(corrupt);
            int got = fieldCount(text, table.delimiter());
            throw new UserError("input " + InputFiles.display(bad.file()) + " line " + bad.line()
                    + ": " + got + (got == 1 ? " field" : " fields") + ", the header has " + header.size()
                    + " (" + stats.malformed() + " malformed " + (stats.malformed() == 1 ? "row" : "rows") + " in all)");
        }
        if (stats.rows() == stats.dropped()) {
            throw new UserError("input " + inputs(table) + ": every row has a missing value; nothing is left to count"
                    + " after --missing drop");
        }
        if (o.missing() == MissingPolicy.ERROR) {
            long total = 0;
            for (int v = 0; v < n; v++) {
                total += stats.missing(v);
            }
            if (total > 0) {
                BadRow bad = first(table, r -> {
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
                BadRow bad = first(table,
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
                throw notInEncoding(table, names.get(v), fields[v]);
            }
            if (o.missing() == MissingPolicy.STATE && stats.missing(v) > 0 && stats.distinct(v).contains(MISSING_STATE)) {
                throw new UserError("input " + inputs(table) + ", column '" + names.get(v) + "': the value '" + MISSING_STATE
                        + "' is also the label --missing state gives to empty fields; rename that value or choose"
                        + " --missing drop");
            }
        }

        List<Variable> variables = new ArrayList<>();
        int[] missingState = new int[n];
        for (int v = 0; v < n; v++) {
            List<String> states = new ArrayList<>();
            List<Double> edges = null;
            if (binned[v]) {
                edges = binEdges(table, rawBlocks, v, o.discretize().get(names.get(v)), stats.min(v));
                states.addAll(binLabels(edges, stats.min(v), stats.max(v)));
            } else {
                states.addAll(orderStates(stats.distinct(v), stats.numeric(v)));
            }
            missingState[v] = -1;
            if (o.missing() == MissingPolicy.STATE && stats.missing(v) > 0) {
                missingState[v] = states.size();
                states.add(MISSING_STATE);
            }
            if (states.size() > 256) {
                throw new UserError("variable '" + names.get(v) + "' has " + states.size() + " states; at most 256 are supported");
            }
            variables.add(new Variable(names.get(v), states, edges));
        }
        return new Result(new Encoding(fields, variables, missingState), rawBlocks, stats);
    }

    /** States in numeric order when every value is a number (ties by text), otherwise lexicographic. */
    static List<String> orderStates(java.util.Set<String> values, boolean numeric) {
        List<String> states = new ArrayList<>(values);
        if (numeric) {
            states.sort(Comparator.comparingDouble(ColumnStats::parse).thenComparing(Comparator.naturalOrder()));
        } else {
            Collections.sort(states);
        }
        return states;
    }

    /** Interior cut points of k equal-frequency bins (approximate quantiles), duplicates and ≤ min removed. */
    static List<Double> binEdges(Table table, JavaRDD<RawBlock> rawBlocks, int v, int k, double min) {
        double[] probs = new double[k - 1];
        for (int i = 1; i < k; i++) {
            probs[i - 1] = (double) i / k;
        }
        JavaRDD<Double> xs = rawBlocks.flatMap(b -> {
            List<Double> out = new ArrayList<>(b.rows);
            for (int t = 0; t < b.rows; t++) {
                double x = b.values[v][t];
                if (!Double.isNaN(x)) {
                    out.add(x);
                }
            }
            return out.iterator();
        });
        double[] q = table.spark().createDataset(xs.rdd(), Encoders.DOUBLE()).toDF("x")
                .stat().approxQuantile("x", probs, QUANTILE_ERROR);
        List<Double> edges = new ArrayList<>();
        for (double e : q) {
            if (e > min && (edges.isEmpty() || e > edges.get(edges.size() - 1))) {
                edges.add(e);
            }
        }
        return edges;
    }

    /** Labels [lo,hi) of the bins, the last closed at the maximum: [min,e1), [e1,e2), …, [e_m,max]. */
    static List<String> binLabels(List<Double> edges, double min, double max) {
        List<String> out = new ArrayList<>();
        double lo = min;
        for (double e : edges) {
            out.add("[" + num(lo) + "," + num(e) + ")");
            lo = e;
        }
        out.add("[" + num(lo) + "," + num(max) + "]");
        return out;
    }

    static String num(double x) {
        if (x == Math.rint(x) && Math.abs(x) < 1e15) {
            return Long.toString((long) x);
        }
        return Double.toString(x);
    }

    private static UserError tooManyStates(Table table, String name, int maxStates, boolean numeric) {
        Row r = table.rows().select(countDistinct(quoted(name)), count(quoted(name))).first();
        long distinct = r.getLong(0);
        long present = r.getLong(1);
        String head = "input " + inputs(table) + ": column '" + name + "' has " + distinct + " distinct"
                + (numeric ? " numeric" : "") + " values, more than --max-states " + maxStates + "; ";
        if (distinct >= ID_SHARE * present) {
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
    private static UserError notInEncoding(Table table, String name, int field) {
        BadRow bad = first(table,
                r -> !r.isNullAt(field) && r.getString(field).indexOf('\uFFFD') >= 0);
        return new UserError("input " + InputFiles.display(bad.file()) + " " + table.unit() + " "
                + bad.line() + ", column '" + name + "': bytes that are not valid "
                + table.encoding().name() + "; pass --encoding with the file's encoding, e.g. --encoding ISO-8859-1");
    }

    static Column quoted(String name) {
        return col("`" + name.replace("`", "``") + "`");
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

    /** The input arguments, as given. */
    static String inputs(Table table) {
        List<String> args = new ArrayList<>();
        for (DataFile f : table.files()) {
            if (!args.contains(f.argument())) {
                args.add(f.argument());
            }
        }
        return String.join(", ", args);
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
