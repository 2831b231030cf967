package org.edgewise.driver.bench;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.stream.IntStream;
import org.edgewise.driver.store.ParentSets;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderPosterior;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.cli.EdgewiseCli;
import org.edgewise.driver.query.CasePredictor;
import org.edgewise.driver.result.ResultBuilder;
import org.edgewise.driver.result.ResultJson;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.InputInfo;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreFormat;
import org.edgewise.driver.store.StoreReader;
import org.edgewise.driver.store.StoreWriter;
import org.edgewise.driver.store.Variable;

/**
 * {@code scripts/bench order}: builds a score store with n = 40, d = 3 (396,800 families) from a
 * synthetic table, writes it with {@link StoreWriter}, and measures loading it, {@code edges}
 * given an order, and {@code predict} on 100,000 cases. Arguments: [work dir] [rows] [cases].
 *
 * <p>Counting: every variable subset S with |S| ≤ d + 1 is counted once over the rows (a dense
 * joint table of at most 3^4 cells), and each family (i, S \ {i}) is read off it — C(40,≤4) row
 * passes instead of one per family. Memory: the table as bytes (n per row) plus the store.
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
        List<Variable> vars = new ArrayList<>();
        for (int v = 0; v < N; v++) {
            List<String> states = new ArrayList<>();
            for (int k = 0; k < arity[v]; k++) {
                states.add(Character.toString('a' + k));
            }
            vars.add(new Variable(String.format(Locale.ROOT, "x%02d", v), states));
        }
        Network net = Network.random(arity, new Random(40_003L));
        byte[][] cols = net.sampleColumns(rows, new Random(40_004L));
        System.out.printf(Locale.ROOT, "bench order: n = %d, d = %d, %,d rows, %d cores%n", N, D, rows,
                Runtime.getRuntime().availableProcessors());

        Path dir = work.resolve("store");
        if (!reuse || !Files.isDirectory(dir)) {
            build(vars, arity, cols, rows, dir);
        }
        measure(vars, net, dir, work, cases);
    }

    static void build(List<Variable> vars, int[] arity, byte[][] cols, int rows, Path dir) throws IOException {
        long t0 = mark();
        ScoreStore store = tally(vars, arity, cols, rows);
        long countRows = 0;
        for (FamilyCounts fc : store.families()) {
            countRows += fc.rows();
        }
        report("tally (in-memory, subset counting)", t0, String.format(Locale.ROOT, "%,d families, %,d count rows",
                store.families().size(), countRows));
        t0 = mark();
        StoreWriter.write(dir, store.manifest(), store.families(), store.logScores(), true);
        report("write store (StoreWriter)", t0, String.format(Locale.ROOT, "%,d bytes on disk", size(dir)));
    }

    static void measure(List<Variable> vars, Network net, Path dir, Path work, int cases) throws IOException {
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
        LocalScores ls = LocalScores.build(read, ScoringOptions.asStored());
        OrderPosterior op = OrderPosterior.of(ls, order);
        String json = ResultJson.toJson(ResultBuilder.forOrder(op, dir, 5, null));
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
        byte[][] caseCols = net.sampleColumns(cases, new Random(40_005L));
        Random hide = new Random(40_006L);
        int[][] full = new int[cases][N];
        int[][] partial = new int[cases][N];
        for (int c = 0; c < cases; c++) {
            for (int v = 0; v < N; v++) {
                full[c][v] = caseCols[v][c];
                partial[c][v] = hide.nextDouble() < 0.1 ? -1 : caseCols[v][c];
            }
        }
        t0 = mark();
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

    /** Counts every family of at most D parents by counting each variable subset of size ≤ D+1 once. */
    static ScoreStore tally(List<Variable> vars, int[] arity, byte[][] cols, int rows) {
        FamilyScore fs = FamilyScore.withDefaults();
        int[] all = IntStream.range(0, N).toArray();
        List<int[]> subsets = new ArrayList<>();
        for (int size = 1; size <= D + 1; size++) {
            subsets.addAll(ParentSets.subsets(all, size));
        }
        @SuppressWarnings("unchecked")
        List<FamilyCounts>[] perSubset = new List[subsets.size()];
        IntStream.range(0, subsets.size()).parallel().forEach(si -> {
            int[] s = subsets.get(si);
            int cells = 1;
            for (int v : s) {
                cells *= arity[v];
            }
            long[] joint = new long[cells];
            for (int t = 0; t < rows; t++) {
                int code = 0;
                for (int v : s) {
                    code = code * arity[v] + cols[v][t];
                }
                joint[code]++;
            }
            List<FamilyCounts> fams = new ArrayList<>(s.length);
            int[] digit = new int[s.length];
            for (int ci = 0; ci < s.length; ci++) {
                int child = s[ci];
                int r = arity[child];
                int[] parents = new int[s.length - 1];
                int q = 1;
                for (int i = 0, k = 0; i < s.length; i++) {
                    if (i != ci) {
                        parents[k++] = s[i];
                        q *= arity[s[i]];
                    }
                }
                long[] dense = new long[q * r];
                for (int code = 0; code < cells; code++) {
                    if (joint[code] == 0) {
                        continue;
                    }
                    int rest = code;
                    for (int i = s.length - 1; i >= 0; i--) {
                        digit[i] = rest % arity[s[i]];
                        rest /= arity[s[i]];
                    }
                    int j = 0;
                    for (int i = 0; i < s.length; i++) {
                        if (i != ci) {
                            j = j * arity[s[i]] + digit[i];
                        }
                    }
                    dense[j * r + digit[ci]] += joint[code];
                }
                int observed = 0;
                for (int j = 0; j < q; j++) {
                    long nij = 0;
                    for (int k = 0; k < r; k++) {
                        nij += dense[j * r + k];
                    }
                    observed += nij > 0 ? 1 : 0;
                }
                long[] configs = new long[observed];
                long[] counts = new long[observed * r];
                for (int j = 0, m = 0; j < q; j++) {
                    long nij = 0;
                    for (int k = 0; k < r; k++) {
                        nij += dense[j * r + k];
                    }
                    if (nij > 0) {
                        configs[m] = j;
                        System.arraycopy(dense, j * r, counts, m * r, r);
                        m++;
                    }
                }
                fams.add(new FamilyCounts(child, parents, configs, counts));
            }
            perSubset[si] = fams;
        });
        List<List<FamilyCounts>> byChild = new ArrayList<>();
        for (int v = 0; v < N; v++) {
            byChild.add(new ArrayList<>());
        }
        for (List<FamilyCounts> l : perSubset) {
            for (FamilyCounts fc : l) {
                byChild.get(fc.child()).add(fc);
            }
        }
        List<FamilyCounts> families = new ArrayList<>();
        for (List<FamilyCounts> l : byChild) {
            l.sort((a, b) -> a.parents().length != b.parents().length ? Integer.compare(a.parents().length, b.parents().length)
                    : Arrays.compare(a.parents(), b.parents()));
            families.addAll(l);
        }
        double[] scores = new double[families.size()];
        IntStream.range(0, scores.length).parallel().forEach(f -> {
            FamilyCounts fc = families.get(f);
            double q = 1;
            for (int p : fc.parents()) {
                q *= arity[p];
            }
            scores[f] = fs.logScore(fc.counts(), arity[fc.child()], q);
        });
        Manifest m = new Manifest(StoreFormat.VERSION, "edgewise", "bench", Instant.now().toString(),
                new InputInfo(List.of("(synthetic, bench order)"), "memory", rows, 0, "error", "0"),
                vars, D, null, List.of(), List.of(), List.of(), fs.kind().label(), fs.ess(), null);
        return new ScoreStore(m, families, scores);
    }

    /** A random generating network over x00 … x39 in index order: each variable has 0–3 earlier parents. */
    record Network(int[] arity, int[][] parents, double[][][] cpt) {
        static Network random(int[] arity, Random rnd) {
            int n = arity.length;
            int[][] parents = new int[n][];
            double[][][] cpt = new double[n][][];
            for (int v = 0; v < n; v++) {
                int k = Math.min(v, rnd.nextInt(4));
                int[] ps = rnd.ints(0, Math.max(v, 1)).distinct().limit(k).sorted().toArray();
                parents[v] = v == 0 ? new int[0] : ps;
                int q = 1;
                for (int p : parents[v]) {
                    q *= arity[p];
                }
                cpt[v] = new double[q][arity[v]];
                for (int j = 0; j < q; j++) {
                    double s = 0;
                    for (int x = 0; x < arity[v]; x++) {
                        // Skewed draws give dependencies of varied strength.
                        cpt[v][j][x] = Math.pow(rnd.nextDouble(), 3) + 0.02;
                        s += cpt[v][j][x];
                    }
                    for (int x = 0; x < arity[v]; x++) {
                        cpt[v][j][x] /= s;
                    }
                }
            }
            return new Network(arity, parents, cpt);
        }

        byte[][] sampleColumns(int rows, Random rnd) {
            int n = arity.length;
            byte[][] cols = new byte[n][rows];
            for (int t = 0; t < rows; t++) {
                for (int v = 0; v < n; v++) {
                    int j = 0;
                    for (int p : parents[v]) {
                        j = j * arity[p] + cols[p][t];
                    }
                    double u = rnd.nextDouble();
                    int x = 0;
                    while (x < arity[v] - 1 && (u -= cpt[v][j][x]) > 0) {
                        x++;
                    }
                    cols[v][t] = (byte) x;
                }
            }
            return cols;
        }
    }
}
