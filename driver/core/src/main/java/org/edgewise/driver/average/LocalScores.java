package org.edgewise.driver.average;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.TreeSet;
import java.util.stream.IntStream;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.UserError;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;

/**
 * The local scores every averaging engine works on: for each child i, its candidate parents
 * (sorted variable indices, at most 64) and its allowed parent sets U, each as a bitmask over the
 * positions in {@code candidates(i)}, with log weight {@code s(i,U) + log ρ_i(U)} (family log
 * marginal likelihood plus log structure prior) and the log prior alone.
 *
 * <p>Memory: per parent set 8 (mask) + 8 (weight) + 8 (prior) + 4 (family index) bytes; about
 * 11 MB for n = 40, d = 3 (≈ 400k families).
 *
 * <p>Immutable; arrays returned are shared and must not be modified.
 */
public final class LocalScores {
    /** Largest number of candidate parents per child (the width of a {@code long} mask). */
    public static final int MAX_CANDIDATES = 64;

    private final ScoreStore store;
    private final FamilyScore familyScore;
    private final ScoringOptions options;
    private final int[][] candidates;
    private final long[][] masks;
    private final double[][] weights;
    private final double[][] logPriors;
    private final int[][] families;

    private LocalScores(ScoreStore store, FamilyScore familyScore, ScoringOptions options, int[][] candidates,
                        long[][] masks, double[][] weights, double[][] logPriors, int[][] families) {
        this.store = store;
        this.familyScore = familyScore;
        this.options = options;
        this.candidates = candidates;
        this.masks = masks;
        this.weights = weights;
        this.logPriors = logPriors;
        this.families = families;
    }

    /**
     * Builds the tables from a store: rescored from the stored counts when {@code options} ask for
     * another score kind or ESS (no rescan of the data), with the prior applied and query-time
     * forbidden / required edges removing parent sets.
     */
    public static LocalScores build(ScoreStore store, ScoringOptions options) {
        return build(store, options, null);
    }

