package org.edgewise.driver.effect;

import org.edgewise.driver.UserError;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.store.ScoreStore;

/**
 * Interventional probabilities under one DAG G with parameters θ, by the truncated
 * factorisation (Spirtes, Glymour &amp; Scheines 1993; Pearl 2000, eq. 3.10):
 * <pre>
 *   P(v | do(x = a), G, θ) = Π_{i ∉ X} θ_i(v_i | v_{U_i})   for v consistent with x = a, else 0,
 * </pre>
 * summed over the states of the hidden variables. Only the ancestors of the fixed cells in the
 * mutilated graph (the intervened variables' incoming edges cut) are relevant; the rest sum out
 * to 1. Relevant hidden variables are enumerated depth-first in a topological order, refused
 * above a limit on their joint states. Terms are products of at most n factors in linear space;
 * a term that underflows is negligible next to the sum it belongs to.
 *
 * <p>Also: whether G has a directed path from an intervened variable to the target.
 */
final class DagEffects {
    private final ScoreStore store;
    private final int n;
    private final int[] arity;
    private final long maxHiddenStates;
    /** How the caller names the hidden-state limit in messages. */
    private final String maxHiddenName;

    DagEffects(ScoreStore store, long maxHiddenStates, String maxHiddenName) {
        this.store = store;
        this.n = store.variableCount();
        this.arity = new int[n];
        for (int v = 0; v < n; v++) {
            arity[v] = store.arity(v);
        }
        this.maxHiddenStates = maxHiddenStates;
        this.maxHiddenName = maxHiddenName;
    }

    /**
     * log P(cells fixed in {@code states} | do(intervened), G, θ), with {@code states} fixing the
     * intervened variables too; −∞ when it is 0.
     */
    double logProbability(int[][] parents, boolean[] intervened, int[] states, Parameters theta) {
        boolean[] relevant = new boolean[n];
        int[] stack = new int[n];
        int top = 0;
        for (int v = 0; v < n; v++) {
            if (states[v] != CaseParser.HIDDEN) {
                relevant[v] = true;
                stack[top++] = v;
            }
        }
        while (top > 0) {
            int v = stack[--top];
            if (intervened[v]) {
                continue;
            }
            for (int p : parents[v]) {
                if (!relevant[p]) {
                    relevant[p] = true;
                    stack[top++] = p;
                }
            }
        }
        int[] topo = topological(parents, relevant, intervened);
        double joint = 1;
        for (int v : topo) {
            if (states[v] == CaseParser.HIDDEN) {
                joint *= arity[v];
            }
        }
        if (joint > maxHiddenStates) {
            throw new UserError("summing out the hidden ancestors of the target in one sampled network would enumerate "
                    + String.format(java.util.Locale.ROOT, "%.0f", joint) + " joint states (limit " + maxHiddenStates
                    + "); raise " + maxHiddenName);
        }
        int[] family = new int[n];
        for (int v : topo) {
            family[v] = intervened[v] ? -1 : theta.family(v, parents[v]);
        }
        int[] x = states.clone();
        double p = sum(topo, 0, x, parents, family, theta);
        return Math.log(p);
    }

    private double sum(int[] topo, int at, int[] x, int[][] parents, int[] family, Parameters theta) {
        if (at == topo.length) {
            return 1;
        }
        int v = topo[at];
        if (family[v] < 0) {
            return sum(topo, at + 1, x, parents, family, theta);
        }
        long j = 0;
        for (int p : parents[v]) {
            j = j * arity[p] + x[p];
        }
        if (x[v] != CaseParser.HIDDEN) {
            double f = theta.theta(family[v], j, x[v]);
            return f == 0 ? 0 : f * sum(topo, at + 1, x, parents, family, theta);
        }
        double s = 0;
        for (int k = 0; k < arity[v]; k++) {
            x[v] = k;
            s += theta.theta(family[v], j, k) * sum(topo, at + 1, x, parents, family, theta);
        }
        x[v] = CaseParser.HIDDEN;
        return s;
    }

    /** The relevant variables, parents before children (Kahn), intervened variables without parents. */
    private int[] topological(int[][] parents, boolean[] relevant, boolean[] intervened) {
        int[] out = new int[n];
        int m = 0;
        boolean[] placed = new boolean[n];
        boolean progress = true;
        while (progress) {
            progress = false;
            for (int v = 0; v < n; v++) {
                if (!relevant[v] || placed[v]) {
                    continue;
                }
                boolean ready = true;
                if (!intervened[v]) {
                    for (int p : parents[v]) {
                        ready &= placed[p];
                    }
                }
                if (ready) {
                    placed[v] = true;
                    out[m++] = v;
                    progress = true;
                }
            }
        }
        return java.util.Arrays.copyOf(out, m);
    }

    /** Whether some directed path in G leads from a variable of {@code from} to a variable of {@code to}. */
    static boolean hasPath(int[][] parents, int[] from, int[] to) {
        int n = parents.length;
        boolean[] reach = new boolean[n];
        for (int v : from) {
            reach[v] = true;
        }
        boolean progress = true;
        while (progress) {
            progress = false;
            for (int v = 0; v < n; v++) {
                if (reach[v]) {
                    continue;
                }
                for (int p : parents[v]) {
                    if (reach[p]) {
                        reach[v] = true;
                        progress = true;
                        break;
                    }
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
}
