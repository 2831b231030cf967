package org.edgewise.driver.effect;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.edgewise.driver.Checks;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.dag.DagFeatures;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.average.givenorder.OrderSum;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.query.DagInference;
import org.edgewise.driver.query.CasePredictor;

/**
 * Interventional probabilities averaged over structures and parameters (DESIGN.md,
 * "Interventions"):
 * <pre>
 *   P(y | do(x = a), D) = Σ_G P(G | D) Σ_{v : x = a} Π_{i ∉ X} θ̄_i(v_i | v_{U_i}),   θ̄_ijk = (N_ijk + α_ijk)/(N_ij + α_ij)
 * </pre>
 * (the truncated factorisation, Spirtes, Glymour &amp; Scheines 1993; Pearl 2000, §3.2). Posterior-mean
 * parameters give the exact posterior mean, since each family enters every term once and
 * families are independent a posteriori. Given an order ≺ the parent sets are independent too,
 * so the average over the DAGs consistent with ≺ is the product of the averaged family factors
 * with the intervened variables' factors removed: {@link CasePredictor#intervened}.
 *
 * <p>Sources of structures: {@link #overOrders} — one given order (exact), every allowed order
 * with its weight exp(logEvidence(≺)) (exact under the order-modular prior, Koivisto &amp; Sood
 * 2004), or a sample of orders (equal weights; MCSE) — and {@link #overDags}, any weighted list of
 * DAGs (exact for an enumeration; MCSE for draws).
 *
 * <p>With evidence w the probability is the ratio of averaged joints P(y, w | do(x), D) / P(w |
 * do(x), D): the predictive for a new unit that is set to x and then seen to have w — exact also
 * when w may be a descendant of x. The posterior distribution of the effect comes from (DAG, θ)
 * draws ({@link EffectDraws}); with evidence, each draw's value is its own ratio, so the draws'
 * mean need not equal {@code probability}.
 *
 * <p>MCSE of a sampled ratio by the delta method: the standard error of the mean of
 * z_k = (a_k − R b_k)/b̄ (Owen 2013, "Monte Carlo theory, methods and examples", §9.2), over
 * independent draws sqrt(Σ w_k² z_k²)/Σ w_k; over chains of order MCMC from
 * {@link org.edgewise.driver.average.convergence.ChainDiagnostics} (autocorrelation-aware, Vehtari et al. 2021).
 *
 * <p>Memory: per order (or DAG) 9 doubles per query; one {@link CasePredictor} at a time.
 */
public final class EffectEngine {
    /** Default number of (DAG, θ) draws for the posterior distribution of the effect. */
    public static final int DEFAULT_DRAWS = 2000;
    /** Level of the credible interval. */
    public static final double LEVEL = 0.95;

    /**
     * @param draws           (DAG, θ) draws for the distribution of the effect (≥ 10)
     * @param seed            seed of every draw
     * @param maxHiddenStates limit on the joint states of hidden variables summed out
     */
    public record Settings(int draws, long seed, long maxHiddenStates) {
        public Settings {
            Checks.atLeast(draws, 10, "the number of effect draws");
            Checks.atMost(draws, Checks.MAX_EFFECT_DRAWS, "the number of effect draws", "each draw is kept in memory");
            Checks.atLeast(maxHiddenStates, 1, "the limit on hidden joint states");
        }
    }

    private EffectEngine() {
    }

