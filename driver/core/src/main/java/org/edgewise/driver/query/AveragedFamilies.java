package org.edgewise.driver.query;

import org.edgewise.driver.Checks;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;

/**
 * The averaged family factors of a {@link CasePredictor}: for every child c its kept parent sets
 * U_t with weights w_c(U_t), and the factor
 * <pre>  f_c(x_c | x_pred) = Σ_t w_c(U_t) · (N_ijk + α_ijk)/(N_ij + α_ij)</pre>
 * (posterior-mean parameters: Heckerman, Geiger &amp; Chickering 1995, eq. 23), each term read from a
 * dense table of weighted predictive probabilities for sets of at most {@value #DENSE_CELLS} cells,
 * else found by binary search over the family's sorted observed configurations (N = 0 when j was
 * never observed).
 *
 * <p>Memory: per kept parent set its parent list, the family's stored configurations and counts
 * (shared with the store), one long per configuration for N_ij, and for small sets a dense table of
 * 8·q·r bytes (≈ 3 MB for 4,500 kept sets of ≤ 81 cells). Immutable and thread-safe.
 */
final class AveragedFamilies {
    /**
     * Kept parent sets with at most this many cells (q·r) get a dense table of weighted predictive
     * probabilities (8 bytes a cell), so a lookup needs no search; larger ones use binary search.
     */
    static final int DENSE_CELLS = 4096;

    private final FamilyScore score;
    private final int n;
    private final int[] arity;
    private final int[][][] parents;
    private final long[][][] configs;
    private final long[][][] counts;
    private final long[][][] rowTotals;
    private final double[][] q;
    private final double[][] weight;
    private final double[][][] dense;
    private final int[][] parentUnion;
    /** Per kept set, its parents as a bitmask over variable indices (only when n ≤ 64, else null). */
    private final long[][] setMask;

    private AveragedFamilies(FamilyScore score, int[] arity, int[][][] parents, long[][][] configs,
                             long[][][] counts, long[][][] rowTotals, double[][] q, double[][] weight,
                             double[][][] dense, int[][] parentUnion) {
        this.score = score;
        this.n = arity.length;
        this.arity = arity;
        this.parents = parents;
        this.configs = configs;
        this.counts = counts;
        this.rowTotals = rowTotals;
        this.q = q;
        this.weight = weight;
        this.dense = dense;
        this.parentUnion = parentUnion;
        this.setMask = n <= 64 ? new long[n][] : null;
        if (setMask != null) {
            for (int c = 0; c < n; c++) {
                setMask[c] = new long[parents[c].length];
                for (int t = 0; t < parents[c].length; t++) {
                    for (int p : parents[c][t]) {
                        setMask[c][t] |= 1L << p;
                    }
                }
            }
        }
    }

    /** The factors of the parent sets {@code sets[c][t]} (indices into the local scores) with weights {@code w[c][t]}. */
    static AveragedFamilies of(LocalScores ls, int[][] sets, double[][] w) {
        ScoreStore store = ls.store();
        int n = ls.variableCount();
        int[] arity = new int[n];
        for (int v = 0; v < n; v++) {
            arity[v] = store.arity(v);
        }
        int[][][] parents = new int[n][][];
        long[][][] configs = new long[n][][];
        long[][][] counts = new long[n][][];
        long[][][] totals = new long[n][][];
        double[][] q = new double[n][];
        int[][] union = new int[n][];
        for (int c = 0; c < n; c++) {
            int k = sets[c].length;
            parents[c] = new int[k][];
            configs[c] = new long[k][];
            counts[c] = new long[k][];
            totals[c] = new long[k][];
            q[c] = new double[k];
            int r = store.arity(c);
            boolean[] in = new boolean[n];
            for (int t = 0; t < k; t++) {
                FamilyCounts fc = store.family(ls.families(c)[sets[c][t]]);
                parents[c][t] = fc.parents();
                configs[c][t] = fc.configs();
                counts[c][t] = fc.counts();
                long[] tot = new long[fc.rows()];
                for (int row = 0; row < tot.length; row++) {
                    long s = 0;
                    for (int x = 0; x < r; x++) {
                        s += fc.counts()[row * r + x];
                    }
                    tot[row] = s;
                }
                totals[c][t] = tot;
                q[c][t] = store.configurations(fc.parents());
                for (int p : fc.parents()) {
                    in[p] = true;
                }
            }
            List<Integer> u = new ArrayList<>();
            for (int v = 0; v < n; v++) {
                if (in[v]) {
                    u.add(v);
                }
            }
            union[c] = u.stream().mapToInt(Integer::intValue).toArray();
        }
        double[][][] dense = new double[n][][];
        for (int c = 0; c < n; c++) {
            int r = store.arity(c);
            dense[c] = new double[sets[c].length][];
            for (int t = 0; t < sets[c].length; t++) {
                if (q[c][t] * r <= DENSE_CELLS) {
                    dense[c][t] = denseTable(ls.familyScore(), w[c][t], configs[c][t], counts[c][t], totals[c][t], r, q[c][t]);
                }
            }
        }
        return new AveragedFamilies(ls.familyScore(), arity, parents, configs, counts, totals, q, w, dense, union);
    }

