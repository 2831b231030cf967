package org.edgewise.driver.query;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.stream.IntStream;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.DirichletDraw;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.average.convergence.QuantileMcse;

/**
 * The posterior spread of a prediction: M draws of a network and its parameters, (G_m, θ_m) — G_m
 * a DAG of the structure posterior, θ_m drawn from each family's posterior Dirichlet(N_ij1 + α_ij1,
 * …, N_ijr + α_ijr) ({@link DirichletDraw}) — and per draw, per row, P(y = k | e, G_m, θ_m) by exact
 * inference on G_m ({@link DagInference}); the interval of each probability is the central one of
 * its M values (Hyndman &amp; Fan 1996 type-7 quantiles). The values' mean estimates the
 * model-averaged P(y = k, e) / P(e) only approximately (a mean of ratios), so the point estimate is
 * taken elsewhere ({@link TargetPrediction}); the interval says how far a single (network,
 * parameters) can move it. Sampled: the interval's ends carry a Monte Carlo error per end
 * ({@link QuantileMcse}, Vehtari et al. 2021's quantile MCSE). DAGs from chains (a saved MCMC sample,
 * chains run now) are taken in chain order — draw t of chain c uses that chain's DAG at ⌊t · T / M_c⌋
 * (M_c = ⌊M / chains⌋ draws per chain, T DAGs per chain), each with parameters of its own — and the error
 * uses the effective sample size of the indicator below the quantile over those chains: a chain that
 * dwells on a DAG for many draws gives correlated values, which independent-draw formulas miss.
 * Independent or weighted DAGs are drawn at random by weight and their values are independent.
 *
 * <p>Every draw's parameters are drawn once (for the families of the variables the rows can reach)
 * and shared by every row, so one draw is one network. Memory: rows × states × M doubles for the
 * values (refused above {@link #MAX_VALUES}), and per draw Σ q_v r_v doubles of parameters.
 */
public final class PredictionDraws {
    /** The most values kept (8 bytes each: 200 MB). */
    public static final long MAX_VALUES = 25_000_000L;

    /**
     * @param level       the interval's probability
     * @param draws       M
     * @param lower       per row and state the lower end
     * @param upper       the upper end
     * @param endpointMcse the largest Monte Carlo standard error of any end
     * @param lowerMcse   per row and state the Monte Carlo standard error of the lower end
     * @param upperMcse   that of the upper end
     */
    public record Interval(double level, int draws, double[][] lower, double[][] upper, double endpointMcse,
                           double[][] lowerMcse, double[][] upperMcse) {
    }

    private PredictionDraws() {
    }

    /**
     * @param dags     DAGs of the structure posterior (parents ascending)
     * @param weights  their weights, or null when alike
     * @param maxTable the largest elimination table allowed
     * @param where    per row how a message names it
     * @param source   how a message names the DAGs' source
     * @param limitName how a message names the limit on tables
     */
    public static Interval run(ScoreStore store, FamilyScore score, int[][][] dags, double[] weights, int draws, long seed,
                               double level, TargetCases cases, int states, long maxTable, String[] where, String source,
                               String limitName) {
        return run(store, score, dags, weights, 0, draws, seed, level, cases, states, maxTable, where, source, limitName);
    }

