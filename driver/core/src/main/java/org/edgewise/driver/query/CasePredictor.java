package org.edgewise.driver.query;

import org.edgewise.driver.Checks;
import org.edgewise.driver.InputNames;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderPosterior;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;

/**
 * Probability of a new case given the data and an order, averaged over every DAG consistent with
 * the order (in-degree ≤ d). With parameter independence and an order-modular prior the sum over
 * DAGs factorises per variable, so for a complete case x
 * <pre>
 *   P(x | D, ≺) = P(D, x | ≺) / P(D | ≺) = Π_i Σ_{U ⊆ pred(i)} w_i(U) · (N_ijk + α_ijk) / (N_ij + α_ij)
 * </pre>
 * with w_i(U) = P(U | D, ≺) the parent-set posterior, j the configuration of U in x and k the
 * state of X_i in x (Buntine 1991; Heckerman, Geiger &amp; Chickering 1995, eq. 23 for the
 * posterior-mean parameters). The same class with one parent set per child of weight 1 gives the
 * probability under a single network.
 *
 * <p>Each factor f_i(x_i | x_pred(i)) is a distribution over x_i, so a hidden variable that no
 * kept factor conditions on sums out to 1. Working backwards through the order, a variable is
 * <em>relevant</em> when it is observed or is a parent (in some weighted set) of a relevant one;
 * the others drop out without enumeration. The relevant hidden variables are summed out exactly by
 * enumerating their joint states, refused with a {@link UserError} above a limit.
 *
 * <p>Sets whose total posterior per variable is at most {@code tailMass} (smallest first) may be
 * skipped and the remaining weights renormalised; 0 keeps every set (exact).
 *
 * <p>Memory: per kept parent set its parent list, the family's stored configurations and counts
 * (shared with the store), one long per configuration for N_ij, and for sets of at most
 * {@value #DENSE_CELLS} cells a dense table of 8·q·r bytes (≈ 3 MB for 4,500 kept sets of ≤ 81 cells).
 *
 * <p>Immutable and thread-safe.
 */
public final class CasePredictor implements CaseProbability {
    /**
     * Kept parent sets with at most this many cells (q·r) get a dense table of weighted predictive
     * probabilities (8 bytes a cell), so a lookup needs no search; larger ones use binary search.
     */
    static final int DENSE_CELLS = 4096;

    /** Default limit on the joint states of hidden variables enumerated for one case. */
    public static final long DEFAULT_MAX_HIDDEN_STATES = 1_000_000L;

    private final ScoreStore store;
    private final FamilyScore score;
    private final int n;
    private final int[] order;
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
    private final double skippedMass;
    private final long maxHiddenStates;
    /** How the caller names the evidence and the hidden-state limit in messages. */
    private final InputNames names;

    private CasePredictor(ScoreStore store, FamilyScore score, int[] order, int[][][] parents, long[][][] configs,
                          long[][][] counts, long[][][] rowTotals, double[][] q, double[][] weight,
                          double[][][] dense, int[][] parentUnion, double skippedMass, long maxHiddenStates,
                          InputNames names) {
        this.store = store;
        this.score = score;
        this.n = store.variableCount();
        this.order = order;
        this.arity = new int[n];
        for (int v = 0; v < n; v++) {
            arity[v] = store.arity(v);
        }
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
        this.skippedMass = skippedMass;
        this.maxHiddenStates = maxHiddenStates;
        this.names = names;
    }

    /** Averaged over parent sets with their posteriors under the order; see the class comment for {@code tailMass}. */
    public static CasePredictor averaged(OrderPosterior op, double tailMass) {
        Checks.unitInterval(tailMass, "the tail mass");
        LocalScores ls = op.scores();
        int n = ls.variableCount();
        int[][] sets = new int[n][];
        double[][] w = new double[n][];
        double skipped = 0;
        for (int c = 0; c < n; c++) {
            double[] p = op.setPosteriors()[c];
            Integer[] live = OrderPosterior.positiveSets(p);
            Arrays.sort(live, (a, b) -> Double.compare(p[a], p[b]));
            // Skip the smallest sets while their combined posterior stays within tailMass.
            int first = 0;
            double tail = 0;
            while (first < live.length - 1 && tail + p[live[first]] <= tailMass) {
                tail += p[live[first]];
                first++;
            }
            skipped += tail;
            int k = live.length - first;
            sets[c] = new int[k];
            w[c] = new double[k];
            double kept = 0;
            for (int t = 0; t < k; t++) {
                sets[c][t] = live[live.length - 1 - t];
                kept += p[sets[c][t]];
            }
            for (int t = 0; t < k; t++) {
                w[c][t] = p[sets[c][t]] / kept;
            }
        }
        return build(op, sets, w, skipped);
    }

