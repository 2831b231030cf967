package org.edgewise.job.bench;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import org.apache.spark.sql.Column;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.storage.StorageLevel;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.job.TallyJob;
import org.edgewise.job.TallyOptions;

/**
 * {@code scripts/bench tally}: times the tally of a synthetic table (by default 2,000,000 rows ×
 * 20 variables of 2–4 states sampled from a random network with a fixed seed, d = 3, local[2]) and,
 * in the same run on the same cached data, the plain Spark SQL way — one
 * {@code groupBy(child, parents…).count()} per family — on a sample of families, and prints the
 * per-family speedup. Not a test: speed is measured here, never in unit tests.
 *
 * <p>Options: {@code --rows N --vars N --max-parents d --sample K --master URL --dir PATH}.
 */
public final class TallyBench {
    private TallyBench() {
    }

    public static void main(String[] args) throws IOException {
        Map<String, String> o = new LinkedHashMap<>(Map.of("--rows", "2000000", "--vars", "20", "--max-parents", "3",
                "--sample", "8", "--master", "local[2]", "--dir", "job/target/bench", "--seed", "20261201"));
        for (int i = 0; i + 1 < args.length; i += 2) {
            if (!o.containsKey(args[i])) {
                System.err.println("bench tally: unknown option " + args[i] + " (known: " + o.keySet() + ")");
                System.exit(2);
            }
            o.put(args[i], args[i + 1]);
        }
        int rows = Integer.parseInt(o.get("--rows"));
        int vars = Integer.parseInt(o.get("--vars"));
        int d = Integer.parseInt(o.get("--max-parents"));
        int sample = Integer.parseInt(o.get("--sample"));
        long seed = Long.parseLong(o.get("--seed"));
        Path dir = Path.of(o.get("--dir")).toAbsolutePath();
        Files.createDirectories(dir);
        Path csv = dir.resolve("synthetic-" + rows + "x" + vars + "-" + seed + ".csv");
        if (!Files.exists(csv)) {
            long t0 = System.nanoTime();
            SyntheticTable.generate(csv, rows, vars, 3, 6, seed);
            System.out.printf(Locale.ROOT, "generated %s (%d rows × %d variables) in %.1f s%n", csv.getFileName(), rows,
                    vars, (System.nanoTime() - t0) / 1e9);
        }

        SparkSession spark = SparkSession.builder().appName("edgewise bench tally").master(o.get("--master"))
                .config("spark.ui.enabled", "false")
                .config("spark.driver.host", "127.0.0.1").config("spark.driver.bindAddress", "127.0.0.1")
                .getOrCreate();
        spark.sparkContext().setLogLevel("WARN");
        try {
            Path store = dir.resolve("store-" + rows + "x" + vars);
            TallyOptions opts = new TallyOptions(List.of(csv.toString()), "csv", ',', store, true, d, List.of(),
                    List.of(), null, List.of(), List.of(), List.of(), TallyOptions.MissingPolicy.ERROR, 32, Map.of(),
                    ScoreKind.BDEU, 1.0, null, 256L << 20);
            double load0 = loadAverage();
            long c0 = processCpu();
            long t0 = System.nanoTime();
            TallyJob.Summary s = TallyJob.run(spark, opts);
            double wall = (System.nanoTime() - t0) / 1e9;
            double cpu = (processCpu() - c0) / 1e9;
            double perFamily = wall / s.families();
            double familyRows = (double) s.families() * s.rows();

            // the plain way, on the same data cached in Spark's columnar cache (favourable to it)
            Dataset<Row> df = spark.read().option("header", "true").csv(csv.toString())
                    .persist(StorageLevel.MEMORY_AND_DISK());
            df.count();
            Random rnd = new Random(seed);
            List<String> names = Arrays.asList(df.columns());
            double plainTotal = 0;
            long pc0 = processCpu();
            long check = 0;
            List<String> sampled = new ArrayList<>();
            for (int k = 0; k < sample; k++) {
                List<String> fam = new ArrayList<>(names);
                java.util.Collections.shuffle(fam, rnd);
                fam = fam.subList(0, d + 1);
                long f0 = System.nanoTime();
                List<Row> groups = df.groupBy(fam.stream().map(Column::new).toArray(Column[]::new)).count().collectAsList();
                plainTotal += (System.nanoTime() - f0) / 1e9;
                for (Row g : groups) {
                    check += g.getLong(d + 1);
                }
                sampled.add(fam.get(0) + "<-" + String.join(",", fam.subList(1, fam.size())));
            }
            double plainCpu = (processCpu() - pc0) / 1e9;
            df.unpersist();
            if (check != (long) sample * rows) {
                throw new IllegalStateException("plain counts sum to " + check);
            }
            double plainPerFamily = plainTotal / sample;
            long peakHeap = 0;
            for (MemoryPoolMXBean p : ManagementFactory.getMemoryPoolMXBeans()) {
                if (p.getType() == MemoryType.HEAP) {
                    peakHeap += p.getPeakUsage().getUsed();
                }
            }
            String rss = peakRss();
            StringBuilder r = new StringBuilder();
            r.append(String.format(Locale.ROOT, "tally: %d rows × %d variables, d = %d, %s, %d cores available%n", rows,
                    vars, d, o.get("--master"), Runtime.getRuntime().availableProcessors()));
            r.append(String.format(Locale.ROOT, "  families %,d from %,d variable sets (%,d cells) in %d pass(es)%n",
                    s.families(), s.coverSets(), s.cells(), s.batches()));
            r.append(String.format(Locale.ROOT, "  wall time (read + check + encode + count + score + write): %.1f s%n", wall));
            r.append(String.format(Locale.ROOT, "  family-rows per second: %,.0f (%,.0f family-rows)%n", familyRows / wall, familyRows));
            r.append(String.format(Locale.ROOT, "  CPU time of the process: %.1f s (load average %.1f at start, %.1f at end, on %d cores)%n",
                    cpu, load0, loadAverage(), Runtime.getRuntime().availableProcessors()));
            r.append(String.format(Locale.ROOT, "  per family: %.3f ms wall, %.3f ms CPU%n", perFamily * 1e3, cpu / s.families() * 1e3));
            r.append(String.format(Locale.ROOT, "  peak JVM heap used: %,d MB; peak RSS: %s%n", peakHeap >> 20, rss));
            r.append(String.format(Locale.ROOT, "plain Spark SQL groupBy(child, parents…).count() on %d sampled families of %d variables (cached input):%n",
                    sample, d + 1));
            r.append(String.format(Locale.ROOT, "  per family: %.3f s wall, %.3f s CPU (total %.1f s wall, %.1f s CPU)%n",
                    plainPerFamily, plainCpu / sample, plainTotal, plainCpu));
            r.append(String.format(Locale.ROOT, "speedup per family: %.0f× by wall time, %.0f× by CPU time (target ≥ 50×); whole tally %.1f s (target ≤ 60 s)%n",
                    plainPerFamily / perFamily, (plainCpu / sample) / (cpu / s.families()), wall));
            System.out.print(r);
            Files.writeString(dir.resolve("tally-report.txt"), r + "sampled families: " + sampled + "\n");
        } finally {
            spark.stop();
        }
    }

    /** CPU time of the whole process (every thread: Spark's driver and local executors), ns. */
    static long processCpu() {
        var os = ManagementFactory.getOperatingSystemMXBean();
        if (os instanceof com.sun.management.OperatingSystemMXBean sun) {
            return sun.getProcessCpuTime();
        }
        return 0;
    }

    static double loadAverage() {
        return ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage();
    }

    /** Peak resident set size from /proc (Linux), or "n/a". */
    static String peakRss() {
        try {
            for (String line : Files.readAllLines(Path.of("/proc/self/status"))) {
                if (line.startsWith("VmHWM:")) {
                    long kb = Long.parseLong(line.replaceAll("[^0-9]", ""));
                    return String.format(Locale.ROOT, "%,d MB", kb >> 10);
                }
            }
        } catch (IOException | RuntimeException e) {
            return "n/a";
        }
        return "n/a";
    }
}
