package org.edgewise.driver;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.store.Variable;

/**
 * Seeded synthetic tables for tests, held out from the data used while developing (the bench
 * uses other seeds). Each variable copies a function of two earlier ones with probability 0.6,
 * else draws uniformly, so the data carry dependencies of several strengths: a {@link Network}
 * sampled by the one {@link ForwardSampler}.
 */
public final class HeldOutData {
    private HeldOutData() {
    }

    /** Variables v0, v1, … with the given arities and state labels s0, s1, …. */
    public static List<Variable> variables(int... arities) {
        List<Variable> out = new ArrayList<>();
        for (int v = 0; v < arities.length; v++) {
            List<String> states = new ArrayList<>();
            for (int k = 0; k < arities[v]; k++) {
                states.add("s" + k);
            }
            out.add(new Variable("v" + v, states));
        }
        return out;
    }

    /** Rows drawn by the one {@link ForwardSampler} from {@link #network}; {@code rows[t][v]} = state of v. */
    public static int[][] table(long seed, int rows, int... arities) {
        return new ForwardSampler(network(arities)).sample(rows, seed);
    }

    /**
     * The generating network: v0 has no parents, v1 the parent v0, every later v the parents
     * v(v−1), v(v−2); with probability 0.6 v takes the state (a + 2b + v) mod r_v of its parents'
     * states a = x(v−1), b = x(v−2) (b = 0 for v1), else a uniform state — so the CPT row of
     * configuration (a, b) is 0.6·[k = (a + 2b + v) mod r_v] + 0.4 / r_v.
     */
    public static Network network(int... arities) {
        int n = arities.length;
        List<String> names = new ArrayList<>();
        List<List<String>> states = new ArrayList<>();
        for (Variable v : variables(arities)) {
            names.add(v.name());
            states.add(v.states());
        }
        List<List<String>> parents = new ArrayList<>();
        List<double[][]> cpt = new ArrayList<>();
        for (int v = 0; v < n; v++) {
            int r = arities[v];
            List<String> ps = v == 0 ? List.of() : v == 1 ? List.of(names.get(0)) : List.of(names.get(v - 1), names.get(v - 2));
            int ra = v == 0 ? 1 : arities[v - 1];
            int rb = v < 2 ? 1 : arities[v - 2];
            double[][] rowsOf = new double[ra * rb][r];
            for (int a = 0; a < ra; a++) {
                for (int b = 0; b < rb; b++) {
                    double[] row = rowsOf[a * rb + b]; // first listed parent (v−1) most significant
                    for (int k = 0; k < r; k++) {
                        row[k] = (v == 0 ? 1.0 : 0.4) / r;
                    }
                    if (v > 0) {
                        row[(a + 2 * b + v) % r] += 0.6;
                    }
                }
            }
            parents.add(ps);
            cpt.add(rowsOf);
        }
        return Network.of("(held-out data)", "held-out", "", names, states, parents, cpt);
    }

    /** The table with one more row appended. */
    public static int[][] plus(int[][] table, int[] row) {
        int[][] out = new int[table.length + 1][];
        System.arraycopy(table, 0, out, 0, table.length);
        out[table.length] = row.clone();
        return out;
    }
}