    /** The single best network under the order: each child's highest-weight parent set, weight 1. */
    public static CasePredictor bestNetwork(OrderPosterior op) {
        int[] best = op.bestSets();
        int n = best.length;
        int[][] sets = new int[n][];
        double[][] w = new double[n][];
        for (int c = 0; c < n; c++) {
            sets[c] = new int[] {best[c]};
            w[c] = new double[] {1.0};
        }
        return build(op, sets, w, 0);
    }

    private static CasePredictor build(OrderPosterior op, int[][] sets, double[][] w, double skipped) {
        LocalScores ls = op.scores();
        ScoreStore store = ls.store();
        int n = ls.variableCount();
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
        return new CasePredictor(store, ls.familyScore(), op.order(), parents, configs, counts, totals, q, w,
                dense, union, skipped, DEFAULT_MAX_HIDDEN_STATES, ls.options().names());
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

    /** The same predictor with another limit on the hidden joint states enumerated per case. */
    public CasePredictor withMaxHiddenStates(long limit) {
        Checks.atLeast(limit, 1, "the limit on hidden joint states");
        return new CasePredictor(store, score, order, parents, configs, counts, rowTotals, q, weight, dense,
                parentUnion, skippedMass, limit, names);
    }

    /**
     * The truncated factorisation of an intervention (Spirtes, Glymour &amp; Scheines 1993; Pearl
     * 2000, eq. 3.10): the same predictor with the factors of {@code vars} replaced by the constant
     * 1, so that {@link #logProbability} of a case fixing them gives log P(case | do(vars), D, ≺) —
     * each intervened variable is set, not explained by its parents, and its parents are no longer
     * needed on its account.
     */
    public CasePredictor intervened(int[] vars) {
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
        return new CasePredictor(store, score, order, ps, cf, ct, tot, qq, w, dn, union, skippedMass, maxHiddenStates, names);
    }

    /** The same predictor without dense tables: every lookup by binary search (for tests of that path). */
    CasePredictor sparse() {
        double[][][] none = new double[n][][];
        for (int c = 0; c < n; c++) {
            none[c] = new double[weight[c].length][];
        }
        return new CasePredictor(store, score, order, parents, configs, counts, rowTotals, q, weight, none,
                parentUnion, skippedMass, maxHiddenStates, names);
    }

    /** Posterior mass skipped in total over all variables (0 when exact). */
    public double skippedMass() {
        return skippedMass;
    }

    /** Number of parent sets kept, summed over variables. */
    public long keptSets() {
        long s = 0;
        for (double[] w : weight) {
            s += w.length;
        }
        return s;
    }

    /**
     * log P(case | D, ≺) for a case with {@code states[v]} the state of v or
     * {@link CaseParser#HIDDEN}; hidden variables are summed out. 0 for an empty case.
     */
    public double logProbability(int[] states) {
        boolean complete = true;
        for (int s : states) {
            if (s == CaseParser.HIDDEN) {
                complete = false;
                break;
            }
        }
        if (complete) {
            double lp = 0;
            for (int c = 0; c < n; c++) {
                lp += logFactor(c, states);
            }
            return lp;
        }
        int[] x = states.clone();
        boolean[] keep = relevant(x);
        int[] hidden = relevantHidden(x, keep);
        if (hidden.length == 0) {
            double lp = 0;
            for (int c = 0; c < n; c++) {
                if (keep[c]) {
                    lp += logFactor(c, x);
                }
            }
            return lp;
        }
        double joint = jointStates(hidden);
        if (joint > maxHiddenStates) {
            throw new UserError("summing out hidden variables " + names(hidden) + " would enumerate "
                    + String.format(java.util.Locale.ROOT, "%.0f", joint) + " joint states (limit "
                    + maxHiddenStates + "); observe some of them or raise " + names.maxHiddenStates());
        }
        boolean[] isHidden = new boolean[n];
        long hiddenMask = 0;
        for (int h : hidden) {
            isHidden[h] = true;
            hiddenMask |= n <= 64 ? 1L << h : 0;
        }
        // Split every dependent factor into the sets that touch no hidden variable (summed once per
        // child state, in base) and the sets that do (re-evaluated for every joint state).
        double constant = 0;
        int[] dependent = new int[n];
        int nd = 0;
        for (int c = 0; c < n; c++) {
            if (!keep[c]) {
                continue;
            }
            boolean depends = isHidden[c];
            for (int p : parentUnion[c]) {
                depends |= isHidden[p];
            }
            if (depends) {
                dependent[nd++] = c;
            } else {
                constant += logFactor(c, x);
            }
        }
        dependent = Arrays.copyOf(dependent, nd);
        double[][] base = new double[dependent.length][];
        int[][] varying = new int[dependent.length][];
        for (int d = 0; d < dependent.length; d++) {
            int c = dependent[d];
            int[][] ps = parents[c];
            int[] vary = new int[ps.length];
            int nv = 0;
            double[] b = new double[arity[c]];
            int saved = x[c];
            for (int t = 0; t < ps.length; t++) {
                boolean touches = false;
                if (setMask != null) {
                    touches = (setMask[c][t] & hiddenMask) != 0;
                } else {
                    for (int p : ps[t]) {
                        touches |= isHidden[p];
                    }
                }
                if (touches) {
                    vary[nv++] = t;
                } else if (isHidden[c]) {
                    for (int k = 0; k < arity[c]; k++) {
                        x[c] = k;
                        b[k] += term(c, t, x);
                    }
                } else {
                    b[saved] += term(c, t, x);
                }
            }
            x[c] = saved;
            base[d] = b;
            varying[d] = Arrays.copyOf(vary, nv);
        }
        // Tabulate each dependent factor over the joint states of the hidden variables it depends
        // on (usually one or two), so the enumeration below only looks values up.
        double[][] logTable = new double[dependent.length][];
        int[][] on = new int[dependent.length][];
        boolean[] uses = new boolean[n];
        int[] hsBuf = new int[hidden.length];
        for (int d = 0; d < dependent.length; d++) {
            int c = dependent[d];
            uses[c] = isHidden[c];
            for (int t : varying[d]) {
                for (int p : parents[c][t]) {
                    uses[p] |= isHidden[p];
                }
            }
            int m = 0;
            for (int h : hidden) {
                if (uses[h]) {
                    hsBuf[m++] = h;
                    uses[h] = false;
                }
            }
            uses[c] = false;
            int[] hs = Arrays.copyOf(hsBuf, m);
            logTable[d] = tabulate(c, x, hs, isHidden[c], base[d], varying[d]);
            on[d] = hs;
        }
        for (int h : hidden) {
            x[h] = 0;
        }
        double acc = Double.NEGATIVE_INFINITY;
        while (true) {
            double lp = 0;
            for (int d = 0; d < dependent.length; d++) {
                int cell = 0;
                for (int h : on[d]) {
                    cell = cell * arity[h] + x[h];
                }
                lp += logTable[d][cell];
            }
            acc = LogSum.add(acc, lp);
            int i = 0;
            while (i < hidden.length && ++x[hidden[i]] == arity[hidden[i]]) {
                x[hidden[i]] = 0;
                i++;
            }
            if (i == hidden.length) {
                break;
            }
        }
        return constant + acc;
    }

    /**
     * log f_c over the joint states of {@code hs} (the hidden variables factor c depends on; c
     * itself among them when hidden), mixed radix with hs[0] most significant. Each parent set
     * touches only the hidden variables it contains, so its terms are evaluated over those alone,
     * summed into one small table per distinct subset, and the subsets are broadcast once.
     * Memory: the result (one double per joint state) plus one small table per subset.
     */
    private double[] tabulate(int c, int[] x, int[] hs, boolean childHidden, double[] base, int[] varying) {
        int m = hs.length;
        int size = 1;
        for (int h : hs) {
            size *= arity[h];
        }
        int childBit = 0;
        if (childHidden) {
            for (int i = 0; i < m; i++) {
                if (hs[i] == c) {
                    childBit = 1 << i;
                }
            }
        }
        int[] keys = new int[4];
        double[][] sums = new double[4][];
        int groups = 0;
        if (childHidden) {
            keys[0] = childBit;
            sums[0] = base.clone();
            groups = 1;
        }
        int[] saved = new int[m];
        for (int i = 0; i < m; i++) {
            saved[i] = x[hs[i]];
        }
        for (int t : varying) {
            int key = childBit;
            for (int p : parents[c][t]) {
                for (int i = 0; i < m; i++) {
                    if (hs[i] == p) {
                        key |= 1 << i;
                    }
                }
            }
            int g = 0;
            while (g < groups && keys[g] != key) {
                g++;
            }
            if (g == groups) {
                if (groups == keys.length) {
                    keys = Arrays.copyOf(keys, groups * 2);
                    sums = Arrays.copyOf(sums, groups * 2);
                }
                keys[g] = key;
                sums[g] = new double[subStates(hs, key)];
                groups++;
            }
            double[] sum = sums[g];
            for (int i = 0; i < m; i++) {
                if ((key >>> i & 1) != 0) {
                    x[hs[i]] = 0;
                }
            }
            for (int cell = 0; cell < sum.length; cell++) {
                sum[cell] += term(c, t, x);
                int i = m - 1;
                while (i >= 0) {
                    if ((key >>> i & 1) != 0) {
                        if (++x[hs[i]] < arity[hs[i]]) {
                            break;
                        }
                        x[hs[i]] = 0;
                    }
                    i--;
                }
            }
        }
        double constant = childHidden ? 0 : base[x[c]];
        // stride[g][i]: how far group g's sub-index moves when digit i moves by one (0 when the
        // group does not involve hs[i]); sub-indices are updated as the digits count up.
        int[][] stride = new int[groups][m];
        for (int g = 0; g < groups; g++) {
            int st = 1;
            for (int i = m - 1; i >= 0; i--) {
                if ((keys[g] >>> i & 1) != 0) {
                    stride[g][i] = st;
                    st *= arity[hs[i]];
                }
            }
        }
        double[] table = new double[size];
        int[] digit = new int[m];
        int[] sub = new int[groups];
        for (int cell = 0; cell < size; cell++) {
            double f = constant;
            for (int g = 0; g < groups; g++) {
                f += sums[g][sub[g]];
            }
            table[cell] = Math.log(f);
            int i = m - 1;
            while (i >= 0) {
                if (++digit[i] < arity[hs[i]]) {
                    for (int g = 0; g < groups; g++) {
                        sub[g] += stride[g][i];
                    }
                    break;
                }
                digit[i] = 0;
                for (int g = 0; g < groups; g++) {
                    sub[g] -= (arity[hs[i]] - 1) * stride[g][i];
                }
                i--;
            }
        }
        for (int i = 0; i < m; i++) {
            x[hs[i]] = saved[i];
        }
        return table;
    }

    private int subStates(int[] hs, int key) {
        int s = 1;
        for (int i = 0; i < hs.length; i++) {
            if ((key >>> i & 1) != 0) {
                s *= arity[hs[i]];
            }
        }
        return s;
    }

    /** The hidden variables {@link #logProbability} must sum out for this case (the others drop out). */
    public int[] hiddenToSumOut(int[] states) {
        int[] x = states.clone();
        return relevantHidden(x, relevant(x));
    }

    /** Number of joint states of hidden variables that {@link #logProbability} would enumerate for this case. */
    public double hiddenJointStates(int[] states) {
        int[] hidden = hiddenToSumOut(states);
        return hidden.length == 0 ? 0 : jointStates(hidden);
    }

    /**
     * log P(target | given, D, ≺) = log P(target ∪ given) − log P(given); −∞ when the two
     * disagree on a variable. Throws a {@link UserError} when the evidence has probability zero.
     */
    public double logConditional(int[] target, int[] given) {
        return CaseConditional.of(this, target, given, names.given() + " has probability zero under this order and store; a conditional on it is undefined");
    }

    /** Backward pass through the order: which factors matter for this case. */
    private boolean[] relevant(int[] x) {
        boolean[] needed = new boolean[n];
        boolean[] keep = new boolean[n];
        for (int p = n - 1; p >= 0; p--) {
            int v = order[p];
            if (x[v] != CaseParser.HIDDEN || needed[v]) {
                keep[v] = true;
                for (int u : parentUnion[v]) {
                    needed[u] = true;
                }
            }
        }
        return keep;
    }

    private int[] relevantHidden(int[] x, boolean[] keep) {
        int count = 0;
        for (int v = 0; v < n; v++) {
            if (keep[v] && x[v] == CaseParser.HIDDEN) {
                count++;
            }
        }
        int[] out = new int[count];
        for (int v = 0, i = 0; v < n; v++) {
            if (keep[v] && x[v] == CaseParser.HIDDEN) {
                out[i++] = v;
            }
        }
        return out;
    }

    private double jointStates(int[] hidden) {
        double joint = 1;
        for (int h : hidden) {
            joint *= arity[h];
        }
        return joint;
    }

    /**
     * log f_c(x_c | x_pred) = log Σ_U w_c(U) (N_ijk + α_ijk)/(N_ij + α_ij), with N_ij found by binary
     * search over the family's sorted observed configurations (0 when j was never observed).
     */
    private double logFactor(int c, int[] x) {
        double f = 0;
        for (int t = 0; t < parents[c].length; t++) {
            f += term(c, t, x);
        }
        return Math.log(f);
    }

    /** w_c(U_t) · (N_ijk + α_ijk)/(N_ij + α_ij) for parent set t of child c, with j, k read from {@code x}. */
    private double term(int c, int t, int[] x) {
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

    private String names(int[] vars) {
        List<String> out = new ArrayList<>();
        for (int v : vars) {
            out.add(store.variables().get(v).name());
        }
        return String.join(", ", out);
    }
}
