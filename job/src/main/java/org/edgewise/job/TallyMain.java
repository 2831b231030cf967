package org.edgewise.job;

import org.edgewise.driver.Checks;
import java.io.File;
import java.io.PrintWriter;
import java.net.URISyntaxException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.apache.spark.sql.SparkSession;
import org.edgewise.driver.ErrorReport;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.augment.Augmentation;
import org.edgewise.driver.Version;
import org.edgewise.driver.Tiers;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.StoreTarget;
import org.edgewise.job.TallyOptions.MissingPolicy;
import org.edgewise.job.plan.FamilyPlan;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code edgewise tally}: the Spark job's command line. Thin: parse, check, start Spark (embedded
 * {@code local[*]} unless {@code --master} says otherwise), run {@link TallyJob}, print a summary.
 * User mistakes are one line on stderr and exit status 2 (the driver's error handling).
 */
@Command(name = "tally", mixinStandardHelpOptions = true, versionProvider = TallyMain.VersionText.class,
        sortOptions = false,
        description = {"Scan a table once on Spark and write a score store: the contingency counts and the log score of "
                + "every family (child, parent set of at most d candidates).",
                "Input: CSV with a header line, or Parquet; a local path or any filesystem URI Spark supports."})
public final class TallyMain implements Callable<Integer> {
    @Option(names = "--input", required = true, paramLabel = "PATH", description = "input file or directory (repeatable; every input must have the same columns)") List<String> inputs;

    @Option(names = "--format", defaultValue = "auto", paramLabel = "csv|parquet|auto", description = "input format (default ${DEFAULT-VALUE}: by file extension)") String format;

    @Option(names = "--delimiter", paramLabel = "C", description = "CSV field delimiter, one character or 'tab' (default: tab for .tsv files, else ',')") String delimiter;

    // no picocli default: given or not is what decides whether it is refused for Parquet input
    @Option(names = "--encoding", paramLabel = "NAME", description = "character encoding of CSV input, e.g. ISO-8859-1 (default UTF-8; bytes not valid in it are refused)") String encoding;

    @Option(names = "--out", required = true, paramLabel = "STORE", description = "score store directory to write (local path)") Path out;

    @Option(names = "--overwrite", description = "replace an existing score store (never a file, an input, or a directory holding anything else)") boolean overwrite;

    @Option(names = "--max-parents", defaultValue = "3", paramLabel = "d", description = "largest parent-set size (default ${DEFAULT-VALUE})") int maxParents;

    @Option(names = "--master", defaultValue = "${sys:spark.master:-local[*]}", paramLabel = "URL", description = "Spark master (default ${DEFAULT-VALUE}: embedded Spark on every core, or the master spark-submit was given)") String master;

    @Option(names = "--columns", split = ",", paramLabel = "a,b,c", description = "keep only these columns as variables") List<String> columns = new ArrayList<>();

    @Option(names = "--exclude", split = ",", paramLabel = "a,b", description = "leave these columns out") List<String> exclude = new ArrayList<>();

    @Option(names = "--candidates", paramLabel = "K", description = "keep the K best single parents per child (by score gain over no parent), plus required ones") Integer candidates;

    @Option(names = "--reserve", paramLabel = "M", description = "with --candidates: also count families over each child's next M candidates "
            + "(same ranking) and over the variables that keep it among their K, listed as its reserve; edges starts from the K and widens a child into its reserve where the "
            + "posterior reaches the edge of its candidates") Integer reserve;

    @Option(names = "--forbid", split = ",", paramLabel = "a->b", description = "edges no family may contain (repeatable)") List<String> forbid = new ArrayList<>();

    @Option(names = "--require", split = ",", paramLabel = "a->b", description = "edges every family of the child must contain (repeatable)") List<String> require = new ArrayList<>();

    @Option(names = "--tiers", paramLabel = "\"a,b;c\"", description = "tiers of variables, earliest first, separated by ';' "
            + "(a repeated option appends tiers): no parent from a later tier") List<String> tiers = new ArrayList<>();

    @Option(names = "--missing", defaultValue = "error", paramLabel = "error|drop|state|average", description = "empty fields: refuse (default), drop the row "
            + "(biased unless values are missing completely at random), count as a state '(missing)' (its dependence on other "
            + "variables reads as structure), or average over them by data augmentation (missing at random assumed)") String missing;

    @Option(names = "--seed", paramLabel = "N", description = "--missing average: the seed of every draw (default "
            + TallyOptions.DEFAULT_SEED + ")") Long seed;

    @Option(names = "--rounds", paramLabel = "R", description = "--missing average: rounds of data augmentation per chain, "
            + "the first half burn-in (default: until converged, R-hat < 1.01 and bulk effective sample size >= 400 for every "
            + "edge over the second half of the rounds, checked from round " + Augmentation.Settings.MIN_ROUNDS + " on, at most "
            + Augmentation.Settings.MAX_ROUNDS + " rounds)") Integer rounds;

    @Option(names = "--weight", paramLabel = "COL", description = "a table of counts: column COL holds the number of rows each line stands for "
            + "(a whole number, 0 or more); counts, scores and fingerprint are those of the table expanded to one row per unit. COL is never a variable") String weight;

    @Option(names = "--max-states", defaultValue = "32", paramLabel = "N", description = "most states a variable may have, at most 255 (default ${DEFAULT-VALUE})") int maxStates;

    @Option(names = "--discretize", split = ",", paramLabel = "COL=k", description = "cut numeric column COL into k equal-frequency bins (repeatable)") List<String> discretize = new ArrayList<>();

    @Option(names = "--score", defaultValue = "bdeu", paramLabel = "bdeu|k2", description = "family score to store (default ${DEFAULT-VALUE})") String score;

    @Option(names = "--ess", paramLabel = "A", description = "BDeu equivalent sample size (default 1; K2 has none)") Double ess;

    @Option(names = "--partitions", paramLabel = "N", description = "repartition the input into N partitions") Integer partitions;

    @Option(names = "--memory-budget", defaultValue = "256m", paramLabel = "SIZE", description = "count-array memory per task, e.g. 512m, 2g (default ${DEFAULT-VALUE})") String memoryBudget;

    @Option(names = "--conf", paramLabel = "k=v", description = "extra Spark configuration (repeatable)") List<String> conf = new ArrayList<>();

    @Option(names = "--verbose", description = "show Spark's log and each step on standard error (default: into a log file, "
            + "named in the message when the run fails)") boolean verbose;

    /** The most partitions {@code --partitions} may ask for: each is a task, and more only add scheduling. */
    static final int MAX_PARTITIONS = 10_000;

    /** A session to use instead of starting one (tests). */
    private final SparkSession given;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    TallyMain(SparkSession given) {
        this.given = given;
    }

    public static void main(String[] args) {
        System.exit(execute(null, new PrintWriter(System.out, true), new PrintWriter(System.err, true), args));
    }

    /** Runs the command line on {@code spark} (or a new session when null) and returns the exit status. */
    public static int execute(SparkSession spark, PrintWriter out, PrintWriter err, String... args) {
        CommandLine cl = new CommandLine(new TallyMain(spark));
        cl.setOut(out);
        cl.setErr(err);
        cl.setCaseInsensitiveEnumValuesAllowed(true);
        cl.setParameterExceptionHandler((ex, a) -> {
            // picocli keeps only the text of the converter's InvalidPathException: convert the value again
            if (ex.getValue() != null && ex.getArgSpec() instanceof CommandLine.Model.OptionSpec o
                    && o.type() == Path.class) {
                try { // a file name the JVM cannot represent: one line naming the option, not the exception
                    Checks.path(ex.getValue(), o.longestName());
                } catch (UserError e) {
                    err.println("tally: " + e.getMessage());
                    err.flush();
                    return ErrorReport.USER_MISTAKE;
                }
            }
            err.println("tally: " + ex.getMessage() + " (see tally --help)");
            err.flush();
            return ErrorReport.USER_MISTAKE;
        });
        cl.setExecutionExceptionHandler((ex, c, parsed) -> ErrorReport.report("tally", ex, err));
        return cl.execute(args);
    }

    /** {@code tally --version}: the program version from the build. */
    public static final class VersionText implements CommandLine.IVersionProvider {
        @Override
        public String[] getVersion() {
            return new String[] {"edgewise tally " + Version.PROGRAM};
        }
    }

    @Override
    public Integer call() {
        TallyOptions o = options();
        Map<String, String> extra = confPairs();
        boolean embedded = master.startsWith("local");
        // a run this command starts owns a scratch folder, removed whatever the exit: Spark's scratch
        // (spark.local.dir) for an embedded Spark, and the log unless --verbose shows it
        SparkScratch scratch = given == null ? SparkScratch.create(extra, embedded) : null;
        if (scratch != null && embedded) {
            extra.put("spark.local.dir", scratch.dir().toString());
        }
        SparkLog log = scratch != null && !verbose ? SparkLog.quiet(scratch.dir().resolve("tally.log")) : null;
        try {
            return tally(o, extra);
        } catch (Throwable t) {
            throw failed(t, o, scratch, log);
        } finally {
            if (log != null) {
                log.close();
            }
            if (scratch != null) {
                scratch.close();
            }
        }
    }

    /** Starts Spark (unless given), runs the tally, prints the warnings and the summary, stops Spark. */
    private int tally(TallyOptions o, Map<String, String> extra) {
        SparkSession spark = given != null ? given : session(master, extra);
        try {
            TallyJob.Summary s = TallyJob.run(spark, o, this::csvOnly);
            PrintWriter e = spec.commandLine().getErr();
            for (String warning : s.warnings()) {
                e.println("tally: " + warning);
            }
            e.flush();
            PrintWriter w = spec.commandLine().getOut();
            w.printf(Locale.ROOT, "tally: wrote %s — %d families over %d variables from %d rows (%d dropped), "
                            + "%d variable sets in %d %s, %.1f s%n", o.out(), s.families(), s.variables(), s.rows(),
                    s.droppedRows(), s.coverSets(), s.batches(), s.batches() == 1 ? "pass" : "passes", s.seconds());
            if (s.missingValues() != null) {
                AugmentedTally.Report r = s.missingValues();
                w.printf(Locale.ROOT, "tally: averaged over missing values by data augmentation (missing at random assumed): "
                                + "%d rounds, burn-in %d, %d chains; largest R̂ over rounds %.3f (%s)%n", r.rounds(), r.burnIn(),
                        r.chains(), r.maxRhat(), r.converged() ? "converged" : "not converged: more --rounds");
                w.printf(Locale.ROOT, "tally: incomplete rows %d (%.1f%%); missing cells per variable: %s%n", r.incompleteRows(),
                        100 * r.incompleteRowShare(), shares(r.missingCellShare()));
                double sum = 0;
                for (double x : r.roundSeconds()) {
                    sum += x;
                }
                w.printf(Locale.ROOT, "tally: complete rows counted once in %.1f s; %.1f s per round on average%n",
                        r.completeRowsSeconds(), sum / r.roundSeconds().length);
            }
            w.flush();
            return 0;
        } finally {
            if (given == null) {
                spark.stop();
            }
        }
    }

    /**
     * What a failed run reports: a user's mistake as it is (its one line says all; the log goes with
     * the scratch folder); a fault of the machine ({@link EnvironmentFault}) as one line naming it, what
     * to do and the kept log; anything else as the bug it is, naming the kept log.
     */
    private RuntimeException failed(Throwable t, TallyOptions o, SparkScratch scratch, SparkLog log) {
        if (ErrorReport.userError(t) != null) {
            return t instanceof RuntimeException r ? r : new IllegalStateException(t);
        }
        UserError env = EnvironmentFault.of(t, new EnvironmentFault.Run(master, o.inputs(), o.out(),
                scratch == null ? null : scratch.dir().getParent()));
        Path kept = log == null ? null : log.keep(scratch.dir().getParent());
        String where = kept == null ? "" : "; Spark's log: " + kept;
        if (env != null) {
            return new UserError(env.getMessage() + where, t);
        }
        if (kept == null && t instanceof RuntimeException r) {
            return r;
        }
        return new IllegalStateException("tally failed" + where, t);
    }

    /** Checks and collects the options (no Spark needed). */
    TallyOptions options() {
        if (maxParents < 0) {
            throw new UserError("--max-parents must be 0 or more, got " + maxParents);
        }
        if (maxStates < 1 || maxStates > 255) {
            throw new UserError("--max-states must be between 1 and 255, got " + maxStates);
        }
        if (candidates != null && candidates < 0) {
            throw new UserError("--candidates must be 0 or more, got " + candidates);
        }
        if (reserve != null && reserve < 0) {
            throw new UserError("--reserve must be 0 or more, got " + reserve);
        }
        Checks.notApplicable(reserve != null && candidates == null, "--reserve", "without --candidates K",
                "a reserve is the candidates ranked after the K kept");
        if (partitions != null && (partitions < 1 || partitions > MAX_PARTITIONS)) {
            throw new UserError("--partitions must be between 1 and " + MAX_PARTITIONS + ", got " + partitions
                    + " (a few partitions per core is enough)");
        }
        double essValue = ess == null ? 1 : ess;
        Checks.ess(essValue, "--ess");
        ScoreKind kind;
        try {
            kind = ScoreKind.parse(score);
        } catch (UserError e) {
            throw new UserError("--score: " + e.getMessage());
        }
        kind.checkEss(ess != null, "--ess");
        MissingPolicy policy;
        try {
            policy = MissingPolicy.valueOf(missing.trim().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new UserError("--missing must be error, drop, state or average, got '" + missing + "'");
        }
        Checks.notApplicable(seed != null && policy != MissingPolicy.AVERAGE, "--seed", "without --missing average",
                "it seeds the draws of missing values; a tally that draws nothing has no seed");
        Checks.notApplicable(rounds != null && policy != MissingPolicy.AVERAGE, "--rounds", "without --missing average",
                "it counts rounds of data augmentation");
        if (rounds != null && (rounds < 2 || rounds > 100_000)) {
            throw new UserError("--rounds must be between 2 and 100000, got " + rounds);
        }
        String fmt = format.toLowerCase(Locale.ROOT);
        if (!List.of("csv", "parquet", "auto").contains(fmt)) {
            throw new UserError("--format must be csv, parquet or auto, got '" + format + "'");
        }
        Map<String, Integer> bins = new LinkedHashMap<>();
        for (String d : discretize) {
            int eq = d.lastIndexOf('=');
            int k;
            try {
                k = eq > 0 ? Integer.parseInt(d.substring(eq + 1).trim()) : -1;
            } catch (NumberFormatException e) {
                k = -1;
            }
            if (eq <= 0 || k < 2 || k > maxStates) {
                throw new UserError("--discretize: '" + d + "' must be COL=k with 2 <= k <= --max-states (" + maxStates + ")");
            }
            bins.put(d.substring(0, eq).trim(), k);
        }
        List<List<String>> tierList = Tiers.parse(tiers, "--tiers");
        long budget = parseBytes(memoryBudget);
        if (master.startsWith("local")) { // the tasks run in this JVM
            FamilyPlan.checkBudget(budget, Runtime.getRuntime().maxMemory(), "this JVM");
        }
        for (String in : inputs) {
            if (in.isBlank()) { // Path.of("") is the working directory: never read it, nor refuse --out as inside it
                throw new UserError("--input '" + in + "' names no file; give a file or directory");
            }
            if (!in.matches("^[A-Za-z][A-Za-z0-9+.-]+:.*") || in.startsWith("file:")) { // a local file name
                Checks.path(in.startsWith("file:") ? in.substring(5) : in, "--input");
            } else if (in.indexOf('\0') >= 0) {
                Checks.path(in, "--input");
            }
        }
        sameInputTwice(inputs);
        // before Spark starts: nothing but a store is ever replaced, and the directory is writable
        StoreTarget.check(out, overwrite, inputs, "--out", "--overwrite");
        java.nio.charset.Charset charset;
        try {
            charset = java.nio.charset.Charset.forName(encoding == null ? "UTF-8" : encoding.trim());
        } catch (IllegalArgumentException e) {
            throw new UserError("--encoding: unknown encoding '" + encoding + "' (e.g. UTF-8, ISO-8859-1, windows-1252)");
        }
        char sep = delimiter != null ? delimiterChar(delimiter)
                : inputs.stream().allMatch(i -> i.toLowerCase(Locale.ROOT).matches(".*\\.tsv(\\.gz|\\.bz2)?")) ? '\t' : ',';
        return new TallyOptions(inputs, fmt, sep, out, overwrite, maxParents,
                trimmed(columns), trimmed(exclude), candidates, edges(forbid, "--forbid"), edges(require, "--require"),
                tierList, policy, maxStates, bins, kind, essValue, partitions, budget, charset,
                weight == null ? null : weight.trim(), seed, rounds, reserve);
    }

    private static String shares(Map<String, Double> share) {
        StringBuilder sb = new StringBuilder();
        for (Map.Entry<String, Double> e : share.entrySet()) {
            if (e.getValue() > 0) {
                sb.append(sb.length() == 0 ? "" : ", ").append(e.getKey()).append(' ')
                        .append(String.format(Locale.ROOT, "%.1f%%", 100 * e.getValue()));
            }
        }
        return sb.toString();
    }

    /** Refuses the options that only read CSV text when the inputs turn out to be Parquet (known once their files are listed). */
    void csvOnly(org.edgewise.job.input.Table table) {
        if (!table.isCsv()) {
            Checks.notApplicable(delimiter != null, "--delimiter", "to Parquet input",
                    "it splits the fields of CSV text; Parquet stores its columns apart");
            Checks.notApplicable(encoding != null, "--encoding", "to Parquet input",
                    "it decodes the bytes of CSV text; Parquet stores its strings as UTF-8");
        }
    }

    /** The same input given twice would be counted twice: refused (the same text, or the same local file by its real path). */
    static void sameInputTwice(List<String> inputs) {
        Map<String, String> seen = new LinkedHashMap<>();
        for (String in : inputs) {
            String key = in;
            if (!in.matches("^[A-Za-z][A-Za-z0-9+.-]+:.*") || in.startsWith("file:")) {
                try {
                    Path p = Path.of(in.startsWith("file:") ? in.substring(5) : in);
                    key = "file:" + (java.nio.file.Files.exists(p) ? p.toRealPath() : p.toAbsolutePath().normalize());
                } catch (java.io.IOException | RuntimeException e) {
                    key = in;
                }
            }
            String before = seen.putIfAbsent(key, in);
            if (before != null) {
                throw new UserError("--input " + in + (before.equals(in) ? " is given twice" : " is the same as --input "
                        + before) + "; its rows would be counted twice");
            }
        }
    }

    static char delimiterChar(String d) {
        if (d.equalsIgnoreCase("tab") || d.equals("\\t")) {
            return '\t';
        }
        if (d.length() != 1) {
            throw new UserError("--delimiter must be one character or 'tab', got '" + d + "'");
        }
        char c = d.charAt(0);
        if (c == '"' || c == '\n' || c == '\r') {
            throw new UserError("--delimiter cannot be " + (c == '"' ? "'\"', which quotes CSV fields" : "a line break, which ends "
                    + "CSV rows") + "; give another character, e.g. ',' ';' or tab");
        }
        return c;
    }

    private static List<String> trimmed(List<String> xs) {
        return xs.stream().map(String::trim).filter(s -> !s.isEmpty()).toList();
    }

    private static List<EdgeRule> edges(List<String> xs, String option) {
        List<EdgeRule> out = new ArrayList<>();
        for (String x : xs) {
            out.add(EdgeRule.parse(x.trim(), option));
        }
        return out;
    }

    /** Parses 512m, 2g, 100k, 1048576 (bytes). */
    static long parseBytes(String text) {
        String t = text.trim().toLowerCase(Locale.ROOT);
        long mult = 1;
        if (t.endsWith("b")) {
            t = t.substring(0, t.length() - 1);
        }
        if (!t.isEmpty()) {
            switch (t.charAt(t.length() - 1)) {
                case 'k' -> mult = 1L << 10;
                case 'm' -> mult = 1L << 20;
                case 'g' -> mult = 1L << 30;
                case 't' -> mult = 1L << 40;
                default -> mult = 1;
            }
            if (mult > 1) {
                t = t.substring(0, t.length() - 1);
            }
        }
        try {
            double v = Double.parseDouble(t);
            if (!(v > 0)) {
                throw new NumberFormatException();
            }
            return (long) (v * mult);
        } catch (NumberFormatException e) {
            throw new UserError("--memory-budget: '" + text + "' is not a size such as 512m or 2g");
        }
    }

    private Map<String, String> confPairs() {
        Map<String, String> m = new LinkedHashMap<>();
        for (String c : conf) {
            int eq = c.indexOf('=');
            if (eq <= 0) {
                throw new UserError("--conf: '" + c + "' must be key=value");
            }
            m.put(c.substring(0, eq).trim(), c.substring(eq + 1).trim());
        }
        return m;
    }

    /**
     * Starts Spark: embedded for {@code local…} (no web UI, loopback), otherwise the given master;
     * for any cluster master the job and core jars and Commons CSV are added to {@code spark.jars} (keeping
     * what is already there), so executors fetch them from the driver.
     */
    static SparkSession session(String master, Map<String, String> extra) {
        SparkSession.Builder b = SparkSession.builder().appName("edgewise tally").master(master);
        if (master.startsWith("local")) {
            b.config("spark.ui.enabled", "false");
            if (System.getenv("SPARK_LOCAL_IP") == null) {
                b.config("spark.driver.host", "127.0.0.1").config("spark.driver.bindAddress", "127.0.0.1");
            }
        }
        extra.forEach(b::config);
        if (!master.startsWith("local")) {
            // Executors need our jars; keep whatever spark-submit or --conf already ships.
            java.util.LinkedHashSet<String> jars = new java.util.LinkedHashSet<>();
            String existing = extra.getOrDefault("spark.jars", System.getProperty("spark.jars", ""));
            for (String j : existing.split(",")) {
                if (!j.isBlank()) {
                    jars.add(j.trim());
                }
            }
            jars.add(jarOf(TallyMain.class));
            jars.add(jarOf(Version.class)); // the core library
            jars.add(jarOf(org.apache.commons.csv.CSVFormat.class)); // the core's CSV reader, not part of Spark
            b.config("spark.jars", String.join(",", jars));
        }
        SparkSession s = b.getOrCreate();
        s.sparkContext().setLogLevel("WARN");
        return s;
    }

    /** The jar a class was loaded from (for shipping to a cluster). */
    static String jarOf(Class<?> c) {
        try {
            File f = new File(c.getProtectionDomain().getCodeSource().getLocation().toURI());
            if (!f.isFile()) {
                throw new UserError("--master spark://…: " + c.getSimpleName() + " was not loaded from a jar (" + f
                        + "); build the jars with mvn package and start tally through scripts/edgewise");
            }
            return f.getAbsolutePath();
        } catch (URISyntaxException | NullPointerException e) {
            throw new UserError("--master spark://…: cannot find the jar of " + c.getSimpleName());
        }
    }
}
