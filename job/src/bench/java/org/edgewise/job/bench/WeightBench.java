package org.edgewise.job.bench;

import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import org.apache.spark.sql.SparkSession;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.StoreFormat;
import org.edgewise.driver.store.StoreReader;
import org.edgewise.job.TallyJob;
import org.edgewise.job.TallyOptions;

/**
 * {@code scripts/bench weight}: a table of counts against its expansion, side by side in one run.
 * By default 20,000 lines × 20 variables (the {@link SyntheticTable} network, seed fixed), each line
 * with a weight drawn uniformly from 1…199 (mean 100), so the expansion has about 2,000,000 rows;
 * d = 3, local[2]. Tallies the expansion, then the table of counts with {@code --weight n}, checks
 * that both stores' Parquet parts are byte-identical and their fingerprints equal, and prints
 * both times and the speedup (target ≥ 10×). A small tally runs first to warm the JVM for both.
 *
 * <p>Options: {@code --lines N --vars N --max-parents d --master URL --dir PATH --seed S}.
 */
public final class WeightBench {
    private WeightBench() {
    }

    public static void main(String[] args) throws IOException {
        Map<String, String> o = new LinkedHashMap<>(Map.of("--lines", "20000", "--vars", "20", "--max-parents", "3",
                "--master", "local[2]", "--dir", "job/target/bench", "--seed", "20261222"));
        for (int i = 0; i + 1 < args.length; i += 2) {
            if (!o.containsKey(args[i])) {
                System.err.println("bench weight: unknown option " + args[i] + " (known: " + o.keySet() + ")");
                System.exit(2);
            }
            o.put(args[i], args[i + 1]);
        }
        int lines = Integer.parseInt(o.get("--lines"));
        int vars = Integer.parseInt(o.get("--vars"));
        int d = Integer.parseInt(o.get("--max-parents"));
        long seed = Long.parseLong(o.get("--seed"));
        Path dir = Path.of(o.get("--dir")).toAbsolutePath();
        Files.createDirectories(dir);
        String stem = "weights-" + lines + "x" + vars + "-" + seed;
        Path counts = dir.resolve(stem + "-counts.csv");
        Path rows = dir.resolve(stem + "-rows.csv");
        long units = writeTables(counts, rows, lines, vars, seed);
        Path tiny = dir.resolve(stem + "-warmup.csv");
        writeTables(tiny, dir.resolve(stem + "-warmup-rows.csv"), 500, vars, seed + 7);

        SparkSession spark = SparkSession.builder().appName("edgewise bench weight").master(o.get("--master"))
                .config("spark.ui.enabled", "false")
                .config("spark.driver.host", "127.0.0.1").config("spark.driver.bindAddress", "127.0.0.1")
                .getOrCreate();
        spark.sparkContext().setLogLevel("WARN");
        try {
            run(spark, tiny, dir.resolve("store-weight-warmup"), d, "n");
            double load0 = TallyBench.loadAverage();
            long c0 = TallyBench.processCpu();
            long t0 = System.nanoTime();
            TallyJob.Summary x = run(spark, rows, dir.resolve("store-weight-expanded"), d, null);
            double xWall = (System.nanoTime() - t0) / 1e9;
            double xCpu = (TallyBench.processCpu() - c0) / 1e9;
            c0 = TallyBench.processCpu();
            t0 = System.nanoTime();
            TallyJob.Summary w = run(spark, counts, dir.resolve("store-weight-counts"), d, "n");
            double wWall = (System.nanoTime() - t0) / 1e9;
            double wCpu = (TallyBench.processCpu() - c0) / 1e9;
            boolean same = x.rows() == units && w.rows() == units && x.fingerprint().equals(w.fingerprint());
            for (String part : List.of(StoreFormat.COUNTS, StoreFormat.SCORES)) {
                same &= Arrays.equals(Files.readAllBytes(dir.resolve("store-weight-expanded").resolve(part)),
                        Files.readAllBytes(dir.resolve("store-weight-counts").resolve(part)));
            }
            StoreReader.read(dir.resolve("store-weight-counts")); // every integrity check of the reader
            StringBuilder r = new StringBuilder();
            r.append(String.format(Locale.ROOT, "weight: %,d lines × %d variables, weights 1…199 (mean 100) = %,d rows expanded;"
                    + " d = %d, %s, %d cores, load average %.1f at start, %.1f at end%n", lines, vars, units, d,
                    o.get("--master"), Runtime.getRuntime().availableProcessors(), load0, TallyBench.loadAverage()));
            r.append(String.format(Locale.ROOT, "  %,d families from %,d variable sets%n", w.families(), w.coverSets()));
            r.append(String.format(Locale.ROOT, "  expanded table (%,d rows):  %.1f s wall, %.1f s CPU%n", x.rows(), xWall, xCpu));
            r.append(String.format(Locale.ROOT, "  --weight n (%,d lines):      %.1f s wall, %.1f s CPU%n", lines, wWall, wCpu));
            r.append(String.format(Locale.ROOT, "  stores identical (Parquet parts byte for byte, fingerprint %s): %s%n",
                    w.fingerprint(), same ? "yes" : "NO"));
            r.append(String.format(Locale.ROOT, "speedup: %.1f× by wall time, %.1f× by CPU time (target ≥ 10×)%n",
                    xWall / wWall, xCpu / wCpu));
            System.out.print(r);
            Files.writeString(dir.resolve("weight-report.txt"), r);
            if (!same) {
                System.exit(1);
            }
        } finally {
            spark.stop();
        }
    }