    /**
     * As {@link #build(ScoreStore, ScoringOptions)}, keeping of each child only the stored parent sets
     * inside {@code allowed[child]} (sorted variable indices; a null array or a null row keeps every
     * stored set): the tables of a candidate set narrower than the store's, e.g. a store's starting
     * candidates before its reserve is used ({@link CandidateBoundary}).
     */
    public static LocalScores build(ScoreStore store, ScoringOptions options, int[][] allowed) {
        Manifest m = store.manifest();
        ScoreKind storedKind = ScoreKind.parse(m.score());
        ScoreKind kind = options.score() == null ? storedKind : options.score();
        InputNames in = options.names();
        kind.checkEss(!Double.isNaN(options.ess()), in.ess());
        double ess = Double.isNaN(options.ess()) ? m.ess() : options.ess();
        FamilyScore fs = FamilyScore.of(kind, ess);
        boolean rescore = kind.rescores(storedKind, m.ess(), ess);
        int n = store.variableCount();
        boolean[][] forbidden = new boolean[n][n];
        boolean[][] required = new boolean[n][n];
        for (EdgeRule e : options.forbid()) {
            forbidden[index(m, e.from(), in.forbid())][index(m, e.to(), in.forbid())] = true;
        }
        for (EdgeRule e : options.require()) {
            int from = index(m, e.from(), in.require());
            int to = index(m, e.to(), in.require());
            if (forbidden[from][to]) {
                throw new UserError(in.require() + " " + e + " is also forbidden");
            }
            required[from][to] = true;
        }
        int[][] cands = new int[n][];
        long[][] masks = new long[n][];
        double[][] weights = new double[n][];
        double[][] priors = new double[n][];
        int[][] fams = new int[n][];
        for (int child = 0; child < n; child++) {
            int from = store.firstFamilyOf(child);
            int to = store.endFamilyOf(child);
            int[] within = allowed == null ? null : allowed[child];
            TreeSet<Integer> cs = new TreeSet<>();
            for (int f = from; f < to; f++) {
                if (!inside(store.family(f).parents(), within)) {
                    continue;
                }
                for (int p : store.family(f).parents()) {
                    cs.add(p);
                }
            }
            for (int p = 0; p < n; p++) {
                if (required[p][child] && !cs.contains(p)) {
                    throw new UserError(in.require() + " " + m.variables().get(p).name() + "->" + m.variables().get(child).name()
                            + " is impossible: the store holds no parent set of "
                            + m.variables().get(child).name() + " containing " + m.variables().get(p).name());
                }
            }
            if (cs.size() > MAX_CANDIDATES) {
                throw new UserError("variable " + m.variables().get(child).name() + " has " + cs.size()
                        + " candidate parents; averaging handles at most " + MAX_CANDIDATES
                        + " per variable: tally with " + in.candidates());
            }
            int[] cand = cs.stream().mapToInt(Integer::intValue).toArray();
            cands[child] = cand;
            long requiredMask = 0;
            for (int pos = 0; pos < cand.length; pos++) {
                if (required[cand[pos]][child]) {
                    requiredMask |= 1L << pos;
                }
            }
            if (Long.bitCount(requiredMask) > m.maxParents()) {
                List<String> req = new ArrayList<>();
                for (int pos = 0; pos < cand.length; pos++) {
                    if ((requiredMask >>> pos & 1L) != 0) {
                        req.add(m.variables().get(cand[pos]).name());
                    }
                }
                throw new UserError(in.require() + " is impossible: variable " + m.variables().get(child).name() + " would need "
                        + req.size() + " parents (" + String.join(", ", req) + ") but the store's in-degree bound d is "
                        + m.maxParents());
            }
            List<Integer> kept = new ArrayList<>();
            List<Long> keptMasks = new ArrayList<>();
            for (int f = from; f < to; f++) {
                if (!inside(store.family(f).parents(), within)) {
                    continue;
                }
                long mask = 0;
                boolean ok = true;
                for (int p : store.family(f).parents()) {
                    if (forbidden[p][child]) {
                        ok = false;
                        break;
                    }
                    mask |= 1L << Arrays.binarySearch(cand, p);
                }
                if (ok && (mask & requiredMask) == requiredMask) {
                    kept.add(f);
                    keptMasks.add(mask);
                }
            }
            if (kept.isEmpty()) {
                throw new UserError("variable " + m.variables().get(child).name()
                        + " has no allowed parent set under the given constraints");
            }
            int k = kept.size();
            fams[child] = kept.stream().mapToInt(Integer::intValue).toArray();
            masks[child] = keptMasks.stream().mapToLong(Long::longValue).toArray();
            weights[child] = new double[k];
            priors[child] = new double[k];
            final int c = child;
            IntStream.range(0, k).parallel().forEach(s -> {
                int f = fams[c][s];
                FamilyCounts fc = store.family(f);
                double score = rescore
                        ? fs.logScore(fc.counts(), store.arity(c), store.configurations(fc.parents()))
                        : store.logScore(f);
                double lp = options.prior().logWeight(n, fc.parents().length);
                priors[c][s] = lp;
                weights[c][s] = score + lp;
            });
        }
        return new LocalScores(store, fs, options, cands, masks, weights, priors, fams);
    }

    /** True when every parent is in {@code within} (sorted), or {@code within} is null. */
    private static boolean inside(int[] parents, int[] within) {
        if (within == null) {
            return true;
        }
        for (int p : parents) {
            if (Arrays.binarySearch(within, p) < 0) {
                return false;
            }
        }
        return true;
    }

    private static int index(Manifest m, String name, String option) {
        int i = m.variableIndex(name);
        if (i < 0) {
            throw new UserError(option + ": unknown variable '" + name + "'");
        }
        return i;
    }

    public ScoreStore store() {
        return store;
    }

    /** The family score (kind and ESS) these tables were computed with. */
    public FamilyScore familyScore() {
        return familyScore;
    }

    public ScoringOptions options() {
        return options;
    }

    public int variableCount() {
        return candidates.length;
    }

    /** Sorted candidate parents of {@code child} (variable indices). */
    public int[] candidates(int child) {
        return candidates[child];
    }

