package org.edgewise.job.input;

import static org.apache.spark.sql.functions.col;

import java.util.ArrayList;
import java.util.List;
import org.apache.spark.sql.Column;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.sql.types.DataType;
import org.apache.spark.sql.types.DataTypes;
import org.apache.spark.sql.types.StructField;
import org.apache.spark.sql.types.StructType;
import org.edgewise.driver.UserError;
import org.edgewise.job.input.InputFiles.DataFile;

/**
 * The input table as Spark reads it: every header column as a string (field i of a row is column
 * i; null = missing), and for CSV one more field holding the raw line of a malformed row (too many
 * or too few fields; Spark's PERMISSIVE mode), null for a good row.
 *
 * <p>CSV files are read line by line (splittable, so one file is read by many tasks); a file in
 * which a quoted field spans lines is read whole by one task instead (Spark's {@code multiLine}),
 * which {@link TableScan} decides only for files that line-by-line reading finds malformed.
 */
public final class Table {
    /** Name of the extra column Spark fills with the raw text of a malformed CSV row. */
    public static final String CORRUPT = "__edgewise_malformed_row";

    private final SparkSession spark;
    private final List<DataFile> files;
    private final List<String> columns;
    private final boolean csv;
    private final char delimiter;
    /** A caller's Dataset (the Java API, {@code org.edgewise.job.Tally}), or null when reading files. */
    private final Dataset<Row> given;
    private final java.nio.charset.Charset encoding;
    /** URIs of the CSV files read whole ({@code multiLine}) because a quoted field spans lines. */
    private final java.util.Set<String> multiLine;
    /**
     * Columns whose type holds no discrete value (struct, array, map, binary), each with its refusal:
     * refused only when selected as a variable ({@link #refuseUnusable}), read as null otherwise.
     */
    private final java.util.Map<String, String> unusable;

    private Table(SparkSession spark, List<DataFile> files, List<String> columns, boolean csv, char delimiter,
                  Dataset<Row> given, java.nio.charset.Charset encoding, java.util.Set<String> multiLine,
                  java.util.Map<String, String> unusable) {
        this.unusable = java.util.Map.copyOf(unusable);
        this.encoding = encoding;
        this.multiLine = java.util.Set.copyOf(multiLine);
        this.spark = spark;
        this.files = List.copyOf(files);
        this.columns = List.copyOf(columns);
        this.csv = csv;
        this.delimiter = delimiter;
        this.given = given;
    }

    /** The name a caller's Dataset goes by in messages and in the manifest's input paths. */
    public static final String DATASET = "dataset";

    /**
     * A Dataset the caller already has, read like a Parquet input: every column a variable, its
     * values as text. A struct, array, map or binary column is refused (a one-line {@link UserError}
     * naming it and the way to leave it out).
     */
    public static Table of(Dataset<Row> data) {
        List<String> names = new ArrayList<>();
        java.util.Map<String, String> unusable = new java.util.HashMap<>();
        for (StructField field : data.schema().fields()) {
            DataType t = field.dataType();
            if (notDiscrete(t)) {
                unusable.put(field.name(), DATASET + ": column '" + field.name() + "' has type " + t.simpleString()
                        + ", not a discrete value; leave it out with exclude(\"" + field.name() + "\")");
            }
            if (names.contains(field.name())) {
                throw new UserError(DATASET + ": duplicate column name '" + field.name() + "'");
            }
            names.add(field.name());
        }
        if (names.isEmpty()) {
            throw new UserError(DATASET + ": the Dataset has no columns");
        }
        return new Table(data.sparkSession(), List.of(new DataFile(DATASET, DATASET, DATASET)), names, false, ',', data,
                java.nio.charset.StandardCharsets.UTF_8, java.util.Set.of(), unusable);
    }

    /** Resolves the inputs and reads their headers (no Spark job runs yet). */
    public static Table open(SparkSession spark, List<String> inputs, String format, char delimiter) {
        return open(spark, inputs, format, delimiter, java.nio.charset.StandardCharsets.UTF_8);
    }

