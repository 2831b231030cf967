package org.edgewise.driver.network;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * A discrete Bayesian network with its conditional probability tables: the generating model of
 * a simulation, or the known truth a result is compared with.
 *
 * <p>{@code cpt[i]} holds one probability row per parent configuration of variable i, row-major:
 * {@code cpt[i][j * r_i + k]} = P(X_i = k | parents in configuration j). The configuration index j
 * is mixed radix over {@code parents[i]} in the order they are listed, the first parent most
 * significant: j = Σ_p s_p · Π_{p' after p} r_{p'} — the convention of the store's FamilyCounts.
 * Memory: 8 bytes per CPT cell, Π r_parents · r_i cells per variable.
 *
 * <p>Built only by {@link NetworkReader} (or {@link #of}), which checks rows sum to 1, names are
 * known and the graph is acyclic. Arrays are shared: treat them as read-only.
 *
 * @param name        a short name of the network (may be empty)
 * @param description free text (may be empty)
 * @param names       variable names, in file order (the column order of sampled data)
 * @param states      ordered state labels per variable
 * @param parents     parent indices per variable, in the order listed (not necessarily sorted)
 * @param cpt         probability rows per variable, as above
 * @param topoOrder   a topological order of the variables (parents before children)
 */
public record Network(String name, String description, List<String> names, List<List<String>> states,
                      int[][] parents, double[][] cpt, int[] topoOrder) {

    /** Builds and validates a network (same checks as the reader; {@code source} names it in errors). */
    public static Network of(String source, String name, String description, List<String> names,
                             List<List<String>> states, List<List<String>> parentNames, List<double[][]> rows) {
        return NetworkReader.build(source, name, description, names, states, parentNames, rows);
    }

    public int size() {
        return names.size();
    }

    public int arity(int i) {
        return states.get(i).size();
    }

    /** Index of a variable by name, or -1. */
    public int indexOf(String variable) {
        return names.indexOf(variable);
    }

    /** Number of parent configurations of variable i (Π r_parents). */
    public int configurations(int i) {
        int q = 1;
        for (int p : parents[i]) {
            q *= arity(p);
        }
        return q;
    }

    /** P(X_i = k | parent configuration j). */
    public double probability(int i, int j, int k) {
        return cpt[i][j * arity(i) + k];
    }

    /** True when the network has the directed edge from → to. */
    public boolean hasEdge(int from, int to) {
        for (int p : parents[to]) {
            if (p == from) {
                return true;
            }
        }
        return false;
    }

    /** The directed edges as (from, to) name pairs, children in file order. */
    public List<String[]> edges() {
        List<String[]> out = new ArrayList<>();
        for (int c = 0; c < size(); c++) {
            for (int p : parents[c]) {
                out.add(new String[] {names.get(p), names.get(c)});
            }
        }
        return out;
    }

    /**
     * The exact marginal distribution P(X_v) by enumerating the joint of v's ancestral set (the
     * chain rule over a topological order). Cost Π r over the ancestors: for small networks and
     * tests only.
     */
    public double[] marginal(int variable) {
        // enumerate the joint over the ancestral set of `variable` in topological order
        boolean[] anc = new boolean[size()];
        markAncestors(variable, anc);
        List<Integer> vars = new ArrayList<>();
        for (int v : topoOrder) {
            if (anc[v]) {
                vars.add(v);
            }
        }
        double[] out = new double[arity(variable)];
        int[] state = new int[size()];
        enumerate(vars, 0, 1.0, state, variable, out);
        return out;
    }

    private void markAncestors(int v, boolean[] anc) {
        if (anc[v]) {
            return;
        }
        anc[v] = true;
        for (int p : parents[v]) {
            markAncestors(p, anc);
        }
    }

    private void enumerate(List<Integer> vars, int pos, double prob, int[] state, int target, double[] out) {
        if (prob == 0) {
            return;
        }
        if (pos == vars.size()) {
            out[state[target]] += prob;
            return;
        }
        int v = vars.get(pos);
        int j = configuration(v, state);
        for (int k = 0; k < arity(v); k++) {
            state[v] = k;
            enumerate(vars, pos + 1, prob * probability(v, j, k), state, target, out);
        }
    }

    /** Mixed-radix configuration index of variable v's parents in the given full state vector. */
    public int configuration(int v, int[] state) {
        int j = 0;
        for (int p : parents[v]) {
            j = j * arity(p) + state[p];
        }
        return j;
    }

    /** Parent names per variable, for writers. */
    public Map<String, List<String>> parentNames() {
        Map<String, List<String>> m = new java.util.LinkedHashMap<>();
        for (int c = 0; c < size(); c++) {
            List<String> ps = new ArrayList<>();
            for (int p : parents[c]) {
                ps.add(names.get(p));
            }
            m.put(names.get(c), ps);
        }
        return m;
    }
}
