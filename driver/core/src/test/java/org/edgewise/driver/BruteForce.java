package org.edgewise.driver;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.store.Variable;

/**
 * Independent reference for tests: enumerates every DAG consistent with an order and an in-degree
 * bound (and forbidden / required edges), and scores each by the sequential (prequential) form of
 * the Dirichlet marginal likelihood, P(D | G) = Π_t Π_i (n_ijk(t) + α_ijk) / (n_ij(t) + α_ij),
 * with n(t) counted over the rows before t — the chain rule applied to the posterior predictive
 * (Heckerman 1995, "A tutorial on learning with Bayesian networks", MSR-TR-95-06, §6; Cooper &amp;
 * Herskovits 1992). It shares no code with the family score (no lnΓ) nor with the order sum.
 */
public final class BruteForce {
    /** A DAG: parents[i] sorted variable indices; logLik = log P(D | G); logPrior = Σ_i log ρ_i. */
    public record Dag(int[][] parents, double logLik, double logPrior) {
        public double logWeight() {
            return logLik + logPrior;
        }

        public boolean has(int from, int to) {
            for (int p : parents[to]) {
                if (p == from) {
                    return true;
                }
            }
            return false;
        }
    }

    public enum Prior { UNIFORM, SIZE }

    private BruteForce() {
    }

    /**
     * @param k2        α_ijk = 1 (Cooper &amp; Herskovits 1992); else BDeu α_ijk = ess/(q r) (Heckerman et al. 1995)
     * @param forbidden forbidden[from][to]; may be null
     * @param required  required[from][to]; may be null
     */
    public static List<Dag> dags(List<Variable> vars, int[][] rows, int[] order, int d, boolean k2, double ess,
                                 Prior prior, boolean[][] forbidden, boolean[][] required) {
        int n = vars.size();
        List<List<int[]>> choices = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            choices.add(null);
        }
        for (int p = 0; p < n; p++) {
            int child = order[p];
            List<int[]> sets = new ArrayList<>();
            int[] pred = new int[p];
            for (int a = 0; a < p; a++) {
                pred[a] = order[a];
            }
            java.util.Arrays.sort(pred);
            for (int mask = 0; mask < (1 << p); mask++) {
                if (Integer.bitCount(mask) > d) {
                    continue;
                }
                int[] set = new int[Integer.bitCount(mask)];
                boolean ok = true;
                for (int a = 0, k = 0; a < p; a++) {
                    if ((mask >>> a & 1) != 0) {
                        set[k++] = pred[a];
                        if (forbidden != null && forbidden[pred[a]][child]) {
                            ok = false;
                        }
                    }
                }
                if (required != null) {
                    for (int u = 0; u < n; u++) {
                        if (required[u][child] && java.util.Arrays.binarySearch(set, u) < 0) {
                            ok = false;
                        }
                    }
                }
                if (ok) {
                    sets.add(set);
                }
            }
            choices.set(child, sets);
        }
        List<Dag> out = new ArrayList<>();
        int[] pick = new int[n];
        while (true) {
            int[][] parents = new int[n][];
            double lp = 0;
            for (int i = 0; i < n; i++) {
                parents[i] = choices.get(i).get(pick[i]);
                if (prior == Prior.SIZE) {
                    lp -= Math.log(binomial(n - 1, parents[i].length));
                }
            }
            out.add(new Dag(parents, logLik(vars, rows, parents, k2, ess), lp));
            int i = 0;
            while (i < n && ++pick[i] == choices.get(i).size()) {
                pick[i] = 0;
                i++;
            }
            if (i == n) {
                return out;
            }
        }
    }

    /** log P(D | G) by the sequential predictive; ties to nothing in main code. */
    public static double logLik(List<Variable> vars, int[][] rows, int[][] parents, boolean k2, double ess) {
        int n = vars.size();
        double total = 0;
        for (int i = 0; i < n; i++) {
            int r = vars.get(i).arity();
            int q = 1;
            for (int p : parents[i]) {
                q *= vars.get(p).arity();
            }
            double a = k2 ? 1.0 : ess / (q * (double) r);
            long[] nijk = new long[q * r];
            long[] nij = new long[q];
            for (int[] row : rows) {
                int j = config(vars, parents[i], row);
                total += Math.log((nijk[j * r + row[i]] + a) / (nij[j] + a * r));
                nijk[j * r + row[i]]++;
                nij[j]++;
            }
        }
        return total;
    }

    /** Predictive of a complete case under one DAG: Π_i (N_ijk + α)/(N_ij + rα), counted from the rows. */
    public static double logPredictive(List<Variable> vars, int[][] rows, int[][] parents, boolean k2, double ess,
                                       int[] x) {
        double lp = 0;
        for (int i = 0; i < vars.size(); i++) {
            int r = vars.get(i).arity();
            int q = 1;
            for (int p : parents[i]) {
                q *= vars.get(p).arity();
            }
            double a = k2 ? 1.0 : ess / (q * (double) r);
            int j = config(vars, parents[i], x);
            long nk = 0;
            long nj = 0;
            for (int[] row : rows) {
                if (config(vars, parents[i], row) == j) {
                    nj++;
                    if (row[i] == x[i]) {
                        nk++;
                    }
                }
            }
            lp += Math.log((nk + a) / (nj + a * r));
        }
        return lp;
    }

    static int config(List<Variable> vars, int[] parents, int[] row) {
        int j = 0;
        for (int p : parents) {
            j = j * vars.get(p).arity() + row[p];
        }
        return j;
    }

    public static double binomial(int n, int k) {
        double c = 1;
        for (int t = 1; t <= k; t++) {
            c = c * (n - k + t) / t;
        }
        return c;
    }

    /** log Σ exp, two-pass. */
    public static double logSumExp(double[] x) {
        double max = Double.NEGATIVE_INFINITY;
        for (double v : x) {
            max = Math.max(max, v);
        }
        double s = 0;
        for (double v : x) {
            s += Math.exp(v - max);
        }
        return max + Math.log(s);
    }
}
