package org.edgewise.job;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.apache.spark.sql.Dataset;
import org.apache.spark.sql.Row;
import org.edgewise.driver.Checks;
import org.edgewise.driver.UserError;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.job.TallyOptions.MissingPolicy;
import org.edgewise.job.input.Table;

/**
 * The tally from a Spark application: a {@code Dataset<Row>} the caller already has (a notebook,
 * a pipeline) is tallied into a score store on the driver's local filesystem, by the same
 * {@link TallyJob} as {@code edgewise tally}, on the caller's own SparkSession (not stopped).
 *
 * <pre>{@code
 * TallyJob.Summary s = Tally.of(dataset).maxParents(3).candidates(15).writeTo("/data/store");
 * }</pre>
 *
 * From PySpark, with {@code --jars edgewise-job.jar,edgewise-core.jar,commons-csv-….jar} on the
 * session (docs/cluster.md):
 * {@code spark._jvm.org.edgewise.job.Tally.of(df._jdf).maxParents(3).candidates(15).writeTo("/data/store")}.
 *
 * <p>Every column but a {@link #weight} column is a variable and its values are read as text, as for a Parquet input (numbers
 * ordered numerically, the rest lexicographically); the defaults are those of the command line
 * (d = 3, BDeu with ESS 1, missing values refused, at most 32 states, 256 MiB of counts per task).
 * Mistakes are {@link UserError}s (one line) named after the builder method ({@code columns: no column
 * 'zz' in dataset …}, {@code choose missing("drop") or missing("state")}).
 */
public final class Tally {
    private final Dataset<Row> data;
    private int maxParents = 3;
    private Integer candidates;
    private Integer reserve;
    private final List<String> columns = new ArrayList<>();
    private final List<String> exclude = new ArrayList<>();
    private final List<EdgeRule> forbid = new ArrayList<>();
    private final List<EdgeRule> require = new ArrayList<>();
    private final List<List<String>> tiers = new ArrayList<>();
    private MissingPolicy missing = MissingPolicy.ERROR;
    private int maxStates = 32;
    private final Map<String, Integer> discretize = new LinkedHashMap<>();
    private ScoreKind score = ScoreKind.BDEU;
    private double ess = 1;
    private Integer partitions;
    private long memoryBudget = 256L << 20;
    private boolean overwrite;
    private String weight;
    private Long seed;
    private Integer rounds;

    private Tally(Dataset<Row> data) {
        this.data = data;
    }

    /** A tally of {@code data}'s rows; nothing runs until {@link #writeTo}. */
    public static Tally of(Dataset<Row> data) {
        if (data == null) {
            throw new UserError("Tally.of: the Dataset is null");
        }
        return new Tally(data);
    }

    /** Largest parent-set size d (default 3). */
    public Tally maxParents(int d) {
        maxParents = (int) Checks.zeroOrMore(d, "maxParents");
        return this;
    }

    /** Keep the K best single parents per child (score gain over no parent), plus required ones. */
    public Tally candidates(int k) {
        candidates = (int) Checks.zeroOrMore(k, "candidates");
        return this;
    }

    /**
     * With {@link #candidates}: also count families over each child's next {@code m} candidates (same
     * ranking), listed in the manifest as its reserve, which the driver widens a child into where the
     * posterior reaches the edge of its candidates.
     */
    public Tally reserve(int m) {
        reserve = (int) Checks.zeroOrMore(m, "reserve");
        return this;
    }

    /** Keep only these columns as variables. */
    public Tally columns(String... names) {
        columns.addAll(Arrays.asList(names));
        return this;
    }

    /** Leave these columns out. */
    public Tally exclude(String... names) {
        exclude.addAll(Arrays.asList(names));
        return this;
    }

    /** Edges no family may contain, each {@code from->to}. */
    public Tally forbid(String... edges) {
        for (String e : edges) {
            forbid.add(EdgeRule.parse(e.trim(), "forbid"));
        }
        return this;
    }

    /** Edges every family of the child must contain, each {@code from->to}. */
    public Tally require(String... edges) {
        for (String e : edges) {
            require.add(EdgeRule.parse(e.trim(), "require"));
        }
        return this;
    }

    /** One more tier, after those already given: no variable of an earlier tier gets a parent from it. */
    public Tally tier(String... names) {
        if (names.length == 0) {
            throw new UserError("tier: a tier needs at least one variable");
        }
        tiers.add(List.of(names));
        return this;
    }

