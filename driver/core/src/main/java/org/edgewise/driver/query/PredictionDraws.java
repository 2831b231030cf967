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

/**
 * The posterior spread of a prediction: M draws of a network and its parameters, (G_m, θ_m) — G_m
 * a DAG of the structure posterior, θ_m drawn from each family's posterior Dirichlet(N_ij1 + α_ij1,
 * …, N_ijr + α_ijr) ({@link DirichletDraw}) — and per draw, per row, P(y = k | e, G_m, θ_m) by exact
 * inference on G_m ({@link DagInference}); the interval of each probability is the central one of
 * its M values (Hyndman &amp; Fan 1996 type-7 quantiles). The values' mean estimates the
 * model-averaged P(y = k, e) / P(e) only approximately (a mean of ratios), so the point estimate is
 * taken elsewhere ({@link TargetPrediction}); the interval says how far a single (network,
 * parameters) can move it. Sampled: the interval's ends carry a Monte Carlo error, estimated per
 * end from the order statistics at M·p ± sqrt(M p (1 − p)) (the binomial spread of the count below a
 * quantile; Vehtari et al. 2021 use its exact Beta form), treating the draws as independent.
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
     */
    public record Interval(double level, int draws, double[][] lower, double[][] upper, double endpointMcse) {
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
        int[] unit = assign(dags.length, weights, draws, rng);
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
        double pl = (1 - level) / 2;
        double ph = (1 + level) / 2;
        double worst = 0;
        double[] v = new double[draws];
        for (int i = 0; i < rows; i++) {
            for (int k = 0; k < states; k++) {
                System.arraycopy(all, (i * states + k) * draws, v, 0, draws);
                Arrays.sort(v);
                lo[i][k] = ChainDiagnostics.sortedQuantile(v, pl);
                hi[i][k] = ChainDiagnostics.sortedQuantile(v, ph);
                worst = Math.max(worst, Math.max(endMcse(v, pl), endMcse(v, ph)));
            }
        }
        return new Interval(level, draws, lo, hi, worst);
    }

    /** Half the spread of the order statistics at M p ± sqrt(M p (1 − p)): one standard error of the p-quantile. */
    static double endMcse(double[] sorted, double p) {
        int m = sorted.length;
        double s = Math.sqrt(m * p * (1 - p));
        int a = Math.max(0, (int) Math.floor(m * p - s) - 1);
        int b = Math.min(m - 1, (int) Math.ceil(m * p + s) - 1);
        return b > a ? (sorted[b] - sorted[a]) / 2 : 0;
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
