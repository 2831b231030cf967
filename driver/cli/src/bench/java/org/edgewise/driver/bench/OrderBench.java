package org.edgewise.driver.bench;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.stream.IntStream;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.cli.EdgewiseCli;
import org.edgewise.driver.query.CasePredictor;
import org.edgewise.driver.analysis.EdgeAnalysis;
import org.edgewise.driver.result.ResultJson;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreReader;
import org.edgewise.driver.store.StoreWriter;
import org.edgewise.driver.store.Variable;

/**
 * {@code scripts/bench order}: builds a score store with n = 40, d = 3 (396,800 families) from a
 * synthetic table, writes it with {@link StoreWriter}, and measures loading it, {@code edges}
 * given an order, and {@code predict} on 100,000 cases. Arguments: [work dir] [rows] [cases].
 *
 * <p>Data: a {@link RandomNetwork} sampled by the one {@link ForwardSampler}, counted by the
 * reference {@link InMemoryTally}. Memory: the table (4 bytes per cell) plus the store.
 */
public final class OrderBench {
    static final int N = 40;
    static final int D = 3;

    private OrderBench() {
    }

    public static void main(String[] args) throws Exception {
        Path work = Path.of(args.length > 0 ? args[0] : "target/bench-order");
        int rows = args.length > 1 ? Integer.parseInt(args[1]) : 20_000;
        int cases = args.length > 2 ? Integer.parseInt(args[2]) : 100_000;
        boolean reuse = args.length > 3 && args[3].equals("--reuse-store");
        Files.createDirectories(work);
        int[] arity = new int[N];
        for (int v = 0; v < N; v++) {
            arity[v] = v % 3 == 0 ? 3 : 2;
        }
        // Up to three earlier parents per variable; skewed rows (u³ + 0.02) give dependencies of varied strength.
        Network net = RandomNetwork.generate("x", arity, 3, N, 3, 0.02, 40_003L);
        List<Variable> vars = RandomNetwork.variables(net);
        ForwardSampler sampler = new ForwardSampler(net);
        int[][] data = sampler.sample(rows, 40_004L);
        System.out.printf(Locale.ROOT, "bench order: n = %d, d = %d, %,d rows, %d cores%n", N, D, rows,
                Runtime.getRuntime().availableProcessors());

        Path dir = work.resolve("store");
        if (!reuse || !Files.isDirectory(dir)) {
            build(vars, data, dir);
        }
        measure(vars, sampler, dir, work, cases);
    }

    static void build(List<Variable> vars, int[][] data, Path dir) throws IOException {
        long t0 = mark();
        ScoreStore store = InMemoryTally.tally(vars, data, D, FamilyScore.withDefaults());
        long countRows = 0;
        for (FamilyCounts fc : store.families()) {
            countRows += fc.rows();
        }
        report("tally (InMemoryTally, a child per thread)", t0, String.format(Locale.ROOT, "%,d families, %,d count rows",
                store.families().size(), countRows));
        t0 = mark();
        StoreWriter.write(dir, store.manifest(), store.families(), store.logScores(), true);
        report("write store (StoreWriter)", t0, String.format(Locale.ROOT, "%,d bytes on disk", size(dir)));
    }

