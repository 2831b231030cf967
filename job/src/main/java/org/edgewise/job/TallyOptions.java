package org.edgewise.job;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.EdgeRule;

/**
 * Everything a tally needs, already parsed (names are resolved against the header later).
 *
 * @param inputs       input paths or filesystem URIs (CSV with a header, or Parquet)
 * @param format       {@code csv}, {@code parquet} or {@code auto} (by extension)
 * @param delimiter    CSV field delimiter
 * @param out          the store directory to write
 * @param maxParents   the in-degree bound d
 * @param columns      variables to keep (empty: every column)
 * @param exclude      columns to drop
 * @param candidates   K best single parents per child, or null for no pruning
 * @param tiers        tiers of variable names, earliest first (empty: none)
 * @param missing      missing-value policy
 * @param maxStates    largest number of states a variable may have
 * @param discretize   column name → number of equal-frequency bins
 * @param partitions   repartition the input into this many partitions (null: as read)
 * @param memoryBudget per-task budget for the count arrays, bytes
 * @param encoding     character encoding of CSV input (invalid bytes are refused, never replaced)
 * @param weight       the column holding the number of rows each line stands for (a table of
 *                     counts), never a variable; null when every line is one row
 * @param seed         the seed of data augmentation ({@link MissingPolicy#AVERAGE}); null when not given
 * @param rounds       rounds of data augmentation per chain; null when not given (until converged)
 * @param reserve      with {@code candidates}: per child, how many further candidates (the next by the
 *                     same gain) to count families over and list as the manifest's {@code reserve}, for
 *                     the driver to widen a child into; null for none
 */
public record TallyOptions(List<String> inputs, String format, char delimiter, Path out, boolean overwrite,
                           int maxParents, List<String> columns, List<String> exclude, Integer candidates,
                           List<EdgeRule> forbid, List<EdgeRule> require, List<List<String>> tiers,
                           MissingPolicy missing, int maxStates, Map<String, Integer> discretize,
                           ScoreKind score, double ess, Integer partitions, long memoryBudget,
                           java.nio.charset.Charset encoding, String weight, Long seed, Integer rounds,
                           Integer reserve) {
    /** The seed of data augmentation when {@code seed} is not given. */
    public static final long DEFAULT_SEED = 1;

    /** What to do with an empty field. */
    public enum MissingPolicy {
        /** refuse the table (default). */
        ERROR,
        /** drop every row with a missing value in a selected column. */
        DROP,
        /** treat a missing value as one more state of that variable. */
        STATE,
        /** average over the missing values by data augmentation (missing at random assumed). */
        AVERAGE;

        public String label() {
            return name().toLowerCase(java.util.Locale.ROOT);
        }
    }

    /** UTF-8 input. */
    public TallyOptions(List<String> inputs, String format, char delimiter, Path out, boolean overwrite,
                        int maxParents, List<String> columns, List<String> exclude, Integer candidates,
                        List<EdgeRule> forbid, List<EdgeRule> require, List<List<String>> tiers,
                        MissingPolicy missing, int maxStates, Map<String, Integer> discretize,
                        ScoreKind score, double ess, Integer partitions, long memoryBudget) {
        this(inputs, format, delimiter, out, overwrite, maxParents, columns, exclude, candidates, forbid, require, tiers,
                missing, maxStates, discretize, score, ess, partitions, memoryBudget,
                java.nio.charset.StandardCharsets.UTF_8, null);
    }

    /** One row per line (no weight column). */
    public TallyOptions(List<String> inputs, String format, char delimiter, Path out, boolean overwrite,
                        int maxParents, List<String> columns, List<String> exclude, Integer candidates,
                        List<EdgeRule> forbid, List<EdgeRule> require, List<List<String>> tiers,
                        MissingPolicy missing, int maxStates, Map<String, Integer> discretize,
                        ScoreKind score, double ess, Integer partitions, long memoryBudget,
                        java.nio.charset.Charset encoding) {
        this(inputs, format, delimiter, out, overwrite, maxParents, columns, exclude, candidates, forbid, require, tiers,
                missing, maxStates, discretize, score, ess, partitions, memoryBudget, encoding, null);
    }

    /** No data-augmentation settings (the defaults) and no reserve of candidates. */
    public TallyOptions(List<String> inputs, String format, char delimiter, Path out, boolean overwrite,
                        int maxParents, List<String> columns, List<String> exclude, Integer candidates,
                        List<EdgeRule> forbid, List<EdgeRule> require, List<List<String>> tiers,
                        MissingPolicy missing, int maxStates, Map<String, Integer> discretize,
                        ScoreKind score, double ess, Integer partitions, long memoryBudget,
                        java.nio.charset.Charset encoding, String weight) {
        this(inputs, format, delimiter, out, overwrite, maxParents, columns, exclude, candidates, forbid, require, tiers,
                missing, maxStates, discretize, score, ess, partitions, memoryBudget, encoding, weight, null, null, null);
    }

    /** The seed of data augmentation (the default when not given). */
    public long seedOrDefault() {
        return seed == null ? DEFAULT_SEED : seed;
    }

    public TallyOptions {
        inputs = List.copyOf(inputs);
        columns = List.copyOf(columns);
        exclude = List.copyOf(exclude);
        forbid = List.copyOf(forbid);
        require = List.copyOf(require);
        tiers = tiers.stream().map(List::copyOf).toList();
        discretize = Map.copyOf(discretize);
    }
}
