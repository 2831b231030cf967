package org.edgewise.driver.average.givenorder;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.partition.PartitionScores;

/**
 * Everything averaging over the DAGs consistent with one order yields (Buntine 1991; Friedman &amp;
 * Koller 2003): the {@link OrderSum.OrderResult} (evidence, edge posteriors) and, per child i, the
 * posterior of each allowed parent set U ⊆ pred(i):
 * <pre>
 *   P(U | D, ≺) = exp(s(i,U) + log ρ_i(U) − log Σ_{U' ⊆ pred(i)} exp(s(i,U') + log ρ_i(U')))
 * </pre>
 * and the best network under the order, whose parent set of every child is its argmax (the sum
 * factorises, so the argmax factorises too).
 *
 * <p>Memory: one double per allowed parent set of each child (≈ 3.2 MB for n = 40, d = 3).
 */
public final class OrderPosterior {
    private final LocalScores scores;
    private final int[] order;
    private final OrderSum.OrderResult result;
    private final double[][] setPosterior;
    private final int[] best;

    private OrderPosterior(LocalScores scores, int[] order, OrderSum.OrderResult result,
                           double[][] setPosterior, int[] best) {
        this.scores = scores;
        this.order = order;
        this.result = result;
        this.setPosterior = setPosterior;
        this.best = best;
    }

    /**
     * Evaluates one order. A required edge (at tally or query time) whose parent comes after its
     * child in the order is refused with a message naming it.
     */
    public static OrderPosterior of(LocalScores ls, int[] order) {
        int n = ls.variableCount();
        int[] pos = OrderSum.positions(order, n);
        Manifest m = ls.store().manifest();
        List<EdgeRule> required = new ArrayList<>(ls.options().require());
        if (m.required() != null) {
            required.addAll(m.required());
        }
        for (EdgeRule e : required) {
            int from = m.variableIndex(e.from());
            int to = m.variableIndex(e.to());
            if (from >= 0 && to >= 0 && pos[from] > pos[to]) {
                throw new UserError(ls.options().names().require() + " " + e + " is impossible under this order: " + e.from()
                        + " comes after " + e.to());
            }
        }
        OrderSum.OrderResult r = OrderSum.evaluate(ls, order);
        double[][] post = new double[n][];
        int[] best = new int[n];
        for (int child = 0; child < n; child++) {
            long pred = ls.predecessorMask(child, pos);
            long[] masks = ls.masks(child);
            double[] w = ls.weights(child);
            double z = r.childLogSum()[child];
            double[] p = new double[masks.length];
            int arg = -1;
            for (int s = 0; s < masks.length; s++) {
                if ((masks[s] & ~pred) == 0) {
                    p[s] = Math.exp(w[s] - z);
                    if (arg < 0 || w[s] > w[arg]) {
                        arg = s;
                    }
                }
            }
            post[child] = p;
            best[child] = arg;
        }
        return new OrderPosterior(ls, order.clone(), r, post, best);
    }

    /**
     * Everything averaging over the DAGs of one ordered partition yields (the structure-modular
     * counterpart of an order, Kuipers &amp; Moffa 2017): {@code element[v]} is v's element (0 = the
     * sources). A child in element 0 has the empty set; a child in element k &gt; 0 any allowed set
     * inside the earlier elements with at least one parent in element k − 1, so P(G | Λ, D) factorises
     * per child exactly as given an order, with
     * <pre>  P(U | D, Λ) = exp(w_i(U) − log Σ_{U' allowed in Λ} exp w_i(U'))</pre>
     * The "order" is a linear extension of Λ (nodes by element), consistent with every DAG of Λ;
     * {@code result().logEvidence()} is log π(Λ), the log of the partition's summed weight. Tiers in
     * {@code oc} remove from each child the candidates that must follow it (as the chains do). A
     * partition with no DAG (some child without an allowed set) is a bug of the caller.
     */
    public static OrderPosterior ofPartition(LocalScores ls, int[] element, OrderConstraints oc) {
        int n = ls.variableCount();
        double[][] post = new double[n][];
        double[][] edge = new double[n][n];
        double[] childLog = new double[n];
        int[] best = new int[n];
        double total = 0;
        for (int i = 0; i < n; i++) {
            int[] cand = ls.candidates(i);
            long b = 0;
            long t = 0;
            for (int k = 0; k < cand.length; k++) {
                if (oc.restricts() && oc.mustPrecede(i, cand[k])) {
                    continue;
                }
                b |= element[cand[k]] < element[i] ? 1L << k : 0;
                t |= element[cand[k]] == element[i] - 1 ? 1L << k : 0;
            }
            long[] masks = ls.masks(i);
            double[] w = ls.weights(i);
            double max = Double.NEGATIVE_INFINITY;
            int arg = -1;
            for (int s = 0; s < masks.length; s++) {
                if (PartitionScores.allowed(masks[s], element[i] == 0, b, t) && w[s] > max) {
                    max = w[s];
                    arg = s;
                }
            }
            if (arg < 0) {
                throw new IllegalStateException("variable " + i + " has no allowed parent set in this partition");
            }
            double sum = 0;
            for (int s = 0; s < masks.length; s++) {
                if (PartitionScores.allowed(masks[s], element[i] == 0, b, t)) {
                    sum += Math.exp(w[s] - max);
                }
            }
            double z = max + Math.log(sum);
            double[] p = new double[masks.length];
            for (int s = 0; s < masks.length; s++) {
                if (PartitionScores.allowed(masks[s], element[i] == 0, b, t)) {
                    p[s] = Math.exp(w[s] - z);
                    for (int par : ls.parents(i, s)) {
                        edge[par][i] += p[s];
                    }
                }
            }
            post[i] = p;
            best[i] = arg;
            childLog[i] = z;
            total += z;
        }
        Integer[] byElement = new Integer[n];
        for (int v = 0; v < n; v++) {
            byElement[v] = v;
        }
        java.util.Arrays.sort(byElement, java.util.Comparator.comparingInt((Integer v) -> element[v]).thenComparingInt(v -> v));
        int[] order = new int[n];
        for (int k = 0; k < n; k++) {
            order[k] = byElement[k];
        }
        return new OrderPosterior(ls, order, new OrderSum.OrderResult(total, Double.NaN, childLog, edge), post, best);
    }

    public LocalScores scores() {
        return scores;
    }

    /** The order (variable indices, first to last). */
    public int[] order() {
        return order.clone();
    }

    public OrderSum.OrderResult result() {
        return result;
    }

    /**
     * Posterior of each parent set of every child, aligned with {@link LocalScores#masks(int)}
     * (0 for sets the order excludes). Shared: do not modify.
     */
    public double[][] setPosteriors() {
        return setPosterior;
    }

    /** Per child, the index (into {@link LocalScores#masks(int)}) of its highest-weight set under the order. */
    public int[] bestSets() {
        return best.clone();
    }

    /**
     * The indices of the parent sets with positive posterior in {@code p} (one child's row of
     * {@link #setPosteriors()}), in index order, boxed for sorting by a comparator over {@code p}.
     */
    public static Integer[] positiveSets(double[] p) {
        int m = 0;
        for (double x : p) {
            m += x > 0 ? 1 : 0;
        }
        Integer[] live = new Integer[m];
        for (int s = 0, k = 0; s < p.length; s++) {
            if (p[s] > 0) {
                live[k++] = s;
            }
        }
        return live;
    }
}
