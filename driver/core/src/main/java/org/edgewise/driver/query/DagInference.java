package org.edgewise.driver.query;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * Exact inference on one DAG with given parameters, by variable elimination in log space:
 * <pre>
 *   P(x_O) = Σ_{x_H} Π_{v ∈ A} θ_v(x_v | x_{U_v}),
 * </pre>
 * where O are the observed variables, A = O and its ancestors (every other factor sums to 1 and
 * drops out) and H = A \ O the hidden variables to sum out. Each factor of A is first restricted to
 * the observed states, leaving a table over its hidden variables; then the hidden variables are
 * summed out one at a time (greedy order: the variable whose product table is smallest, ties by
 * index), each step multiplying the tables that hold the variable (adding their logs) and summing
 * it out by log-sum-exp. Nothing is enumerated beyond the largest product, so the cost follows the
 * DAG's width on A, not the number of hidden variables.
 *
 * <p>Pure and array-based: the DAG is parent lists, θ comes from the caller ({@link LogTheta}).
 * The plan ({@link #plan}) is symbolic and cheap, so a caller can refuse a DAG before any numeric
 * work when {@link Plan#largest} is too big. Memory: a factor over hidden variables S holds
 * Π_{v ∈ S} r_v doubles (8 bytes each); at most one factor per variable of A is alive, each no
 * larger than {@link Plan#largest} entries.
 */
public final class DagInference {
    /** log θ_v(k | j), j the mixed-radix index of the parents' states (first parent most significant). */
    @FunctionalInterface
    public interface LogTheta {
        double of(int child, long config, int state);
    }

    /**
     * What one query needs on one DAG.
     *
     * @param factors the variables of A (observed ones and their ancestors), each one factor, ascending
     * @param order   the hidden variables of A, in elimination order
     * @param largest entries of the largest product table the elimination forms (the joint states of
     *                the hidden variables in one step); 1 when nothing is hidden
     */
    public record Plan(int[] factors, int[] order, double largest) {
    }

    private DagInference() {
    }

    /**
     * The part of a DAG a question uses: the ancestral set A of some variables (the observed cells, or
     * target ∪ evidence ∪ intervened variables) with every member's parent list. Any probability of
     * cells in A — also after cutting the incoming edges of intervened variables in A, and whether a
     * directed path leads from one variable of A to another — depends on the DAG only through it
     * (the factors outside A sum to one; a path into a member of A runs through A). So DAGs of a
     * sample with equal subgraphs answer a question alike, and are computed once. Equality is by content.
     *
     * @param signature for each member of A ascending: the member, its number of parents, its parents
     */
    public record Subgraph(int[] signature, int hash) {
        /** The ancestral subgraph of the variables flagged in {@code roots} in the DAG {@code parents}. */
        public static Subgraph of(int[][] parents, boolean[] roots) {
            int n = parents.length;
            boolean[] in = new boolean[n];
            int[] stack = new int[n];
            int top = 0;
            int size = 0;
            for (int v = 0; v < n; v++) {
                if (roots[v]) {
                    in[v] = true;
                    stack[top++] = v;
                }
            }
            while (top > 0) {
                int v = stack[--top];
                size += 2 + parents[v].length;
                for (int p : parents[v]) {
                    if (!in[p]) {
                        in[p] = true;
                        stack[top++] = p;
                    }
                }
            }
            int[] sig = new int[size];
            int at = 0;
            for (int v = 0; v < n; v++) {
                if (in[v]) {
                    sig[at++] = v;
                    sig[at++] = parents[v].length;
                    for (int p : parents[v]) {
                        sig[at++] = p;
                    }
                }
            }
            return new Subgraph(sig, Arrays.hashCode(sig));
        }

        /** The subgraph of the observed cells of {@code states}. */
        public static Subgraph observed(int[][] parents, int[] states) {
            boolean[] roots = new boolean[states.length];
            for (int v = 0; v < states.length; v++) {
                roots[v] = states[v] != CaseParser.HIDDEN;
            }
            return of(parents, roots);
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof Subgraph g && hash == g.hash && Arrays.equals(signature, g.signature);
        }

        @Override
        public int hashCode() {
            return hash;
        }
    }

    /**
     * The ancestral set of the observed variables of {@code states} and the elimination order of
     * its hidden variables; no numeric work.
     *
     * @param parents {@code parents[v]} ascending
     * @param states  a state index per variable, or {@link CaseParser#HIDDEN}
     */
    public static Plan plan(int[][] parents, int[] arity, int[] states) {
        int n = parents.length;
        boolean[] in = new boolean[n];
        int[] stack = new int[n];
        int top = 0;
        for (int v = 0; v < n; v++) {
            if (states[v] != CaseParser.HIDDEN) {
                in[v] = true;
                stack[top++] = v;
            }
        }
        while (top > 0) {
            int v = stack[--top];
            for (int p : parents[v]) {
                if (!in[p]) {
                    in[p] = true;
                    stack[top++] = p;
                }
            }
        }
        int count = 0;
        for (boolean b : in) {
            count += b ? 1 : 0;
        }
        int[] factors = new int[count];
        List<int[]> scopes = new ArrayList<>();
        List<Integer> hidden = new ArrayList<>();
        for (int v = 0, i = 0; v < n; v++) {
            if (in[v]) {
                factors[i++] = v;
                scopes.add(hiddenScope(v, parents[v], states));
                if (states[v] == CaseParser.HIDDEN) {
                    hidden.add(v);
                }
            }
        }
        int[] order = new int[hidden.size()];
        double largest = 1;
        int[] stamp = new int[n];
        int tag = 0;
        for (int step = 0; step < order.length; step++) {
            int best = -1;
            double bestSize = Double.POSITIVE_INFINITY;
            for (int x : hidden) {
                // Π r over the union of the scopes that hold x, each variable counted once (stamped)
                tag++;
                double size = 1;
                for (int[] sc : scopes) {
                    if (Arrays.binarySearch(sc, x) >= 0) {
                        for (int v : sc) {
                            if (stamp[v] != tag) {
                                stamp[v] = tag;
                                size *= arity[v];
                            }
                        }
                    }
                }
                if (size < bestSize) {
                    bestSize = size;
                    best = x;
                }
            }
            final int chosen = best;
            int[] u = union(scopes, chosen);
            scopes.removeIf(s -> Arrays.binarySearch(s, chosen) >= 0);
            scopes.add(without(u, chosen));
            hidden.remove(Integer.valueOf(chosen));
            order[step] = chosen;
            largest = Math.max(largest, bestSize);
        }
        return new Plan(factors, order, largest);
    }

    /**
     * log P(observed cells of {@code states}) on the DAG, with {@code plan} from {@link #plan} on the
     * same DAG and case; −∞ when it is 0. Nothing beyond {@code plan.largest()} entries is allocated
     * per factor.
     */
    public static double logProbability(Plan plan, int[][] parents, int[] arity, int[] states, LogTheta theta) {
        List<Factor> live = new ArrayList<>();
        double constant = 0;
        for (int v : plan.factors()) {
            Factor f = initial(v, parents[v], arity, states, theta);
            if (f.scope.length == 0) {
                constant += f.log[0];
            } else {
                live.add(f);
            }
        }
        for (int x : plan.order()) {
            List<Factor> with = new ArrayList<>();
            for (Factor f : live) {
                if (Arrays.binarySearch(f.scope, x) >= 0) {
                    with.add(f);
                }
            }
            live.removeAll(with);
            Factor out = sumOut(with, x, arity);
            if (out.scope.length == 0) {
                constant += out.log[0];
            } else {
                live.add(out);
            }
        }
        if (!live.isEmpty()) {
            throw new IllegalStateException("factors left after elimination: " + live.size());
        }
        return constant;
    }

    /** A table of log values over {@code scope} (ascending), row-major with the last variable fastest. */
    private record Factor(int[] scope, double[] log) {
    }

    /** θ_v restricted to the observed states of its family: a factor over the family's hidden variables. */
    private static Factor initial(int v, int[] pa, int[] arity, int[] states, LogTheta theta) {
        int[] scope = hiddenScope(v, pa, states);
        int[] x = new int[arity.length];
        for (int u : scope) {
            x[u] = 0;
        }
        double[] log = new double[(int) size(scope, arity)];
        for (int e = 0; e < log.length; e++) {
            // decode entry e into the hidden states of the scope (last fastest)
            int rest = e;
            for (int i = scope.length - 1; i >= 0; i--) {
                x[scope[i]] = rest % arity[scope[i]];
                rest /= arity[scope[i]];
            }
            long j = 0;
            for (int p : pa) {
                j = j * arity[p] + (states[p] != CaseParser.HIDDEN ? states[p] : x[p]);
            }
            log[e] = theta.of(v, j, states[v] != CaseParser.HIDDEN ? states[v] : x[v]);
        }
        return new Factor(scope, log);
    }

    /** Σ_x Π_f f, in log space: the product of {@code with} (each holding x) with x summed out. */
    private static Factor sumOut(List<Factor> with, int x, int[] arity) {
        int[] s = without(union(scopesOf(with), x), x);
        int nf = with.size();
        int m = s.length;
        int[][] strideS = new int[nf][m];
        int[] strideX = new int[nf];
        for (int f = 0; f < nf; f++) {
            int[] sc = with.get(f).scope;
            int stride = 1;
            for (int i = sc.length - 1; i >= 0; i--) {
                if (sc[i] == x) {
                    strideX[f] = stride;
                } else {
                    strideS[f][Arrays.binarySearch(s, sc[i])] = stride;
                }
                stride *= arity[sc[i]];
            }
        }
        double[][] tables = new double[nf][];
        for (int f = 0; f < nf; f++) {
            tables[f] = with.get(f).log;
        }
        int rx = arity[x];
        double[] buf = new double[rx];
        double[] out = new double[(int) size(s, arity)];
        int[] digit = new int[m];
        int[] idx = new int[nf];
        for (int o = 0; o < out.length; o++) {
            double max = Double.NEGATIVE_INFINITY;
            for (int k = 0; k < rx; k++) {
                double t = 0;
                for (int f = 0; f < nf; f++) {
                    t += tables[f][idx[f] + k * strideX[f]];
                }
                buf[k] = t;
                if (t > max) {
                    max = t;
                }
            }
            if (max == Double.NEGATIVE_INFINITY) {
                out[o] = max;
            } else {
                double sum = 0;
                for (int k = 0; k < rx; k++) {
                    sum += Math.exp(buf[k] - max);
                }
                out[o] = max + Math.log(sum);
            }
            for (int i = m - 1; i >= 0; i--) {
                digit[i]++;
                for (int f = 0; f < nf; f++) {
                    idx[f] += strideS[f][i];
                }
                if (digit[i] < arity[s[i]]) {
                    break;
                }
                for (int f = 0; f < nf; f++) {
                    idx[f] -= strideS[f][i] * arity[s[i]];
                }
                digit[i] = 0;
            }
        }
        return new Factor(s, out);
    }

    private static List<int[]> scopesOf(List<Factor> fs) {
        List<int[]> out = new ArrayList<>(fs.size());
        for (Factor f : fs) {
            out.add(f.scope);
        }
        return out;
    }

    /** The hidden variables among v and its parents, ascending. */
    private static int[] hiddenScope(int v, int[] pa, int[] states) {
        int[] s = new int[pa.length + 1];
        int k = 0;
        if (states[v] == CaseParser.HIDDEN) {
            s[k++] = v;
        }
        for (int p : pa) {
            if (states[p] == CaseParser.HIDDEN) {
                s[k++] = p;
            }
        }
        s = Arrays.copyOf(s, k);
        Arrays.sort(s);
        return s;
    }

    /** The union of the scopes that hold x, ascending. */
    private static int[] union(List<int[]> scopes, int x) {
        int total = 0;
        for (int[] s : scopes) {
            if (Arrays.binarySearch(s, x) >= 0) {
                total += s.length;
            }
        }
        int[] all = new int[total];
        int k = 0;
        for (int[] s : scopes) {
            if (Arrays.binarySearch(s, x) >= 0) {
                System.arraycopy(s, 0, all, k, s.length);
                k += s.length;
            }
        }
        Arrays.sort(all);
        int m = 0;
        for (int i = 0; i < all.length; i++) {
            if (m == 0 || all[i] != all[m - 1]) {
                all[m++] = all[i];
            }
        }
        return Arrays.copyOf(all, m);
    }

    private static int[] without(int[] s, int x) {
        int[] out = new int[s.length - 1];
        for (int i = 0, k = 0; i < s.length; i++) {
            if (s[i] != x) {
                out[k++] = s[i];
            }
        }
        return out;
    }

    /** Π r_v over {@code scope} (a double: the plan compares it with the limit before any table exists). */
    static double size(int[] scope, int[] arity) {
        double z = 1;
        for (int v : scope) {
            z *= arity[v];
        }
        return z;
    }
}