    /**
     * As the other form, with {@code chains} &gt; 1 when {@code dags} are that many chains of equal length,
     * chain after chain in draw order (0 or 1: independent draws); weighted chains are drawn as independent.
     */
    public static Interval run(ScoreStore store, FamilyScore score, int[][][] dags, double[] weights, int chains, int asked,
                               long seed, double level, TargetCases cases, int states, long maxTable, String[] where,
                               String source, String limitName) {
        boolean ordered = chains > 1 && weights == null && asked >= 4 * chains && dags.length % chains == 0;
        int draws = ordered ? asked / chains * chains : asked;
        int rows = cases.evidence().length;
        double values = (double) rows * states * draws;
        if (values > MAX_VALUES) {
            throw new UserError(String.format(Locale.ROOT, "an interval over %d draws for %d rows of %d states keeps %.0f values "
                    + "(%.0f MB; limit %d values); ask for fewer draws or score fewer rows at once", draws, rows, states, values,
                    values * 8 / 1e6, MAX_VALUES));
        }
        int n = store.variableCount();
        int[] arity = new int[n];
        for (int v = 0; v < n; v++) {
            arity[v] = store.arity(v);
        }
        Map<String, Integer>[] familyOf = familyIndex(store);
        // a stream of its own: the caller may have drawn the DAGs with the same seed
        SplittableRandom rng = new SplittableRandom(seed * 0x9E3779B97F4A7C15L + 0x632BE59BD9B4E019L);
        int[] unit = ordered ? inChainOrder(dags.length, chains, draws) : assign(dags.length, weights, draws, rng);
        boolean[] seen = new boolean[n];
        for (int[] e : cases.evidence()) {
            for (int v = 0; v < n; v++) {
                seen[v] |= e[v] != CaseParser.HIDDEN;
            }
        }
        seen[cases.target()] = true;
        int[] reach = new int[n];
        for (int v = 0; v < n; v++) {
            reach[v] = seen[v] ? 0 : CaseParser.HIDDEN;
        }
        double[] all = new double[(int) values];
        for (int m = 0; m < draws; m++) {
            int[][] dag = dags[unit[m]];
            double[][][] theta = parameters(store, score, dag, DagInference.plan(dag, arity, reach).factors(), familyOf,
                    new SplittableRandom(rng.nextLong()), source);
            final int draw = m;
            IntStream.range(0, rows).parallel().forEach(i -> {
                int[] x = cases.evidence()[i].clone();
                x[cases.target()] = 0;
                DagInference.Plan plan = DagInference.plan(dag, arity, x);
                if (plan.largest() > maxTable) {
                    throw new UserError(String.format(Locale.ROOT, "%s: %s: summing out the row's hidden ancestors by elimination "
                            + "would build a table of %.0f entries (limit %d); observe more of them, or raise %s", where[i], source,
                            plan.largest(), maxTable, limitName));
                }
                double[] lj = new double[states];
                double max = Double.NEGATIVE_INFINITY;
                for (int k = 0; k < states; k++) {
                    x[cases.target()] = k;
                    lj[k] = DagInference.logProbability(plan, dag, arity, x, (v, j, s) -> Math.log(theta[v][(int) j][s]));
                    max = Math.max(max, lj[k]);
                }
                double z = 0;
                for (int k = 0; k < states; k++) {
                    z += Math.exp(lj[k] - max);
                }
                for (int k = 0; k < states; k++) {
                    all[(i * states + k) * draws + draw] = Math.exp(lj[k] - max) / z;
                }
            });
        }
        double[][] lo = new double[rows][states];
        double[][] hi = new double[rows][states];
        double[][] loMcse = new double[rows][states];
        double[][] hiMcse = new double[rows][states];
        double pl = (1 - level) / 2;
        double ph = (1 + level) / 2;
        double worst = 0;
        double[] v = new double[draws];
        for (int i = 0; i < rows; i++) {
            for (int k = 0; k < states; k++) {
                System.arraycopy(all, (i * states + k) * draws, v, 0, draws);
                double[][] byChain = ordered ? new double[chains][draws / chains] : new double[][] {v.clone()};
                if (ordered) {
                    for (int c = 0; c < chains; c++) {
                        System.arraycopy(v, c * (draws / chains), byChain[c], 0, draws / chains);
                    }
                }
                Arrays.sort(v);
                lo[i][k] = ChainDiagnostics.sortedQuantile(v, pl);
                hi[i][k] = ChainDiagnostics.sortedQuantile(v, ph);
                loMcse[i][k] = QuantileMcse.of(byChain, pl, !ordered);
                hiMcse[i][k] = QuantileMcse.of(byChain, ph, !ordered);
                double e = Math.max(loMcse[i][k], hiMcse[i][k]);
                worst = Math.max(worst, Double.isNaN(e) ? Double.POSITIVE_INFINITY : e);
            }
        }
        return new Interval(level, draws, lo, hi, worst, loMcse, hiMcse);
    }

