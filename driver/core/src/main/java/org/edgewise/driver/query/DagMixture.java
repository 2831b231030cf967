package org.edgewise.driver.query;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeSet;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;

/**
 * The probability of a case averaged over a weighted sample of DAGs (a saved posterior sample):
 * <pre>
 *   P(x | D) ≈ Σ_g w_g P(x | G_g, θ̄_g) / Σ_g w_g,
 * </pre>
 * each term exact inference on that DAG ({@link DagInference}) with the posterior-mean parameters
 * θ̄_ijk = (N_ijk + α_ijk)/(N_ij + α_ij) from the store's counts ({@link FamilyScore#predictive});
 * a conditional is the ratio of the averaged joints. Repeated DAGs are evaluated once. Before any
 * numeric work every distinct DAG is planned: one whose elimination table would exceed the limit,
 * or that uses a family the store does not hold, is refused. Sampled: every figure has a Monte
 * Carlo standard error ({@link #mcse}) from the draws in chain order.
 *
 * <p>Memory: the DAGs (shared with the caller), one index per draw; per case, one plan per distinct
 * DAG and the factors of {@link DagInference} (at most the limit's entries × 8 bytes per table).
 */
public final class DagMixture implements CaseProbability {
    private final ScoreStore store;
    private final FamilyScore score;
    private final int[] arity;
    private final int[][][] distinct;
    private final int[] unit;
    private final double[] logW;
    private final int chains;
    private final long maxTable;
    private final InputNames names;
    private final String where;
    private final Map<String, Integer>[] familyOf;

    /**
     * @param dags     the DAGs in draw order, chain after chain (parents ascending)
     * @param weights  per DAG, or null when all weigh alike
     * @param chains   the number of chains the draws come from, 0 for independent draws
     * @param maxTable the largest elimination table allowed (entries)
     * @param where    how messages name a DAG's source (e.g. "sample DIR")
     */
    @SuppressWarnings("unchecked")
    public DagMixture(ScoreStore store, FamilyScore score, int[][][] dags, double[] weights, int chains, long maxTable,
                      InputNames names, String where) {
        this.store = store;
        this.score = score;
        int n = store.variableCount();
        this.arity = new int[n];
        for (int v = 0; v < n; v++) {
            arity[v] = store.arity(v);
        }
        Map<String, Integer> seen = new HashMap<>();
        List<int[][]> list = new ArrayList<>();
        unit = new int[dags.length];
        logW = new double[dags.length];
        for (int g = 0; g < dags.length; g++) {
            Integer u = seen.putIfAbsent(Arrays.deepToString(dags[g]), list.size());
            if (u == null) {
                u = list.size();
                list.add(dags[g]);
            }
            unit[g] = u;
            logW[g] = weights == null ? 0 : Math.log(weights[g]);
        }
        this.distinct = list.toArray(new int[0][][]);
        this.chains = chains;
        this.maxTable = maxTable;
        this.names = names;
        this.where = where;
        familyOf = PredictionDraws.familyIndex(store);
    }

    /** Number of draws (K, repeats counted). */
    public int draws() {
        return unit.length;
    }

    /** Number of distinct DAGs. */
    public int size() {
        return distinct.length;
    }

    /** The draw whose DAG weighs most in total (the sample's mode). */
    public int[][] mode() {
        double[] w = new double[distinct.length];
        for (int g = 0; g < unit.length; g++) {
            w[unit[g]] += Math.exp(logW[g]);
        }
        int best = 0;
        for (int u = 1; u < w.length; u++) {
            if (w[u] > w[best]) {
                best = u;
            }
        }
        return distinct[best];
    }

    @Override
    public boolean sampled() {
        return true;
    }