    /** As {@link #open(SparkSession, List, String, char)} for CSV text in {@code encoding}. */
    public static Table open(SparkSession spark, List<String> inputs, String format, char delimiter,
                             java.nio.charset.Charset encoding) {
        var conf = spark.sparkContext().hadoopConfiguration();
        List<DataFile> files = InputFiles.resolve(inputs, format, conf);
        boolean csv = files.get(0).format().equals("csv");
        List<String> columns;
        java.util.Map<String, String> unusable = new java.util.HashMap<>();
        if (csv) {
            List<List<String>> headers = new ArrayList<>();
            for (DataFile f : files) {
                headers.add(InputFiles.csvHeader(f, delimiter, encoding, conf));
            }
            InputFiles.sameColumns(files, headers);
            columns = headers.get(0);
        } else {
            List<List<String>> headers = new ArrayList<>();
            List<StructType> schemas = new ArrayList<>();
            for (DataFile f : files) {
                StructType schema = parquetSchema(spark, f);
                schemas.add(schema);
                headers.add(parquetColumns(f, schema, unusable));
            }
            InputFiles.sameColumns(files, headers);
            sameTypes(files, schemas);
            columns = headers.get(0);
        }
        return new Table(spark, files, columns, csv, delimiter, null, encoding, java.util.Set.of(), unusable);
    }

    /** This table with {@code whole} (CSV files of it) read whole, as records that may span lines. */
    public Table withMultiLine(java.util.Collection<DataFile> whole) {
        java.util.Set<String> uris = new java.util.HashSet<>(multiLine);
        whole.forEach(f -> uris.add(f.uri()));
        return new Table(spark, files, columns, csv, delimiter, given, encoding, uris, unusable);
    }

    /** True when {@code f} is read whole because a quoted field of it spans lines. */
    public boolean isMultiLine(DataFile f) {
        return multiLine.contains(f.uri());
    }

    /** True when some file is read whole (one task per such file). */
    public boolean anyMultiLine() {
        return !multiLine.isEmpty();
    }

    /**
     * The schema from the file's footer; an empty, truncated or non-Parquet file is refused here
     * (Spark throws a checked {@code SparkException} undeclared, hence {@code catch (Exception)}).
     */
    private static StructType parquetSchema(SparkSession spark, DataFile f) {
        try {
            return spark.read().parquet(f.uri()).schema();
        } catch (Exception e) {
            String reason = ReadFailure.inputReason(e);
            if (reason != null && reason.startsWith("I/O error")) {
                throw new UserError("input " + InputFiles.display(f) + ": cannot read it: " + reason, e);
            }
            throw new UserError("input " + InputFiles.display(f) + ": not a readable Parquet file (empty, truncated,"
                    + " damaged or another format); for a CSV file pass --format csv", e);
        }
    }

    /** Every Parquet input's columns must have the first file's types (Spark reads all with the first schema). */
    private static void sameTypes(List<DataFile> files, List<StructType> schemas) {
        for (int i = 1; i < files.size(); i++) {
            for (StructField field : schemas.get(i).fields()) {
                DataType first = schemas.get(0).apply(field.name()).dataType();
                if (!first.equals(field.dataType())) {
                    throw new UserError("input " + InputFiles.display(files.get(i)) + ": column '" + field.name()
                            + "' is " + field.dataType().simpleString() + " but " + first.simpleString() + " in "
                            + InputFiles.display(files.get(0)) + "; give inputs of one schema");
                }
            }
        }
    }

    private static List<String> parquetColumns(DataFile f, StructType schema, java.util.Map<String, String> unusable) {
        List<String> names = new ArrayList<>();
        for (StructField field : schema.fields()) {
            DataType t = field.dataType();
            if (notDiscrete(t)) {
                unusable.putIfAbsent(field.name(), "input " + InputFiles.display(f) + ": column '" + field.name()
                        + "' has type " + t.simpleString() + ", not a discrete value; drop it with --exclude " + field.name());
            }
            if (names.contains(field.name())) {
                throw new UserError("input " + InputFiles.display(f) + ": duplicate column name '" + field.name() + "'");
            }
            for (String other : names) {
                if (other.equalsIgnoreCase(field.name())) {
                    throw new UserError("input " + InputFiles.display(f) + ": column names '" + other + "' and '"
                            + field.name() + "' differ only by case; Spark matches names regardless of case, so"
                            + " rename one");
                }
            }
            if (field.name().isBlank()) {
                throw new UserError("input " + InputFiles.display(f) + ": column " + (names.size() + 1) + " has no name");
            }
            names.add(field.name());
        }
        if (names.isEmpty()) {
            throw new UserError("input " + InputFiles.display(f) + ": the file has no columns");
        }
        return names;
    }

    /** A type that holds no discrete value: a struct, array, map or binary column. */
    private static boolean notDiscrete(DataType t) {
        return t instanceof StructType || t instanceof org.apache.spark.sql.types.ArrayType
                || t instanceof org.apache.spark.sql.types.MapType || t instanceof org.apache.spark.sql.types.BinaryType;
    }