    /** The effect of every query over the orders of {@code src}. */
    public static List<Effect> overOrders(LocalScores ls, EffectOrders src, List<EffectQuery> qs, Settings s) {
        int n = ls.variableCount();
        List<int[]> orders = src.orders();
        int k = orders.size();
        double[] logW = new double[k];
        if (src.weighted()) {
            for (int o = 0; o < k; o++) {
                logW[o] = OrderSum.evaluate(ls, orders.get(o)).logEvidence();
            }
        }
        SplittableRandom rng = new SplittableRandom(s.seed());
        int[] drawUnit = assign(logW, src.weighted(), s.draws(), rng);
        long[][][] masks = NoPath.variableMasks(ls);
        DagEffects dag = new DagEffects(ls.store(), s.maxHiddenStates(), ls.options().names().maxHiddenStates());
        Parameters theta = Parameters.draws(ls, rng);
        double[][][] terms = new double[qs.size()][k][];
        double[][] values = new double[qs.size()][s.draws()];
        boolean[][] none = new boolean[qs.size()][s.draws()];
        PairDraws[] pairs = PairDraws.empty(qs.size(), s.draws());
        int[][] byUnit = group(drawUnit, k);
        for (int o = 0; o < k; o++) {
            if (logW[o] == Double.NEGATIVE_INFINITY) {
                for (double[][] t : terms) {
                    t[o] = Term.impossible();
                }
                continue;
            }
            int[] order = orders.get(o);
            OrderPosterior op;
            try {
                op = OrderPosterior.of(ls, order);
            } catch (UserError e) {
                logW[o] = Double.NEGATIVE_INFINITY; // a required edge against this order: likelihood zero
                for (double[][] t : terms) {
                    t[o] = Term.impossible();
                }
                continue;
            }
            CasePredictor plain = CasePredictor.averaged(op, 0).withMaxHiddenStates(s.maxHiddenStates());
            Map<String, CasePredictor> cut = new HashMap<>();
            for (int qi = 0; qi < qs.size(); qi++) {
                EffectQuery q = qs.get(qi);
                CasePredictor t = cut.computeIfAbsent(Arrays.toString(q.setVariables()), key -> plain.intervened(q.setVariables()));
                double[] row = Term.row(q, (intervened, states) -> (intervened ? t : plain).logProbability(states));
                Term.NO_PATH.set(row, NoPath.exact(order, op.setPosteriors(), masks, flags(n, q.setVariables()), outcome(q)));
                terms[qi][o] = row;
            }
            if (byUnit[o].length > 0) {
                int[] pos = OrderSum.positions(order, n);
                long[] pred = new long[n];
                double[] z = op.result().childLogSum();
                for (int c = 0; c < n; c++) {
                    pred[c] = ls.predecessorMask(c, pos);
                }
                for (int d : byUnit[o]) {
                    int[] chosen = DagFeatures.sampleDag(ls, pred, z, rng);
                    int[][] parents = new int[n][];
                    for (int c = 0; c < n; c++) {
                        parents[c] = ls.parents(c, chosen[c]);
                    }
                    drawValues(dag.on(parents, ""), theta, parents, qs, values, none, pairs, d);
                }
            }
        }
        List<Effect> out = new ArrayList<>();
        for (int qi = 0; qi < qs.size(); qi++) {
            out.add(EffectMix.combine(qs.get(qi), src.weighted() ? logW : null, terms[qi], src.weighted() || k == 1,
                    src.chains(), values[qi], none[qi], pairs[qi], ls.options().names().given()));
        }
        return out;
    }

