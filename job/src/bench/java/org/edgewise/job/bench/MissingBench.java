package org.edgewise.job.bench;

import java.io.BufferedReader;
import java.io.BufferedWriter;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import org.apache.spark.sql.SparkSession;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.job.AugmentedTally;
import org.edgewise.job.TallyJob;
import org.edgewise.job.TallyOptions;

/**
 * {@code scripts/bench missing}: {@code tally --missing average} on a synthetic table (by default
 * 1,000,000 rows × 20 variables, d = 3, local[2], rounds until converged) whose rows are incomplete with a probability that
 * depends on the observed first variable (missing at random; 30 % of the rows on average, one or two
 * cells hidden in each, never v0), beside a plain tally of the complete table in the same run: the
 * time of every round, of the one count of the complete rows, and in all, and the largest R̂ over
 * rounds. Not a test.
 *
 * <p>Options: {@code --rows N --vars N --max-parents d --rounds R --incomplete SHARE --master URL --dir PATH}.
 */
public final class MissingBench {
    private MissingBench() {
    }

    public static void main(String[] args) throws IOException {
        Map<String, String> o = new LinkedHashMap<>(Map.of("--rows", "1000000", "--vars", "20", "--max-parents", "3",
                "--rounds", "until-converged", "--incomplete", "0.3", "--master", "local[2]", "--dir", "job/target/bench",
                "--seed", "20261205"));
        for (int i = 0; i + 1 < args.length; i += 2) {
            if (!o.containsKey(args[i])) {
                System.err.println("bench missing: unknown option " + args[i] + " (known: " + o.keySet() + ")");
                System.exit(2);
            }
            o.put(args[i], args[i + 1]);
        }
        int rows = Integer.parseInt(o.get("--rows"));
        int vars = Integer.parseInt(o.get("--vars"));
        int d = Integer.parseInt(o.get("--max-parents"));
        Integer rounds = o.get("--rounds").equals("until-converged") ? null : Integer.valueOf(o.get("--rounds"));
        double share = Double.parseDouble(o.get("--incomplete"));
        long seed = Long.parseLong(o.get("--seed"));
        Path dir = Path.of(o.get("--dir")).toAbsolutePath();
        Files.createDirectories(dir);
        Path csv = dir.resolve("synthetic-" + rows + "x" + vars + "-" + seed + ".csv");
        if (!Files.exists(csv)) {
            SyntheticTable.generate(csv, rows, vars, 3, 6, seed);
        }
        Path masked = dir.resolve("masked-" + rows + "x" + vars + "-" + seed + "-" + share + ".csv");
        Path alone = dir.resolve("incomplete-" + rows + "x" + vars + "-" + seed + "-" + share + ".csv");
        if (!Files.exists(masked) || !Files.exists(alone)) {
            mask(csv, masked, alone, share, seed);
        }
        SparkSession spark = SparkSession.builder().appName("edgewise bench missing").master(o.get("--master"))
                .config("spark.ui.enabled", "false")
                .config("spark.driver.host", "127.0.0.1").config("spark.driver.bindAddress", "127.0.0.1")
                .getOrCreate();
        spark.sparkContext().setLogLevel("WARN");
        String loadStart = load();
        try {
            long t0 = System.nanoTime();
            TallyJob.Summary plain = TallyJob.run(spark, options(csv, dir.resolve("store-complete"), d,
                    TallyOptions.MissingPolicy.ERROR, null));
            double plainSeconds = (System.nanoTime() - t0) / 1e9;
            // the incomplete rows alone, their values before masking: one counting pass of a plain tally,
            // timed just before and just after the rounds (the machine's load changes over a run)
            TallyOptions aloneOptions = options(alone, dir.resolve("store-unused"), d, TallyOptions.MissingPolicy.ERROR, null);
            double countBefore = org.edgewise.job.CountTiming.countSeconds(spark, aloneOptions);
            long t1 = System.nanoTime();
            TallyJob.Summary avg = TallyJob.run(spark, options(masked, dir.resolve("store-average"), d,
                    TallyOptions.MissingPolicy.AVERAGE, rounds));
            double avgSeconds = (System.nanoTime() - t1) / 1e9;
            double countAfter = org.edgewise.job.CountTiming.countSeconds(spark, aloneOptions);
            double countIncomplete = (countBefore + countAfter) / 2;
            AugmentedTally.Report r = avg.missingValues();
            StringBuilder sb = new StringBuilder();
            sb.append(String.format(Locale.ROOT, "missing: %,d rows × %d variables, d = %d, %s, %d cores, load average %s at the"
                    + " start, %s at the end%n", rows, vars, d, o.get("--master"), Runtime.getRuntime().availableProcessors(),
                    loadStart, load()));
            sb.append(String.format(Locale.ROOT, "  plain tally of the complete table: %,d families in %.1f s%n",
                    plain.families(), plainSeconds));
            sb.append(String.format(Locale.ROOT, "  --missing average: %,d incomplete rows (%.1f%%), %d rounds × %d chains%s,"
                    + " burn-in %d: %.1f s in all%n", r.incompleteRows(), 100 * r.incompleteRowShare(), r.rounds(), r.chains(),
                    rounds == null ? " (until converged)" : "", r.burnIn(), avgSeconds));
            sb.append(String.format(Locale.ROOT, "    complete rows counted once: %.1f s%n", r.completeRowsSeconds()));
            double sum = 0;
            StringBuilder each = new StringBuilder();
            for (double s : r.roundSeconds()) {
                sum += s;
                each.append(each.length() == 0 ? "" : " ").append(String.format(Locale.ROOT, "%.1f", s));
            }
            double perRound = sum / r.roundSeconds().length;
            sb.append(String.format(Locale.ROOT, "    per round (every chain): mean %.1f s [%s]%n", perRound, each));
            sb.append(String.format(Locale.ROOT, "    per round and chain: %.1f s; the plain tally's time scaled to the"
                    + " incomplete rows: %.1f s (ratio %.2f)%n", perRound / r.chains(), plainSeconds * r.incompleteRowShare(),
                    perRound / r.chains() / (plainSeconds * r.incompleteRowShare())));
            sb.append(String.format(Locale.ROOT, "    counting the incomplete rows alone (a plain tally's counting pass over"
                    + " their values before masking: count, marginalise, score; before and after the rounds): %.1f s and %.1f s,"
                    + " mean %.1f s; per round %.2f×, per round and chain %.2f×%n", countBefore, countAfter, countIncomplete,
                    perRound / countIncomplete, perRound / r.chains() / countIncomplete));
            sb.append(String.format(Locale.ROOT, "    largest split-R̂ over rounds %.4f, %s%n", r.maxRhat(),
                    r.converged() ? "converged" : "not converged"));
            System.out.print(sb);
        } finally {
            spark.stop();
        }
    }

