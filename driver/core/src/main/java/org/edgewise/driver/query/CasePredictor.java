package org.edgewise.driver.query;

import org.edgewise.driver.Checks;
import org.edgewise.driver.InputNames;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderPosterior;
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
 * <p>The factors, their tables and memory: {@link AveragedFamilies}; the summing out of hidden
 * variables: {@link HiddenSum}.
 *
 * <p>Immutable and thread-safe.
 */
public final class CasePredictor implements CaseProbability {
    /** Default limit on the joint states of hidden variables enumerated for one case. */
    public static final long DEFAULT_MAX_HIDDEN_STATES = 1_000_000L;

    private final ScoreStore store;
    private final int n;
    private final int[] order;
    private final AveragedFamilies families;
    private final double skippedMass;
    private final long maxHiddenStates;
    /** How the caller names the evidence and the hidden-state limit in messages. */
    private final InputNames names;

    private CasePredictor(ScoreStore store, int[] order, AveragedFamilies families, double skippedMass,
                          long maxHiddenStates, InputNames names) {
        this.store = store;
        this.n = store.variableCount();
        this.order = order;
        this.families = families;
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
        return new CasePredictor(ls.store(), op.order(), AveragedFamilies.of(ls, sets, w), skipped,
                DEFAULT_MAX_HIDDEN_STATES, ls.options().names());
    }

    /** The same predictor with another limit on the hidden joint states enumerated per case. */
    public CasePredictor withMaxHiddenStates(long limit) {
        Checks.atLeast(limit, 1, "the limit on hidden joint states");
        return new CasePredictor(store, order, families, skippedMass, limit, names);
    }

    /**
     * The truncated factorisation of an intervention (Spirtes, Glymour &amp; Scheines 1993; Pearl
     * 2000, eq. 3.10): the same predictor with the factors of {@code vars} replaced by the constant
     * 1, so that {@link #logProbability} of a case fixing them gives log P(case | do(vars), D, ≺) —
     * each intervened variable is set, not explained by its parents, and its parents are no longer
     * needed on its account.
     */
    public CasePredictor intervened(int[] vars) {
        return new CasePredictor(store, order, families.intervened(vars), skippedMass, maxHiddenStates, names);
    }

    /** The same predictor without dense tables: every lookup by binary search (for tests of that path). */
    CasePredictor sparse() {
        return new CasePredictor(store, order, families.sparse(), skippedMass, maxHiddenStates, names);
    }

    /** Posterior mass skipped in total over all variables (0 when exact). */
    public double skippedMass() {
        return skippedMass;
    }

    /** Number of parent sets kept, summed over variables. */
    public long keptSets() {
        return families.keptSets();
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
                lp += families.logFactor(c, states);
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
                    lp += families.logFactor(c, x);
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
        return HiddenSum.logSum(families, x, keep, hidden);
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
                for (int u : families.parentUnion(v)) {
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
            joint *= families.arity(h);
        }
        return joint;
    }

    private String names(int[] vars) {
        List<String> out = new ArrayList<>();
        for (int v : vars) {
            out.add(store.variables().get(v).name());
        }
        return String.join(", ", out);
    }
}
