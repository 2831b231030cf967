package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;
import java.util.zip.GZIPOutputStream;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Damaged and mismatched input — a truncated or empty Parquet file, a CSV read as Parquet, a gzip
 * cut at 90 %, Parquet parts whose column types differ, names that differ only by case — is
 * refused in one line naming the file, exit 2, nothing written, the input untouched byte for byte
 * (these ended in a 250–320 line Spark stack trace). Messages word for word.
 */
class CorruptInputTest {
    static SparkSession spark;
    @TempDir
    static Path dir;
    static int cases;

    @BeforeAll
    static void start() {
        spark = SharedSpark.session();
    }

    static void refused(String expected, Path input, String... extra) {
        try {
            byte[] before = Files.isRegularFile(input) ? Files.readAllBytes(input) : null;
            Path outDir = dir.resolve("out" + (cases++));
            List<String> args = new ArrayList<>(List.of("--input", input.toString(), "--out",
                    outDir.resolve("store").toString()));
            args.addAll(List.of(extra));
            TestTables.Run r = TestTables.tally(spark, args.toArray(String[]::new));
            assertEquals(2, r.status(), r.err());
            assertEquals(expected, r.err());
            assertFalse(r.err().contains("\n"), "one line");
            if (before != null) {
                assertArrayEquals(before, Files.readAllBytes(input), "the input is untouched");
            }
            if (Files.exists(outDir)) {
                try (Stream<Path> s = Files.list(outDir)) {
                    assertEquals(List.of(), s.toList(), "nothing written, no temporary left");
                }
            }
        } catch (IOException e) {
            throw new AssertionError(e);
        }
    }

    /** One Parquet part file of {@code d}. */
    static Path parquet(Dataset<Row> d, String name) throws IOException {
        Path tmp = dir.resolve(name + "-spark");
        d.coalesce(1).write().parquet(tmp.toString());
        try (Stream<Path> s = Files.list(tmp)) {
            Path part = s.filter(p -> p.getFileName().toString().endsWith(".parquet")).findFirst().orElseThrow();
            return Files.move(part, dir.resolve(name + ".parquet"));
        }
    }

    @Test
    void damagedParquetAndFormatMismatch() throws IOException {
        Path good = parquet(spark.sql("SELECT CAST(id % 3 AS STRING) AS a, CAST(id % 2 AS STRING) AS b FROM range(500)"),
                "good");
        byte[] bytes = Files.readAllBytes(good);
        Path cut = Files.write(dir.resolve("cut.parquet"), Arrays.copyOf(bytes, bytes.length / 2));
        refused("tally: input " + cut + ": not a readable Parquet file (empty, truncated, damaged or another format);"
                + " for a CSV file pass --format csv", cut);
        Path empty = Files.write(dir.resolve("empty.parquet"), new byte[0]);
        refused("tally: input " + empty + ": not a readable Parquet file (empty, truncated, damaged or another format);"
                + " for a CSV file pass --format csv", empty);
        Path csv = TestTables.write(dir.resolve("really.csv"), "a,b\n1,2\n");
        refused("tally: input " + csv + ": not a readable Parquet file (empty, truncated, damaged or another format);"
                + " for a CSV file pass --format csv", csv, "--format", "parquet");
    }

    @Test
    void parquetPartsOfDifferentTypes() throws IOException {
        Path whole = Files.createDirectory(dir.resolve("mixed"));
        Path ints = parquet(spark.sql("SELECT CAST(id % 3 AS INT) AS a, CAST(id % 2 AS STRING) AS b FROM range(50)"), "i");
        Path strs = parquet(spark.sql("SELECT CAST(id % 3 AS STRING) AS a, CAST(id % 2 AS STRING) AS b FROM range(50)"), "s");
        Files.move(ints, whole.resolve("part-1.parquet"));
        Files.move(strs, whole.resolve("part-2.parquet"));
        refused("tally: input " + whole + "/part-2.parquet: column 'a' is string but int in " + whole
                + "/part-1.parquet; give inputs of one schema", whole);
    }

    @Test
    void aGzipCutShortIsNamed() throws IOException {
        StringBuilder sb = new StringBuilder("a,b\n");
        java.util.Random rnd = new java.util.Random(3);
        for (int t = 0; t < 40_000; t++) {
            sb.append(rnd.nextInt(5)).append(',').append(rnd.nextInt(7)).append('\n');
        }
        Path full = dir.resolve("full.csv.gz");
        try (OutputStream o = new GZIPOutputStream(Files.newOutputStream(full))) {
            o.write(sb.toString().getBytes(StandardCharsets.UTF_8));
        }
        byte[] bytes = Files.readAllBytes(full);
        Path cut = Files.write(dir.resolve("cut.csv.gz"), Arrays.copyOf(bytes, bytes.length * 9 / 10));
        refused("tally: input " + cut + ": cannot read it: the file ends early (truncated or cut off while copying)", cut);
    }

    @Test
    void namesDifferingOnlyByCase() {
        Path csv = TestTables.write(dir.resolve("case.csv"), "a,A\n1,2\n");
        refused("tally: input " + csv + " line 1: column names 'a' and 'A' (columns 1 and 2) differ only by case;"
                + " Spark matches names regardless of case, so rename one", csv);
    }
}