    /**
     * The effect of every query over a weighted list of DAGs, with posterior-mean parameters per DAG:
     * each term exact inference on the DAG's mutilated graph ({@link DagEffects}). Every distinct DAG
     * is planned for every query first, so a DAG whose elimination would build a table above the limit
     * is refused before any numeric work.
     */
    public static List<Effect> overDags(LocalScores ls, WeightedDags dags, List<EffectQuery> qs, Settings s) {
        int n = ls.variableCount();
        int k = dags.size();
        double[] logW = new double[k];
        for (int g = 0; g < k; g++) {
            logW[g] = Math.log(dags.weight(g));
        }
        DagEffects dag = new DagEffects(ls.store(), s.maxHiddenStates(), ls.options().names().maxHiddenStates());
        // draws repeat DAGs, and DAGs that differ only away from the questions answer them alike: each distinct
        // ancestral subgraph of target ∪ evidence ∪ intervened variables (DagInference.Subgraph) is planned and
        // evaluated once (its rows are only read; the (DAG, θ) draws of its DAGs touch only its families)
        boolean[] asked = new boolean[n];
        for (EffectQuery q : qs) {
            for (int v : q.setVariables()) {
                asked[v] = true;
            }
            for (int v : outcomeVariables(q)) {
                asked[v] = true;
            }
        }
        Map<DagInference.Subgraph, Integer> seen = new HashMap<>();
        int[] firstOf = new int[k];
        List<DagEffects.OnDag> distinct = new ArrayList<>();
        int[] unitOf = new int[k];
        for (int g = 0; g < k; g++) {
            int[][] parents = dags.parents(g);
            Integer u = seen.putIfAbsent(DagInference.Subgraph.of(parents, asked), distinct.size());
            if (u == null) {
                u = distinct.size();
                String where = dags.sampled() ? (dags.chains() > 0 ? "DAG " + (g % (k / dags.chains()) + 1) + " of chain "
                        + (g / (k / dags.chains()) + 1) : "sampled DAG " + (g + 1)) : "DAG " + (g + 1) + " of " + k;
                distinct.add(dag.on(parents, where));
                firstOf[u] = g;
            }
            unitOf[g] = u;
        }
        boolean[] noneCut = new boolean[n];
        for (DagEffects.OnDag d : distinct) {
            for (EffectQuery q : qs) {
                boolean[] cut = flags(n, q.setVariables());
                d.plan(cut, q.jointCase(q.set()));
                d.plan(cut, q.givenCase(q.set()));
                d.plan(noneCut, q.jointCase(q.set()));
                d.plan(noneCut, q.givenCase(q.set()));
            }
        }
        Parameters mean = Parameters.mean(ls);
        double[][][] rows = new double[qs.size()][distinct.size()][];
        for (int u = 0; u < distinct.size(); u++) {
            DagEffects.OnDag d = distinct.get(u);
            int[][] parents = dags.parents(firstOf[u]);
            for (int qi = 0; qi < qs.size(); qi++) {
                EffectQuery q = qs.get(qi);
                boolean[] cut = flags(n, q.setVariables());
                double[] row = Term.row(q, (intervened, states) -> d.logProbability(intervened ? cut : noneCut, states, mean));
                Term.NO_PATH.set(row, DagEffects.hasPath(parents, q.setVariables(), outcomeVariables(q)) ? 0 : 1);
                rows[qi][u] = row;
            }
        }
        double[][][] terms = new double[qs.size()][k][];
        for (int qi = 0; qi < qs.size(); qi++) {
            for (int g = 0; g < k; g++) {
                terms[qi][g] = rows[qi][unitOf[g]];
            }
        }
        SplittableRandom rng = new SplittableRandom(s.seed());
        int[] drawUnit = assign(logW, true, s.draws(), rng);
        Parameters theta = Parameters.draws(ls, rng);
        double[][] values = new double[qs.size()][s.draws()];
        boolean[][] none = new boolean[qs.size()][s.draws()];
        PairDraws[] pairs = PairDraws.empty(qs.size(), s.draws());
        for (int d = 0; d < drawUnit.length; d++) {
            drawValues(distinct.get(unitOf[drawUnit[d]]), theta, dags.parents(drawUnit[d]), qs, values, none, pairs, d);
        }
        List<Effect> out = new ArrayList<>();
        for (int qi = 0; qi < qs.size(); qi++) {
            out.add(EffectMix.combine(qs.get(qi), logW, terms[qi], !dags.sampled(), dags.chains(),
                    values[qi], none[qi], pairs[qi], ls.options().names().given()));
        }
        return out;
    }

    /**
     * The largest number of joint states of hidden variables the closed-form sum over the DAGs of
     * any order of {@code src} would enumerate for {@code qs} (the figure {@link CasePredictor} compares
     * with its limit): per order, the variables a case needs are its fixed cells and, backwards through
     * the order, every candidate parent an allowed parent set of a needed variable can hold; an
     * intervened variable needs none. No sum is formed.
     */
    public static double orderEnumeration(LocalScores ls, EffectOrders src, List<EffectQuery> qs) {
        int n = ls.variableCount();
        double worst = 0;
        long[] union = new long[n];
        for (int[] order : src.orders()) {
            int[] pos = OrderSum.positions(order, n);
            for (int c = 0; c < n; c++) {
                long pred = ls.predecessorMask(c, pos);
                long u = 0;
                for (long m : ls.masks(c)) {
                    if ((m & ~pred) == 0) {
                        u |= m;
                    }
                }
                union[c] = u;
            }
            for (EffectQuery q : qs) {
                boolean[] cut = flags(n, q.setVariables());
                for (int[] states : new int[][] {q.jointCase(q.set()), q.givenCase(q.set())}) {
                    worst = Math.max(worst, hiddenStates(ls, order, union, cut, states));
                    worst = Math.max(worst, hiddenStates(ls, order, union, new boolean[n], states));
                }
            }
        }
        return worst;
    }

