package org.edgewise.driver.effect;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.BruteForce;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.store.Variable;

/**
 * Independent reference for the effect tests: every DAG (on n ≤ 5 nodes, in-degree ≤ d), its
 * number of linear extensions, and the truncated factorisation (Spirtes, Glymour &amp; Scheines
 * 1993; Pearl 2000, eq. 3.10) evaluated by enumerating every joint state of all variables, with
 * posterior-mean parameters θ̄_ijk = (N_ijk + α_ijk)/(N_ij + α_ij) counted here from the rows (BDeu
 * α_ijk = ess/(q r), Heckerman, Geiger &amp; Chickering 1995). It shares no code with the engine:
 * no store, no CasePredictor, no LocalScores.
 */
final class EffectBruteForce {
    static final int H = -1;

    private EffectBruteForce() {
    }

    /** θ̄(x_i | x_U) counted from the rows. */
    static double theta(List<Variable> vars, int[][] rows, int[] parents, int i, int[] x, double ess) {
        int r = vars.get(i).arity();
        int q = 1;
        for (int p : parents) {
            q *= vars.get(p).arity();
        }
        double a = ess / (q * (double) r);
        long nk = 0;
        long nj = 0;
        for (int[] row : rows) {
            boolean match = true;
            for (int p : parents) {
                match &= row[p] == x[p];
            }
            if (match) {
                nj++;
                nk += row[i] == x[i] ? 1 : 0;
            }
        }
        return (nk + a) / (nj + a * r);
    }

    /**
     * Σ over every joint state v agreeing with {@code fixed} of Π_{i not intervened} θ̄_i(v_i | v_U):
     * P(fixed | do(intervened), G, θ̄).
     */
    static double truncated(List<Variable> vars, int[][] rows, int[][] parents, boolean[] intervened, int[] fixed,
                            double ess) {
        int n = vars.size();
        int[] x = new int[n];
        double total = 0;
        while (true) {
            boolean ok = true;
            for (int v = 0; v < n; v++) {
                ok &= fixed[v] == H || fixed[v] == x[v];
            }
            if (ok) {
                double p = 1;
                for (int v = 0; v < n; v++) {
                    if (!intervened[v]) {
                        p *= theta(vars, rows, parents[v], v, x, ess);
                    }
                }
                total += p;
            }
            int v = 0;
            while (v < n && ++x[v] == vars.get(v).arity()) {
                x[v] = 0;
                v++;
            }
            if (v == n) {
                return total;
            }
        }
    }

    /** Whether a directed path leads from a variable of {@code from} to one of {@code to}. */
    static boolean path(int[][] parents, int[] from, int[] to) {
        int n = parents.length;
        boolean[] reach = new boolean[n];
        for (int v : from) {
            reach[v] = true;
        }
        for (int it = 0; it < n; it++) {
            for (int v = 0; v < n; v++) {
                for (int p : parents[v]) {
                    reach[v] |= reach[p];
                }
            }
        }
        for (int v : to) {
            if (reach[v]) {
                return true;
            }
        }
        return false;
    }

    /** Every DAG on n nodes with in-degree ≤ d, as sorted parent lists ({@link DagEnumeration#allDags(int, int)}). */
    static List<int[][]> allDags(int n, int d) {
        List<int[][]> out = new ArrayList<>();
        for (int[] pa : DagEnumeration.allDags(n, d)) {
            int[][] g = new int[n][];
            for (int i = 0; i < n; i++) {
                g[i] = members(pa[i], n);
            }
            out.add(g);
        }
        return out;
    }

    private static int[] members(int mask, int n) {
        int[] out = new int[Integer.bitCount(mask)];
        for (int v = 0, k = 0; v < n; v++) {
            if ((mask >> v & 1) != 0) {
                out[k++] = v;
            }
        }
        return out;
    }

    /** Number of orders in which every node follows its parents (DP over subsets). */
    static long linearExtensions(int[][] parents) {
        int n = parents.length;
        int[] pa = new int[n];
        for (int v = 0; v < n; v++) {
            for (int p : parents[v]) {
                pa[v] |= 1 << p;
            }
        }
        return DagEnumeration.linearExtensions(pa, n);
    }

    /** log P(D | G) by the sequential predictive ({@link BruteForce#logLik}), BDeu with this ESS. */
    static double logLik(List<Variable> vars, int[][] rows, int[][] parents, double ess) {
        return BruteForce.logLik(vars, rows, parents, false, ess);
    }
}