    static void measure(List<Variable> vars, ForwardSampler sampler, Path dir, Path work, int cases) throws IOException {
        long t0 = mark();
        ScoreStore read = StoreReader.read(dir);
        report("load store (StoreReader.read)", t0, String.format(Locale.ROOT, "%,d families", read.families().size()));
        // A second read: the JIT is warm.
        t0 = mark();
        read = StoreReader.read(dir);
        report("load store again (warm JVM)", t0, "column-level Parquet reading");

        int[] order = IntStream.range(0, N).toArray();
        StringBuilder orderText = new StringBuilder();
        for (int v : order) {
            orderText.append(orderText.length() == 0 ? "" : ",").append(vars.get(v).name());
        }
        t0 = mark();
        String json = ResultJson.toJson(EdgeAnalysis.run(read, dir, List.of(ScoringOptions.asStored()), order, null, 5,
                ProgressListener.NONE, r -> { }));
        report("edges given the order, store in memory", t0, String.format(Locale.ROOT, "%,d bytes of JSON", json.length()));
        t0 = mark();
        OrderPosterior rescored = OrderPosterior.of(LocalScores.build(read, ScoringOptions.asStored().withEss(10)), order);
        report("edges, rescored to ESS 10 from the counts", t0,
                String.format(Locale.ROOT, "log evidence %.3f", rescored.result().logEvidence()));
        Path edgesOut = work.resolve("edges.json");
        t0 = mark();
        int status = EdgewiseCli.execute("edges", "--store", dir.toString(), "--order", orderText.toString(),
                "--out", edgesOut.toString());
        report("edges command end to end (load + compute + write)", t0, "exit " + status);

        // 100,000 held-out cases from the generating network; 10% of cells hidden.
        int[][] full = sampler.sample(cases, 40_005L);
        Random hide = new Random(40_006L);
        int[][] partial = new int[cases][N];
        for (int c = 0; c < cases; c++) {
            for (int v = 0; v < N; v++) {
                partial[c][v] = hide.nextDouble() < 0.1 ? -1 : full[c][v];
            }
        }
        t0 = mark();
        LocalScores ls = LocalScores.build(read, ScoringOptions.asStored());
        OrderPosterior op = OrderPosterior.of(ls, order);
        CasePredictor avg = CasePredictor.averaged(op, 1e-12);
        CasePredictor exact = CasePredictor.averaged(op, 0);
        report("predictor set-up (posterior weights once)", t0, String.format(Locale.ROOT,
                "%,d parent sets kept of %,d (tail mass 1e-12), exact keeps %,d", avg.keptSets(), IntStream.range(0, N).mapToLong(ls::setCount).sum(), exact.keptSets()));
        rate("predict complete cases, averaged (tail 1e-12)", avg, full);
        rate("predict complete cases, averaged exact (tail 0)", exact, Arrays.copyOf(full, Math.min(cases, 1_000)));
        rate("predict cases with 10% hidden, averaged", avg, partial);
        rate("predict complete cases, best network", CasePredictor.bestNetwork(op), full);

        Path csv = work.resolve("cases.csv");
        writeCases(csv, vars, partial);
        Path scored = work.resolve("scored.csv");
        t0 = mark();
        status = EdgewiseCli.execute("predict", "--store", dir.toString(), "--order", orderText.toString(),
                "--cases", csv.toString(), "--out", scored.toString());
        report("predict command --cases end to end", t0, String.format(Locale.ROOT,
                "%,d cases, exit %d (includes loading the store, reading and writing CSV)", cases, status));
    }

    static void rate(String what, CasePredictor p, int[][] cases) {
        for (int w = 0; w < Math.min(2000, cases.length); w++) {
            p.logProbability(cases[w]); // warm-up
        }
        long t0 = mark();
        double sum = IntStream.range(0, cases.length).parallel().mapToDouble(i -> p.logProbability(cases[i])).sum();
        double s = (System.nanoTime() - t0) / 1e9;
        double cpu = (cpuNanos() - cpuMark) / 1e9;
        System.out.printf(Locale.ROOT, "%-50s %8.2f s wall %8.2f s cpu   %,.0f cases/s wall, %,.0f cases per cpu-second (%,d cases; mean log P %.4f)%n",
                what, s, cpu, cases.length / s, cases.length / cpu, cases.length, sum / cases.length);
        System.out.flush();
    }

    /** Wall-clock seconds and CPU seconds of the whole process since the marks (the machine may be shared). */
    static void report(String what, long t0, String extra) {
        double cpu = (cpuNanos() - cpuMark) / 1e9;
        System.out.printf(Locale.ROOT, "%-50s %8.2f s wall %8.2f s cpu   %s%n", what, (System.nanoTime() - t0) / 1e9, cpu, extra);
        System.out.flush();
        cpuMark = cpuNanos();
    }

    static long cpuMark = cpuNanos();

    static long cpuNanos() {
        var os = java.lang.management.ManagementFactory.getOperatingSystemMXBean();
        return os instanceof com.sun.management.OperatingSystemMXBean sun ? sun.getProcessCpuTime() : 0;
    }

    static long mark() {
        cpuMark = cpuNanos();
        return System.nanoTime();
    }

    static long size(Path dir) throws IOException {
        try (var s = Files.list(dir)) {
            return s.mapToLong(p -> {
                try {
                    return Files.size(p);
                } catch (IOException e) {
                    throw new UncheckedIOException(e);
                }
            }).sum();
        }
    }

    static void writeCases(Path csv, List<Variable> vars, int[][] cases) throws IOException {
        StringBuilder sb = new StringBuilder();
        for (int v = 0; v < N; v++) {
            sb.append(v == 0 ? "" : ",").append(vars.get(v).name());
        }
        sb.append('\n');
        for (int[] c : cases) {
            for (int v = 0; v < N; v++) {
                if (v > 0) {
                    sb.append(',');
                }
                if (c[v] >= 0) {
                    sb.append(vars.get(v).states().get(c[v]));
                }
            }
            sb.append('\n');
        }
        Files.writeString(csv, sb);
    }
}