    private static double hiddenStates(LocalScores ls, int[] order, long[] union, boolean[] cut, int[] states) {
        int n = order.length;
        boolean[] needed = new boolean[n];
        double joint = 1;
        for (int p = n - 1; p >= 0; p--) {
            int v = order[p];
            boolean fixed = states[v] != CaseParser.HIDDEN;
            if (!fixed && !needed[v]) {
                continue;
            }
            if (!fixed) {
                joint *= ls.store().arity(v);
            }
            if (!cut[v]) {
                int[] cand = ls.candidates(v);
                for (long m = union[v]; m != 0; m &= m - 1) {
                    needed[cand[Long.numberOfTrailingZeros(m)]] = true;
                }
            }
        }
        return joint;
    }

    /** One (DAG, θ) draw: the effect of every query under it, and whether it has no path. */
    private static void drawValues(DagEffects.OnDag dag, Parameters theta, int[][] parents, List<EffectQuery> qs,
                                   double[][] values, boolean[][] none, PairDraws[] pairs, int d) {
        theta.fresh();
        int n = parents.length;
        for (int qi = 0; qi < qs.size(); qi++) {
            EffectQuery q = qs.get(qi);
            boolean[] cut = flags(n, q.setVariables());
            double p = Math.exp(dag.logProbability(cut, q.jointCase(q.set()), theta)
                    - (q.hasGiven() ? dag.logProbability(cut, q.givenCase(q.set()), theta) : 0));
            pairs[qi].probability()[d] = p;
            if (q.versus() != null) {
                double pv = Math.exp(dag.logProbability(cut, q.jointCase(q.versus()), theta)
                        - (q.hasGiven() ? dag.logProbability(cut, q.givenCase(q.versus()), theta) : 0));
                pairs[qi].versus()[d] = pv;
                p -= pv;
            }
            values[qi][d] = p;
            none[qi][d] = !DagEffects.hasPath(parents, q.setVariables(), outcomeVariables(q));
            pairs[qi].noPath()[d] = none[qi][d];
        }
    }

    /** For each draw, the unit (order or DAG) it uses: by weight, or uniformly over an equally weighted sample. */
    private static int[] assign(double[] logW, boolean weighted, int draws, SplittableRandom rng) {
        int k = logW.length;
        double[] cum = new double[k];
        double max = Double.NEGATIVE_INFINITY;
        for (double w : logW) {
            max = Math.max(max, w);
        }
        double acc = 0;
        for (int o = 0; o < k; o++) {
            acc += weighted ? Math.exp(logW[o] - max) : 1;
            cum[o] = acc;
        }
        int[] unit = new int[draws];
        for (int d = 0; d < draws; d++) {
            double u = rng.nextDouble() * acc;
            int i = Arrays.binarySearch(cum, u);
            i = i >= 0 ? i + 1 : -i - 1;
            unit[d] = Math.min(i, k - 1);
        }
        return unit;
    }

    private static int[][] group(int[] unit, int k) {
        int[] count = new int[k];
        for (int u : unit) {
            count[u]++;
        }
        int[][] out = new int[k][];
        for (int o = 0; o < k; o++) {
            out[o] = new int[count[o]];
            count[o] = 0;
        }
        for (int d = 0; d < unit.length; d++) {
            out[unit[d]][count[unit[d]]++] = d;
        }
        return out;
    }

    static boolean[] flags(int n, int[] vars) {
        boolean[] f = new boolean[n];
        for (int v : vars) {
            f[v] = true;
        }
        return f;
    }

    /** The target's and the evidence's variables. */
    static int[] outcomeVariables(EffectQuery q) {
        int[] t = q.target();
        int[] g = q.given();
        return java.util.stream.IntStream.range(0, t.length)
                .filter(v -> t[v] != CaseParser.HIDDEN || g[v] != CaseParser.HIDDEN).toArray();
    }

    private static boolean[] outcome(EffectQuery q) {
        return flags(q.target().length, outcomeVariables(q));
    }
}
