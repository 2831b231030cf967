package org.edgewise.driver.bench;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.store.Variable;

/**
 * A random discrete Bayesian network for benchmarks and tests: variables v0..v(n−1) in that
 * topological order, each with up to {@code maxParents} parents drawn from the
 * {@code window} variables before it, and conditional probability tables drawn at random
 * (each row: independent uniforms raised to a power, normalised — sharper rows for larger
 * {@code sharpness}). Forward sampling gives the rows of a table.
 *
 * @param variables variables with their states
 * @param parents   {@code parents[i]} sorted parent indices of variable i
 * @param cpt       {@code cpt[i][j·r + k]} = P(X_i = k | parent configuration j) (mixed radix, first parent most significant)
 */
public record SyntheticNetwork(List<Variable> variables, int[][] parents, double[][] cpt) {

    public static SyntheticNetwork random(int n, int arity, int maxParents, int window, double sharpness, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        List<Variable> vars = new ArrayList<>();
        List<String> states = new ArrayList<>();
        for (int k = 0; k < arity; k++) {
            states.add("s" + k);
        }
        for (int i = 0; i < n; i++) {
            vars.add(new Variable("v" + i, states));
        }
        int[][] parents = new int[n][];
        double[][] cpt = new double[n][];
        for (int i = 0; i < n; i++) {
            int lo = Math.max(0, i - window);
            int k = Math.min(i - lo, rng.nextInt(maxParents + 1));
            java.util.TreeSet<Integer> ps = new java.util.TreeSet<>();
            while (ps.size() < k) {
                ps.add(lo + rng.nextInt(i - lo));
            }
            parents[i] = ps.stream().mapToInt(Integer::intValue).toArray();
            int q = (int) Math.pow(arity, k);
            cpt[i] = new double[q * arity];
            for (int j = 0; j < q; j++) {
                double sum = 0;
                for (int s = 0; s < arity; s++) {
                    double u = Math.pow(rng.nextDouble(), sharpness);
                    cpt[i][j * arity + s] = u;
                    sum += u;
                }
                for (int s = 0; s < arity; s++) {
                    cpt[i][j * arity + s] /= sum;
                }
            }
        }
        return new SyntheticNetwork(vars, parents, cpt);
    }

    /** {@code rows} cases by forward sampling (parents are sampled before children). */
    public int[][] sample(int rows, long seed) {
        return sample(variables, parents, cpt, rows, seed);
    }

    /** Forward sampling of any network whose variable indices are in topological order. */
    public static int[][] sample(List<Variable> variables, int[][] parents, double[][] cpt, int rows, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        int n = variables.size();
        int[][] out = new int[rows][n];
        for (int t = 0; t < rows; t++) {
            int[] row = out[t];
            for (int i = 0; i < n; i++) {
                int r = variables.get(i).arity();
                int j = 0;
                for (int p : parents[i]) {
                    j = j * variables.get(p).arity() + row[p];
                }
                double u = rng.nextDouble();
                int k = 0;
                double acc = cpt[i][j * r];
                while (u >= acc && k < r - 1) {
                    k++;
                    acc += cpt[i][j * r + k];
                }
                row[i] = k;
            }
        }
        return out;
    }
}
