package org.edgewise.job.input;

import static org.apache.spark.sql.functions.col;

import java.util.ArrayList;
import java.util.List;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.sql.Column;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.catalyst.InternalRow;
import org.apache.spark.storage.StorageLevel;
import org.edgewise.driver.UserError;
import org.edgewise.job.TallyOptions;
import org.edgewise.job.TallyOptions.MissingPolicy;
import org.edgewise.job.input.InputFiles.DataFile;

/**
 * Picks the variables, runs the one statistics pass over the input, refuses bad input with a
 * one-line {@link UserError} (naming the file and the line, column or variable), and derives the
 * {@link Encoding}: ordered states per variable (numeric order when every value is a number,
 * otherwise lexicographic), bins for discretised columns, the missing-value state.
 *
 * <p>The refusals after the pass live in {@link InputRefusals} (line numbers found only on that
 * error path), the derivation of the states and bins in {@link VariableStates}.
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

    /** The one pass's output: the blocks kept for encoding and the merged statistics. */
    private record Pass(JavaRDD<RawBlock> rawBlocks, ColumnStats stats) {
    }

    /**
     * The selected variables' names, in column order; unknown names in --columns/--exclude/--discretize
     * refused, and so are an unknown weight column and a weight column named as a variable.
     */
    public static List<String> selected(Table table, TallyOptions o) {
        List<String> header = table.columns();
        String w = o.weight();
        if (w != null) {
            if (!header.contains(w)) {
                throw new UserError("--weight: no column '" + w + "' in " + inputs(table) + " (columns: "
                        + String.join(", ", header) + ")");
            }
            String by = o.columns().contains(w) ? "--columns"
                    : o.discretize().containsKey(w) ? "--discretize"
                    : o.forbid().stream().anyMatch(e -> e.from().equals(w) || e.to().equals(w)) ? "--forbid"
                    : o.require().stream().anyMatch(e -> e.from().equals(w) || e.to().equals(w)) ? "--require"
                    : o.tiers().stream().anyMatch(t -> t.contains(w)) ? "--tiers" : null;
            if (by != null) {
                throw new UserError("--weight " + w + ": the weight column counts rows and is never a variable, but "
                        + by + " names it");
            }
        }
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
            if ((o.columns().isEmpty() || o.columns().contains(c)) && !o.exclude().contains(c) && !c.equals(w)) {
                names.add(c);
            }
        }
        if (names.isEmpty()) {
            throw new UserError("no variables left after --columns/--exclude" + (w == null ? "" : "/--weight"));
        }
        table.refuseUnusable(names);
        for (String c : names) {
            String why = unnameable(c);
            if (why != null) {
                throw new UserError("input " + inputs(table) + ": column '" + c + "' holds " + why);
            }
        }
        for (String c : o.discretize().keySet()) {
            if (!names.contains(c)) {
                throw new UserError("--discretize: no variable '" + c + "' among the selected columns ("
                        + String.join(", ", names) + ")");
            }
        }
        return names;
    }

    /**
     * Why no query could name variable {@code c}, or null: a comma splits every list of variables
     * (--columns, --tiers, --order, --case a=x,b=y), {@code =} ends a name in NAME=STATE (--case,
     * --given, --do), and {@code ->} splits FROM->TO (--forbid, --require). Such a variable would be
     * stored and then be out of reach of every command, so it is refused before the rows are read.
     */
    static String unnameable(String c) {
        if (c.contains(",")) {
            return "a comma, which splits every list of variables (--columns, --tiers, --order, --case); rename it, "
                    + "or leave it out by listing the other columns in --columns";
        }
        if (c.contains("=")) {
            return "'=', which ends the variable's name in NAME=STATE (--case, --given, --do); rename it, or leave it out "
                    + "with --exclude " + c;
        }
        if (c.contains("->")) {
            return "'->', which splits FROM->TO (--forbid, --require); rename it, or leave it out with --exclude " + c;
        }
        return null;
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
        int weightField = o.weight() == null ? -1 : table.columns().indexOf(o.weight());
        ColumnStats template = new ColumnStats(fields, binned, Math.min(o.maxStates(), 255), drop, table.corruptField(),
                weightField);
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
        InputRefusals.check(table, o, names, fields, binned, stats);
        return new Result(VariableStates.encoding(table, o, names, fields, binned, rawBlocks, stats), rawBlocks, stats);
    }

    static Column quoted(String name) {
        return col("`" + name.replace("`", "``") + "`");
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
}