    /**
     * w · (N_ijk + α_ijk)/(N_ij + α_ij) for every configuration j and state k, row-major: the
     * stored configurations from their counts, the unobserved ones with N = 0 (the prior mean).
     */
    private static double[] denseTable(FamilyScore fs, double w, long[] configs, long[] counts, long[] totals,
                                       int r, double q) {
        double[] table = new double[(int) (q * r)];
        java.util.Arrays.fill(table, w * fs.predictive(0, 0, r, q));
        for (int row = 0; row < configs.length; row++) {
            int base = (int) configs[row] * r;
            for (int k = 0; k < r; k++) {
                table[base + k] = w * fs.predictive(counts[row * r + k], totals[row], r, q);
            }
        }
        return table;
    }

    /** The same factors with those of {@code vars} replaced by the constant 1 (see {@link CasePredictor#intervened}). */
    AveragedFamilies intervened(int[] vars) {
        int[][][] ps = parents.clone();
        long[][][] cf = configs.clone();
        long[][][] ct = counts.clone();
        long[][][] tot = rowTotals.clone();
        double[][] qq = q.clone();
        double[][] w = weight.clone();
        double[][][] dn = dense.clone();
        int[][] union = parentUnion.clone();
        for (int v : vars) {
            Checks.atLeast(v, 0, "an intervened variable");
            ps[v] = new int[][] {new int[0]};
            cf[v] = new long[][] {new long[0]};
            ct[v] = new long[][] {new long[0]};
            tot[v] = new long[][] {new long[0]};
            qq[v] = new double[] {1};
            w[v] = new double[] {1};
            double[] one = new double[arity[v]];
            Arrays.fill(one, 1.0);
            dn[v] = new double[][] {one};
            union[v] = new int[0];
        }
        return new AveragedFamilies(score, arity, ps, cf, ct, tot, qq, w, dn, union);
    }

    /** The same factors without dense tables: every lookup by binary search (for tests of that path). */
    AveragedFamilies sparse() {
        double[][][] none = new double[n][][];
        for (int c = 0; c < n; c++) {
            none[c] = new double[weight[c].length][];
        }
        return new AveragedFamilies(score, arity, parents, configs, counts, rowTotals, q, weight, none, parentUnion);
    }

    /** Number of parent sets kept, summed over variables. */
    long keptSets() {
        long s = 0;
        for (double[] w : weight) {
            s += w.length;
        }
        return s;
    }

    int variableCount() {
        return n;
    }

    int arity(int v) {
        return arity[v];
    }

    /** The kept parent sets of child c (shared: read only). */
    int[][] parents(int c) {
        return parents[c];
    }

    /** Every variable that is a parent of c in some kept set, ascending (shared: read only). */
    int[] parentUnion(int c) {
        return parentUnion[c];
    }

    /** Whether kept set t of child c contains a hidden variable ({@code hiddenMask} when n ≤ 64, else {@code isHidden}). */
    boolean touches(int c, int t, long hiddenMask, boolean[] isHidden) {
        if (setMask != null) {
            return (setMask[c][t] & hiddenMask) != 0;
        }
        boolean touches = false;
        for (int p : parents[c][t]) {
            touches |= isHidden[p];
        }
        return touches;
    }

    /** log f_c(x_c | x_pred) = log Σ_t w_c(U_t) (N_ijk + α_ijk)/(N_ij + α_ij). */
    double logFactor(int c, int[] x) {
        double f = 0;
        for (int t = 0; t < parents[c].length; t++) {
            f += term(c, t, x);
        }
        return Math.log(f);
    }

    /** w_c(U_t) · (N_ijk + α_ijk)/(N_ij + α_ij) for parent set t of child c, with j, k read from {@code x}. */
    double term(int c, int t, int[] x) {
        int r = arity[c];
        long j = 0;
        for (int p : parents[c][t]) {
            j = j * arity[p] + x[p];
        }
        double[] table = dense[c][t];
        if (table != null) {
            return table[(int) j * r + x[c]];
        }
        int row = Arrays.binarySearch(configs[c][t], j);
        long nijk = 0;
        long nij = 0;
        if (row >= 0) {
            nijk = counts[c][t][row * r + x[c]];
            nij = rowTotals[c][t][row];
        }
        return weight[c][t] * score.predictive(nijk, nij, r, q[c][t]);
    }
}