    /**
     * log P(x | G, θ̄) per distinct DAG; every DAG planned (and refused) before any is evaluated. DAGs that
     * agree on the ancestral subgraph of the case's observed cells ({@link DagInference.Subgraph}) give the
     * same value, so one of each such group is planned and evaluated and the rest share its value.
     */
    private double[] perDag(int[] states) {
        int[] rep = new int[distinct.length];
        Map<DagInference.Subgraph, Integer> groups = new HashMap<>();
        for (int u = 0; u < distinct.length; u++) {
            rep[u] = groups.computeIfAbsent(DagInference.Subgraph.observed(distinct[u], states), key -> groups.size());
        }
        int[] member = new int[groups.size()];
        for (int u = distinct.length - 1; u >= 0; u--) {
            member[rep[u]] = u;
        }
        double[] byGroup = perGroup(states, member);
        double[] out = new double[distinct.length];
        for (int u = 0; u < distinct.length; u++) {
            out[u] = byGroup[rep[u]];
        }
        return out;
    }

    /** log P(x | G, θ̄) for the distinct DAGs {@code which}; every one planned (and refused) before any is evaluated. */
    private double[] perGroup(int[] states, int[] which) {
        DagInference.Plan[] plans = new DagInference.Plan[which.length];
        int[][] families = new int[which.length][];
        for (int i = 0; i < which.length; i++) {
            int u = which[i];
            plans[i] = DagInference.plan(distinct[u], arity, states);
            if (plans[i].largest() > maxTable) {
                int g = first(u);
                throw new UserError(String.format(Locale.ROOT, "%s: DAG %d (chain %d): summing out the hidden ancestors of the "
                        + "case by elimination would build a table of %.0f entries (limit %d); observe more of them, or raise %s",
                        where, g % perChain() + 1, g / perChain() + 1, plans[i].largest(), maxTable, names.maxHiddenStates()));
            }
            families[i] = new int[arity.length];
            for (int v : plans[i].factors()) {
                Integer f = familyOf[v].get(Arrays.toString(distinct[u][v]));
                if (f == null) {
                    List<String> pa = new ArrayList<>();
                    for (int p : distinct[u][v]) {
                        pa.add(store.variables().get(p).name());
                    }
                    throw new UserError(where + ": a DAG gives " + store.variables().get(v).name() + " the parents {"
                            + String.join(", ", pa) + "}, a family the store does not hold");
                }
                families[i][v] = f;
            }
        }
        double[] out = new double[which.length];
        for (int i = 0; i < which.length; i++) {
            int[] fam = families[i];
            out[i] = DagInference.logProbability(plans[i], distinct[which[i]], arity, states, (v, j, k) -> logTheta(fam[v], j, k));
        }
        return out;
    }

    private int perChain() {
        return chains == 0 ? unit.length : unit.length / chains;
    }

    private int first(int u) {
        for (int g = 0; g < unit.length; g++) {
            if (unit[g] == u) {
                return g;
            }
        }
        return 0;
    }

    /** log θ̄(k | j) of store family f from its counts. */
    private double logTheta(int f, long j, int k) {
        FamilyCounts fc = store.family(f);
        int r = arity[fc.child()];
        int row = Arrays.binarySearch(fc.configs(), j);
        long nijk = 0;
        long nij = 0;
        if (row >= 0) {
            nijk = fc.counts()[row * r + k];
            for (int x = 0; x < r; x++) {
                nij += fc.counts()[row * r + x];
            }
        }
        return Math.log(score.predictive(nijk, nij, r, store.configurations(fc.parents())));
    }

    /** log of the weighted average of e^{l[unit[g]]} over the draws. */
    private double average(double[] l) {
        double[] t = new double[unit.length];
        for (int g = 0; g < unit.length; g++) {
            t[g] = logW[g] + l[unit[g]];
        }
        return LogSum.of(t) - LogSum.of(logW);
    }

    @Override
    public double logProbability(int[] states) {
        return average(perDag(states));
    }

    @Override
    public double logConditional(int[] target, int[] given) {
        return CaseConditional.of(this, target, given, names.given() + " has probability zero under every DAG of the sample; "
                + "a conditional on it is undefined");
    }