    /**
     * Empty values: {@code error} (default), {@code drop} the row, count as a {@code state} '(missing)',
     * or {@code average} over them by data augmentation (missing at random assumed).
     */
    public Tally missing(String policy) {
        try {
            missing = MissingPolicy.valueOf(policy.trim().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new UserError("missing must be error, drop, state or average, got '" + policy + "'");
        }
        return this;
    }

    /** Most states a variable may have, 1 to 255 (default 32). */
    public Tally maxStates(int n) {
        if (n < 1 || n > 255) {
            throw new UserError("maxStates must be between 1 and 255, got " + n);
        }
        maxStates = n;
        return this;
    }

    /** Cut numeric column {@code column} into {@code bins} equal-frequency bins (2 ≤ bins ≤ maxStates). */
    public Tally discretize(String column, int bins) {
        Checks.atLeast(bins, 2, "discretize " + column);
        discretize.put(column, bins);
        return this;
    }

    /** Family score to store: {@code bdeu} (default) or {@code k2}. */
    public Tally score(String kind) {
        score = ScoreKind.parse(kind);
        return this;
    }

    /** BDeu equivalent sample size (default 1). */
    public Tally ess(double a) {
        ess = Checks.ess(a, "ess");
        return this;
    }

    /** Repartition the rows into n partitions first (default: as they are). */
    public Tally partitions(int n) {
        partitions = (int) Checks.atLeast(n, 1, "partitions");
        return this;
    }

    /** Count-array memory per task, bytes (default 256 MiB). */
    public Tally memoryBudget(long bytes) {
        memoryBudget = Checks.atLeast(bytes, 1, "memoryBudget");
        return this;
    }

    /**
     * A table of counts: column {@code column} holds the number of rows each row stands for (a whole
     * number, 0 or more); the store is that of the table expanded to one row per unit. The column
     * is never a variable.
     */
    public Tally weight(String column) {
        if (column == null || column.isBlank()) {
            throw new UserError("weight: give a column name");
        }
        weight = column.trim();
        return this;
    }

    /** {@code missing("average")}: the seed of every draw of data augmentation (default 1). */
    public Tally seed(long n) {
        seed = n;
        return this;
    }

    /** {@code missing("average")}: rounds of data augmentation per chain, 2 to 100,000, the first half burn-in (default: until converged, at most 100). */
    public Tally rounds(int r) {
        if (r < 2 || r > 100_000) {
            throw new UserError("rounds must be between 2 and 100000, got " + r);
        }
        rounds = r;
        return this;
    }

    /** Replace an existing store at the output path (default: refuse). */
    public Tally overwrite(boolean yes) {
        overwrite = yes;
        return this;
    }

    /**
     * Runs the tally and writes the store (atomically: nothing is left at {@code store} if it
     * fails). {@code store} is a directory on the Spark driver's local filesystem.
     */
    public TallyJob.Summary writeTo(String store) {
        Path out = Path.of(store);
        if (Files.exists(out) && !overwrite) {
            throw new UserError("output " + out + " already exists; call overwrite(true) to replace it");
        }
        for (Map.Entry<String, Integer> d : discretize.entrySet()) {
            if (d.getValue() > maxStates) {
                throw new UserError("discretize " + d.getKey() + ": " + d.getValue() + " bins, more than maxStates ("
                        + maxStates + ")");
            }
        }
        Checks.notApplicable(reserve != null && candidates == null, "reserve", "without candidates(K)",
                "a reserve is the candidates ranked after the K kept");
        TallyOptions o = new TallyOptions(List.of(Table.DATASET), "dataset", ',', out, overwrite, maxParents,
                columns, exclude, candidates, forbid, require, tiers, missing, maxStates, discretize, score, ess,
                partitions, memoryBudget, java.nio.charset.StandardCharsets.UTF_8, weight, seed, rounds, reserve);
        if ((seed != null || rounds != null) && missing != MissingPolicy.AVERAGE) {
            throw new UserError((seed != null ? "seed" : "rounds") + " applies only with missing(\"average\")");
        }
        try {
            return TallyJob.run(Table.of(data), o);
        } catch (UserError e) { // the job words its refusals for the command line: name the builder methods
            throw new UserError(ApiWords.of(e.getMessage()), e);
        }
    }
}