    /** Number of allowed parent sets of {@code child}. */
    public int setCount(int child) {
        return masks[child].length;
    }

    /** Parent-set masks of {@code child} over positions in {@link #candidates(int)}. */
    public long[] masks(int child) {
        return masks[child];
    }

    /** Log weights s(i,U) + log ρ_i(U), aligned with {@link #masks(int)}. */
    public double[] weights(int child) {
        return weights[child];
    }

    /** Log prior log ρ_i(U) alone, aligned with {@link #masks(int)}. */
    public double[] logPriors(int child) {
        return logPriors[child];
    }

    /** Store family index of each parent set, aligned with {@link #masks(int)}. */
    public int[] families(int child) {
        return families[child];
    }

    /** Variable indices of parent set {@code set} of {@code child}. */
    public int[] parents(int child, int set) {
        return store.family(families[child][set]).parents();
    }

    /**
     * Mask over {@code candidates(child)} of the candidates that precede {@code child}, where
     * {@code position[v]} is variable v's place in an order.
     */
    public long predecessorMask(int child, int[] position) {
        int[] cand = candidates[child];
        long mask = 0;
        for (int pos = 0; pos < cand.length; pos++) {
            if (position[cand[pos]] < position[child]) {
                mask |= 1L << pos;
            }
        }
        return mask;
    }

    /**
     * The same tables keeping of each child only the parent sets {@code keep[child]} (ascending
     * indices into {@link #masks(int)}; a null row keeps every set): candidates unchanged, so a mask
     * means the same parents in both and edge positions agree. Returns this object when nothing is
     * dropped. Memory: one long, two doubles and one int per kept set.
     */
    public LocalScores restrictedTo(int[][] keep) {
        int n = candidates.length;
        if (keep.length != n) {
            throw new IllegalArgumentException("sets kept for " + keep.length + " children, expected " + n);
        }
        boolean same = true;
        for (int c = 0; c < n; c++) {
            same &= keep[c] == null || keep[c].length == masks[c].length;
        }
        if (same) {
            return this;
        }
        long[][] m = new long[n][];
        double[][] w = new double[n][];
        double[][] lp = new double[n][];
        int[][] f = new int[n][];
        for (int c = 0; c < n; c++) {
            if (keep[c] == null) {
                m[c] = masks[c];
                w[c] = weights[c];
                lp[c] = logPriors[c];
                f[c] = families[c];
                continue;
            }
            int k = keep[c].length;
            if (k == 0) {
                throw new IllegalArgumentException("child " + c + ": no parent set kept");
            }
            m[c] = new long[k];
            w[c] = new double[k];
            lp[c] = new double[k];
            f[c] = new int[k];
            for (int j = 0; j < k; j++) {
                int s = keep[c][j];
                if (j > 0 && s <= keep[c][j - 1]) {
                    throw new IllegalArgumentException("child " + c + ": kept sets not ascending");
                }
                m[c][j] = masks[c][s];
                w[c][j] = weights[c][s];
                lp[c][j] = logPriors[c][s];
                f[c][j] = families[c][s];
            }
        }
        return new LocalScores(store, familyScore, options, candidates, m, w, lp, f);
    }

    /**
     * The same tables with other weights (same shape as {@link #weights(int)}): e.g. the family
     * scores of the data plus one case, for an exact predictive probability as a ratio of exact
     * sums ({@code query.ExactCasePrediction}). Memory: one double per allowed parent set.
     */
    public LocalScores withWeights(double[][] newWeights) {
        if (newWeights.length != weights.length) {
            throw new IllegalArgumentException("weights for " + newWeights.length + " children, expected " + weights.length);
        }
        double[][] w = new double[weights.length][];
        for (int c = 0; c < w.length; c++) {
            if (newWeights[c].length != weights[c].length) {
                throw new IllegalArgumentException("child " + c + ": " + newWeights[c].length + " weights, expected " + weights[c].length);
            }
            w[c] = newWeights[c].clone();
        }
        return new LocalScores(store, familyScore, options, candidates, masks, w, logPriors, families);
    }
}
