package org.edgewise.driver.network;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.TreeSet;
import org.edgewise.driver.store.Variable;

/**
 * Random discrete Bayesian networks for tests and benchmarks, built as a {@link Network} so that
 * the one {@link ForwardSampler} draws their data. A test fixture (the core's test-jar): nothing
 * that ships needs it.
 *
 * <p>Variables {@code <prefix>0 … <prefix>(n−1)} are in topological order (so the network's own
 * topological order is the index order); variable i gets k ~ uniform{0..maxParents} parents
 * (at most the {@code window} variables before it, so fewer near the start), drawn uniformly
 * among those. Every CPT row is u^sharpness + floor for independent uniforms u, normalised:
 * a larger {@code sharpness} gives skewed rows, i.e. dependencies of varied strength; a
 * positive {@code floor} keeps every state possible. States are {@code s0, s1, …}.
 */
public final class RandomNetwork {
    private RandomNetwork() {
    }

    /** Every variable with the same number of states. */
    public static Network generate(String prefix, int n, int arity, int maxParents, int window,
                                   double sharpness, double floor, long seed) {
        int[] a = new int[n];
        java.util.Arrays.fill(a, arity);
        return generate(prefix, a, maxParents, window, sharpness, floor, seed);
    }

    public static Network generate(String prefix, int[] arity, int maxParents, int window,
                                   double sharpness, double floor, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        int n = arity.length;
        List<String> names = new ArrayList<>();
        List<List<String>> states = new ArrayList<>();
        List<List<String>> parentNames = new ArrayList<>();
        List<double[][]> rows = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            names.add(prefix + i);
            List<String> st = new ArrayList<>();
            for (int k = 0; k < arity[i]; k++) {
                st.add("s" + k);
            }
            states.add(st);
        }
        for (int i = 0; i < n; i++) {
            int lo = Math.max(0, i - window);
            int k = Math.min(i - lo, rng.nextInt(maxParents + 1));
            TreeSet<Integer> ps = new TreeSet<>();
            while (ps.size() < k) {
                ps.add(lo + rng.nextInt(i - lo));
            }
            List<String> pn = new ArrayList<>();
            int q = 1;
            for (int p : ps) {
                pn.add(names.get(p));
                q *= arity[p];
            }
            parentNames.add(pn);
            int r = arity[i];
            double[][] table = new double[q][r];
            for (int j = 0; j < q; j++) {
                double sum = 0;
                for (int s = 0; s < r; s++) {
                    double u = Math.pow(rng.nextDouble(), sharpness) + floor;
                    table[j][s] = u;
                    sum += u;
                }
                for (int s = 0; s < r; s++) {
                    table[j][s] /= sum;
                }
            }
            rows.add(table);
        }
        return Network.of("(random, seed " + seed + ")", "random", "", names, states, parentNames, rows);
    }

    /** {@code n} arities drawn uniformly from {@code min..max} with their own seed. */
    public static int[] arities(int n, int min, int max, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        int[] a = new int[n];
        for (int i = 0; i < n; i++) {
            a[i] = min + rng.nextInt(max - min + 1);
        }
        return a;
    }

    /** The network's variables with their state labels, as a store lists them. */
    public static List<Variable> variables(Network net) {
        List<Variable> out = new ArrayList<>();
        for (int i = 0; i < net.size(); i++) {
            out.add(new Variable(net.names().get(i), net.states().get(i)));
        }
        return out;
    }
}