    static TallyJob.Summary run(SparkSession spark, Path csv, Path store, int d, String weight) {
        TallyOptions opts = new TallyOptions(List.of(csv.toString()), "csv", ',', store, true, d, List.of(),
                List.of(), null, List.of(), List.of(), List.of(), TallyOptions.MissingPolicy.ERROR, 32, Map.of(),
                ScoreKind.BDEU, 1.0, null, 256L << 20, java.nio.charset.StandardCharsets.UTF_8, weight);
        return TallyJob.run(spark, opts);
    }

    /**
     * Writes the table of counts (variables, then the weight column {@code n}) and its expansion
     * (each line repeated w times); returns the number of expanded rows. Same arguments, same bytes.
     */
    static long writeTables(Path counts, Path rows, int lines, int vars, long seed) throws IOException {
        int[][] cells = new ForwardSampler(SyntheticTable.network(vars, 3, 6, seed)).sample(lines, seed + 2);
        Random rnd = new Random(seed + 3);
        long[] w = new long[lines];
        long units = 0;
        for (int t = 0; t < lines; t++) {
            w[t] = 1 + rnd.nextInt(199);
            units += w[t];
        }
        StringBuilder header = new StringBuilder();
        for (int v = 0; v < vars; v++) {
            header.append(v == 0 ? "" : ",").append('v').append(v);
        }
        String[] text = new String[lines];
        for (int t = 0; t < lines; t++) {
            StringBuilder sb = new StringBuilder();
            for (int v = 0; v < vars; v++) {
                sb.append(v == 0 ? "" : ",").append('s').append(cells[t][v]);
            }
            text[t] = sb.toString();
        }
        if (!Files.exists(counts)) {
            AtomicWrite.file(counts, tmp -> {
                try (BufferedWriter out = Files.newBufferedWriter(tmp)) {
                    out.write(header + ",n\n");
                    for (int t = 0; t < lines; t++) {
                        out.write(text[t] + "," + w[t] + "\n");
                    }
                }
            });
        }
        if (!Files.exists(rows)) {
            AtomicWrite.file(rows, tmp -> {
                try (BufferedWriter out = Files.newBufferedWriter(tmp, java.nio.charset.StandardCharsets.UTF_8)) {
                    out.write(header + "\n");
                    for (int t = 0; t < lines; t++) {
                        for (long k = 0; k < w[t]; k++) {
                            out.write(text[t]);
                            out.write('\n');
                        }
                    }
                }
            });
        }
        return units;
    }
}