    /** Refuses the first of {@code selected} whose type holds no discrete value (the rest are never read). */
    public void refuseUnusable(List<String> selected) {
        for (String c : selected) {
            String why = unusable.get(c);
            if (why != null) {
                throw new UserError(why);
            }
        }
    }

    public SparkSession spark() {
        return spark;
    }

    public List<DataFile> files() {
        return files;
    }

    public List<String> columns() {
        return columns;
    }

    public boolean isCsv() {
        return csv;
    }

    /** {@code csv}, {@code parquet}, or {@code dataset} for a caller's Dataset (the manifest's input format). */
    public String format() {
        return given != null ? DATASET : csv ? "csv" : "parquet";
    }

    /** Index of the malformed-row field in a row (CSV only), or −1. */
    public int corruptField() {
        return csv ? columns.size() : -1;
    }

    /** Every input file's rows. */
    public Dataset<Row> rows() {
        return read(InputFiles.uris(files));
    }

    /**
     * Every input file's rows as Spark's internal rows (values as UTF-8 bytes, no per-value String):
     * what the one full read uses. The rows are reused by the reader: copy one to keep it.
     */
    public org.apache.spark.api.java.JavaRDD<org.apache.spark.sql.catalyst.InternalRow> internalRows() {
        return rows().queryExecution().toRdd().toJavaRDD();
    }

    /** The rows of one file, in file order (for locating a bad row's line). */
    public Dataset<Row> rowsOf(DataFile f) {
        return read(f.uri());
    }

    private Dataset<Row> read(String... uris) {
        if (given != null) {
            return asText(given);
        }
        if (csv) {
            List<String> lines = new ArrayList<>();
            List<String> whole = new ArrayList<>();
            for (String u : uris) {
                (multiLine.contains(u) ? whole : lines).add(u);
            }
            Dataset<Row> d = lines.isEmpty() ? null : csv(false, lines.toArray(String[]::new));
            // read whole, a line of only spaces or tabs is a one-field row; line by line it is no row
            Dataset<Row> w = whole.isEmpty() ? null : csv(true, whole.toArray(String[]::new))
                    .filter(col(CORRUPT).isNull().or(org.apache.spark.sql.functions.not(col(CORRUPT).rlike("^[\\x00-\\x20]*$"))));
            return d == null ? w : w == null ? d : d.union(w);
        }
        return asText(spark.read().parquet(uris));
    }

    /** CSV rows, line by line or ({@code wholeFile}) as records that may span lines. */
    private Dataset<Row> csv(boolean wholeFile, String... uris) {
        List<StructField> fields = new ArrayList<>();
        for (String c : columns) {
            fields.add(DataTypes.createStructField(c, DataTypes.StringType, true));
        }
        fields.add(DataTypes.createStructField(CORRUPT, DataTypes.StringType, true));
        return spark.read().format("csv")
                .schema(DataTypes.createStructType(fields))
                .option("header", "true")
                .option("enforceSchema", "true")
                .option("sep", String.valueOf(delimiter))
                .option("quote", "\"")
                .option("escape", "\"") // RFC 4180: a doubled quote inside a quoted field is one quote
                .option("encoding", encoding.name())
                .option("mode", "PERMISSIVE")
                .option("columnNameOfCorruptRecord", CORRUPT)
                .option("multiLine", String.valueOf(wholeFile))
                .load(uris);
    }

    /** The selected columns of {@code d}, each as text. */
    private Dataset<Row> asText(Dataset<Row> d) {
        List<Column> cs = new ArrayList<>();
        for (String c : columns) {
            cs.add(unusable.containsKey(c) ? org.apache.spark.sql.functions.lit(null).cast(DataTypes.StringType).as(c)
                    : col("`" + c.replace("`", "``") + "`").cast(DataTypes.StringType).as(c));
        }
        return d.select(cs.toArray(Column[]::new));
    }

    /** "line" for CSV (header = line 1), "row" for Parquet. */
    public String unit() {
        return csv ? "line" : "row";
    }

    /**
     * The line (CSV) or row (Parquet) number of the zero-based data-row index within file {@code f}.
     * A CSV line number counts every physical line of the file, blank ones and those inside quoted
     * fields included, and names the line where the row starts; it is found by reading the file up
     * to that row (on the error path only).
     */
    public long lineOf(DataFile f, long index) {
        return csv ? InputFiles.physicalLine(f, index, isMultiLine(f), delimiter, encoding,
                spark.sparkContext().hadoopConfiguration()) : index + 1;
    }

    public char delimiter() {
        return delimiter;
    }

    public java.nio.charset.Charset encoding() {
        return encoding;
    }
}