    static TallyOptions options(Path csv, Path store, int d, TallyOptions.MissingPolicy policy, Integer rounds) {
        return new TallyOptions(List.of(csv.toString()), "csv", ',', store, true, d, List.of(), List.of(), null, List.of(),
                List.of(), List.of(), policy, 32, Map.of(), ScoreKind.BDEU, 1.0, null, 256L << 20,
                java.nio.charset.StandardCharsets.UTF_8, null, null, rounds, null);
    }

    /**
     * Hides one or two cells (never v0's) of a row with a probability that depends on the observed v0
     * (missing at random): three times as likely when v0 is not in its first state, scaled so that
     * {@code share} of the rows are incomplete on average (v0's first-state frequency counted first); {@code alone}
     * gets the incomplete rows with their values before masking.
     */
    static void mask(Path in, Path out, Path alone, double share, long seed) throws IOException {
        String s0 = firstState(in);
        long first = 0;
        long all = 0;
        try (BufferedReader r = Files.newBufferedReader(in)) {
            r.readLine();
            for (String line; (line = r.readLine()) != null; ) {
                all++;
                if (line.substring(0, line.indexOf(',')).equals(s0)) {
                    first++;
                }
            }
        }
        double f0 = (double) first / all;
        double k = share / (0.5 * f0 + 1.5 * (1 - f0));
        SplittableRandom rng = new SplittableRandom(seed);
        Path aloneTmp = alone.resolveSibling(alone.getFileName() + ".tmp");
        AtomicWrite.file(out, tmp -> {
            try (BufferedReader r = Files.newBufferedReader(in); BufferedWriter w = Files.newBufferedWriter(tmp);
                 BufferedWriter a = Files.newBufferedWriter(aloneTmp)) {
                String header = r.readLine();
                w.write(header);
                w.newLine();
                a.write(header);
                a.newLine();
                for (String line; (line = r.readLine()) != null; ) {
                    String[] f = line.split(",", -1);
                    double p = Math.min(1, k * (f[0].equals(s0) ? 0.5 : 1.5));
                    if (rng.nextDouble() < p) {
                        a.write(line);
                        a.newLine();
                        int hide = 1 + rng.nextInt(2);
                        for (int h = 0; h < hide; h++) {
                            f[1 + rng.nextInt(f.length - 1)] = "";
                        }
                    }
                    w.write(String.join(",", f));
                    w.newLine();
                }
            }
        });
        Files.move(aloneTmp, alone, java.nio.file.StandardCopyOption.REPLACE_EXISTING);
    }

    /** The label of v0's first state in the synthetic tables. */
    static String firstState(Path in) {
        return "s0";
    }

    static String load() {
        try {
            return Files.readString(Path.of("/proc/loadavg")).split(" ")[0];
        } catch (IOException e) {
            return "?";
        }
    }
}
