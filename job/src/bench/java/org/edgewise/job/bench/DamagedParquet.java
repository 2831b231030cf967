package org.edgewise.job.bench;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;
import java.util.stream.Stream;
import org.apache.spark.sql.SparkSession;
import org.edgewise.driver.AtomicWrite;

/**
 * A fixture of {@code scripts/bench refusals}: a one-file Parquet table of two string columns (20,000
 * rows, uncompressed) whose data pages are overwritten with random bytes while its footer stays intact,
 * so that the schema reads and an executor fails on the data. Usage: {@code DamagedParquet FILE}.
 */
public final class DamagedParquet {
    private DamagedParquet() {
    }

    public static void main(String[] args) throws Exception {
        Path out = Path.of(args[0]).toAbsolutePath();
        Path written = out.resolveSibling(out.getFileName() + "-spark");
        SparkSession spark = SparkSession.builder().appName("damaged parquet").master("local[1]")
                .config("spark.ui.enabled", "false").getOrCreate();
        try {
            spark.sql("SELECT CAST(id % 3 AS STRING) AS a, CAST(id % 7 AS STRING) AS b FROM range(20000)").coalesce(1)
                    .write().option("compression", "none").parquet(written.toString());
        } finally {
            spark.stop();
        }
        try (Stream<Path> s = Files.list(written)) {
            Files.move(s.filter(p -> p.getFileName().toString().endsWith(".parquet")).findFirst().orElseThrow(), out);
        }
        AtomicWrite.deleteTree(written);
        byte[] bytes = Files.readAllBytes(out);
        Random r = new Random(7);
        for (int i = 4; i < bytes.length / 2; i++) {
            bytes[i] = (byte) r.nextInt(256);
        }
        Files.write(out, bytes);
    }
}