    /**
     * The Monte Carlo standard error of the estimate R = Σ w_g Y_g / Σ w_g X_g, Y_g = P(target, given | G_g),
     * X_g = P(given | G_g) (1 without evidence), by the delta method for a ratio (Cochran 1977, §6.4):
     * the error of Σ_g w̃_g z_g with w̃ normalised and z_g = R (Y_g/Ȳ − X_g/X̄), values scaled by their
     * means in log space. Independent draws: sqrt(Σ w̃² z²); chains: the MCSE of the mean of K w̃_g z_g
     * over the chains in draw order, from its effective sample size ({@link ChainDiagnostics#summary}).
     */
    @Override
    public double mcse(int[] target, int[] given) {
        int[] joint = given == null ? target : CaseConditional.joint(target, given);
        if (joint == null) {
            return 0.0;
        }
        double[] ly = perDag(joint);
        double[] lx = given == null ? new double[distinct.length] : perDag(given);
        return mcse(ly, lx);
    }

    /** {@link #mcse(int[], int[])} from the per-DAG log values of the joint and of the evidence. */
    private double mcse(double[] ly, double[] lx) {
        double lyBar = average(ly);
        double lxBar = average(lx);
        if (lyBar == Double.NEGATIVE_INFINITY) {
            return 0.0;
        }
        double r = Math.exp(lyBar - lxBar);
        int k = unit.length;
        double lz = LogSum.of(logW);
        double[] wz = new double[k];
        for (int g = 0; g < k; g++) {
            double w = Math.exp(logW[g] - lz);
            wz[g] = w * r * (Math.exp(ly[unit[g]] - lyBar) - Math.exp(lx[unit[g]] - lxBar));
        }
        int per = perChain();
        if (chains > 0 && per >= 4) {
            double[][] x = new double[chains][per];
            for (int c = 0; c < chains; c++) {
                for (int t = 0; t < per; t++) {
                    x[c][t] = k * wz[c * per + t];
                }
            }
            double m = ChainDiagnostics.summary(x).mcse();
            return Double.isNaN(m) ? 0 : m;
        }
        double s = 0;
        for (double v : wz) {
            s += v * v;
        }
        return Math.sqrt(s);
    }

    /**
     * P(y = k | e) for every state k of {@code target} with its Monte Carlo standard error, from one
     * pass per state: per DAG log P(y = k, e | G), and log P(e | G) as their log-sum-exp over k (the
     * law of total probability), so the numbers equal {@link #logConditional} and {@link #mcse} for
     * each k at a third of their work.
     *
     * @return {@code [0]} the probabilities, {@code [1]} their standard errors
     */
    public double[][] conditionalOverStates(int target, int states, int[] evidence) {
        int[] x = evidence.clone();
        double[][] ly = new double[states][];
        for (int k = 0; k < states; k++) {
            x[target] = k;
            ly[k] = perDag(x);
        }
        double[] lx = new double[distinct.length];
        double[] col = new double[states];
        for (int u = 0; u < distinct.length; u++) {
            for (int k = 0; k < states; k++) {
                col[k] = ly[k][u];
            }
            lx[u] = LogSum.of(col);
        }
        double lxBar = average(lx);
        if (lxBar == Double.NEGATIVE_INFINITY) {
            throw new UserError("the row's cells have probability zero under every DAG of the sample; no prediction is defined");
        }
        double[][] out = new double[2][states];
        for (int k = 0; k < states; k++) {
            out[0][k] = Math.exp(average(ly[k]) - lxBar);
            out[1][k] = mcse(ly[k], lx);
        }
        return out;
    }

    /** The hidden variables that are ancestors of an observed one in some DAG of the sample. */
    @Override
    public int[] hiddenToSumOut(int[] states) {
        TreeSet<Integer> h = new TreeSet<>();
        for (int[][] dag : distinct) {
            for (int v : DagInference.plan(dag, arity, states).order()) {
                h.add(v);
            }
        }
        return h.stream().mapToInt(Integer::intValue).toArray();
    }

    /** The joint states of those hidden variables (summed over by elimination, not enumerated). */
    @Override
    public double hiddenJointStates(int[] states) {
        int[] h = hiddenToSumOut(states);
        return h.length == 0 ? 0 : DagInference.size(h, arity);
    }

    @Override
    public double skippedMass() {
        return 0;
    }
}
