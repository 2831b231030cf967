package org.edgewise.driver;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.edgewise.driver.store.Variable;

/**
 * Seeded synthetic tables for tests, held out from the data used while developing (the bench
 * uses other seeds). Each variable copies a function of two earlier ones with probability 0.6,
 * else draws uniformly, so the data carry dependencies of several strengths.
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

    public static int[][] table(long seed, int rows, int... arities) {
        Random rnd = new Random(seed);
        int n = arities.length;
        int[][] out = new int[rows][n];
        for (int t = 0; t < rows; t++) {
            for (int v = 0; v < n; v++) {
                int x;
                if (v > 0 && rnd.nextDouble() < 0.6) {
                    int a = out[t][v - 1];
                    int b = v > 1 ? out[t][v - 2] : 0;
                    x = (a + 2 * b + v) % arities[v];
                } else {
                    x = rnd.nextInt(arities[v]);
                }
                out[t][v] = x;
            }
        }
        return out;
    }

    /** The table with one more row appended. */
    public static int[][] plus(int[][] table, int[] row) {
        int[][] out = new int[table.length + 1][];
        System.arraycopy(table, 0, out, 0, table.length);
        out[table.length] = row.clone();
        return out;
    }
}