    /**
     * For each of {@code draws} draws (a multiple of {@code chains}), the DAG it uses when the {@code k} DAGs are
     * {@code chains} chains in draw order: draw t of chain c takes that chain's DAG ⌊t · T / M_c⌋ (T = k / chains,
     * M_c = draws / chains) — every chain thinned or repeated evenly, in order.
     */
    static int[] inChainOrder(int k, int chains, int draws) {
        int per = k / chains;
        int mc = draws / chains;
        int[] unit = new int[draws];
        for (int c = 0; c < chains; c++) {
            for (int t = 0; t < mc; t++) {
                unit[c * mc + t] = c * per + (int) ((long) t * per / mc);
            }
        }
        return unit;
    }

    /** For each draw, the DAG it uses: in turn when there are as many equally weighted DAGs as draws, else at random by weight. */
    static int[] assign(int k, double[] weights, int draws, SplittableRandom rng) {
        int[] unit = new int[draws];
        if (weights == null && k == draws) {
            for (int d = 0; d < draws; d++) {
                unit[d] = d;
            }
            return unit;
        }
        double[] cum = new double[k];
        double acc = 0;
        for (int g = 0; g < k; g++) {
            acc += weights == null ? 1 : weights[g];
            cum[g] = acc;
        }
        for (int d = 0; d < draws; d++) {
            double u = rng.nextDouble() * acc;
            int g = Arrays.binarySearch(cum, u);
            g = g >= 0 ? g + 1 : -g - 1;
            unit[d] = Math.min(g, k - 1);
        }
        return unit;
    }

    /** θ drawn for every configuration of the families of {@code vars} in {@code dag}: [v][j][k]. */
    private static double[][][] parameters(ScoreStore store, FamilyScore score, int[][] dag, int[] vars,
                                           Map<String, Integer>[] familyOf, SplittableRandom rng, String source) {
        double[][][] theta = new double[dag.length][][];
        for (int v : vars) {
            Integer f = familyOf[v].get(Arrays.toString(dag[v]));
            if (f == null) {
                List<String> pa = new ArrayList<>();
                for (int p : dag[v]) {
                    pa.add(store.variables().get(p).name());
                }
                throw new UserError(source + ": a DAG gives " + store.variables().get(v).name() + " the parents {"
                        + String.join(", ", pa) + "}, a family the store does not hold");
            }
            FamilyCounts fc = store.family(f);
            int r = store.arity(v);
            double q = store.configurations(dag[v]);
            if (q > Integer.MAX_VALUE / 8) {
                throw new IllegalStateException("family of " + v + " has " + q + " parent configurations");
            }
            double a = score.cellAlpha(r, q);
            double[] alpha = new double[r];
            theta[v] = new double[(int) q][];
            for (int j = 0; j < (int) q; j++) {
                int row = Arrays.binarySearch(fc.configs(), (long) j);
                for (int k = 0; k < r; k++) {
                    alpha[k] = a + (row >= 0 ? fc.counts()[row * r + k] : 0);
                }
                theta[v][j] = new double[r];
                DirichletDraw.draw(alpha, rng, theta[v][j]);
            }
        }
        return theta;
    }

    /**
     * Per child, its stored families by parent list (ascending, as text): the one index that the DAG
     * mixture ({@link DagMixture}) and these draws look a DAG's families up in. Memory: one map entry
     * per stored family.
     */
    @SuppressWarnings("unchecked")
    static Map<String, Integer>[] familyIndex(ScoreStore store) {
        int n = store.variableCount();
        Map<String, Integer>[] familyOf = new Map[n];
        for (int c = 0; c < n; c++) {
            familyOf[c] = new HashMap<>();
            for (int f = store.firstFamilyOf(c); f < store.endFamilyOf(c); f++) {
                int[] pa = store.family(f).parents().clone();
                Arrays.sort(pa);
                familyOf[c].put(Arrays.toString(pa), f);
            }
        }
        return familyOf;
    }
}
