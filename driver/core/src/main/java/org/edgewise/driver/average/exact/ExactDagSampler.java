package org.edgewise.driver.average.exact;

import org.edgewise.driver.score.DagPrior;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.dag.DagDraws;
import org.edgewise.driver.average.dag.DagFeatures;

/**
 * Independent DAGs drawn from the exact posterior, under either DAG prior.
 *
 * <p><b>Order-modular</b> (Koivisto &amp; Sood 2004): an order from P(≺ | D) ∝ Π_i α_i(pred(i)),
 * drawn backwards through the order sum F (the last member of S is i with probability
 * α_i(S∖{i}) F(S∖{i}) / F(S), i among the members of S no constraint puts after another), then
 * each parent set U ⊆ pred(i) with probability β_i(U) / α_i(pred(i)) (Friedman &amp; Koller 2003).
 * The pair (≺, G) then has probability ∝ Π_i β_i(U_i) · 1[G consistent with ≺].
 *
 * <p><b>Structure-modular</b>: the same pairs, kept only when ≺ is G's <i>canonical</i> linear
 * extension (repeatedly the lowest-numbered variable whose parents and constrained predecessors
 * are placed). Given G, ≺ is uniform over G's allowed linear extensions, so a pair is kept with
 * probability 1 / ext(G) and a kept G has probability ∝ Π_i β_i(U_i): exact rejection sampling
 * (our construction; it is Ellis &amp; Wong 2008's 1/ext(G) weight applied as an acceptance).
 * The acceptance rate is Z / F(V) (the structure-modular over the order-modular sum), known
 * before sampling; at worst 1/n! (all posterior mass on the empty graph), so the sampler refuses
 * when the expected number of pairs exceeds {@link #MAX_TRIALS}.
 *
 * <p>Memory: α_i of 2^(n−1) doubles per child and F of 2^n (as {@link ExactOrderSum}).
 */
public final class ExactDagSampler {
    /** Most (order, DAG) pairs drawn for one sample. */
    public static final double MAX_TRIALS = 5e7;

    private final LocalScores ls;
    private final int n;
    private final double[][] alpha;
    private final double[] f;
    private final int[] before;
    private final int[] after;

    private ExactDagSampler(LocalScores ls, OrderConstraints oc) {
        this.ls = ls;
        this.n = ls.variableCount();
        this.alpha = StructureSum.alphas(ls, n, false);
        SinkRecursion sr = new SinkRecursion(n, oc);
        this.f = sr.orderSum(alpha);
        this.before = oc.restricts() ? oc.predecessorMasks() : new int[n];
        int full = (1 << n) - 1;
        this.after = new int[n];
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if ((before[b] >> a & 1) != 0) {
                    after[a] |= 1 << b; // the variables a must precede
                }
            }
        }
        if (f[full] == Double.NEGATIVE_INFINITY) {
            throw new UserError("no variable order has positive posterior under the given constraints "
                    + "(required edges, tiers and the in-degree bound cannot all be met)");
        }
    }

    /** A sampler for {@code ls} under {@code oc} (n ≤ {@link ExactOrderSum#MAX_VARIABLES}). */
    public static ExactDagSampler of(LocalScores ls, OrderConstraints oc) {
        return new ExactDagSampler(ls, oc);
    }

    /** log F(V): the order-modular sum Σ_≺ Π_i α_i(pred_≺(i)). */
    public double logOrderSum() {
        return f[(1 << n) - 1];
    }

    /**
     * {@code count} DAGs, each as the global parent bitmask of every child.
     *
     * @param logDagSum for {@link DagPrior#STRUCTURE_MODULAR}, log Z of {@link StructureSum} (gives
     *                  the acceptance rate); ignored for order-modular
     */
    public List<int[]> draw(DagPrior prior, int count, long seed, double logDagSum) {
        SplittableRandom rng = new SplittableRandom(seed);
        List<int[]> out = new ArrayList<>(count);
        if (prior == DagPrior.STRUCTURE_MODULAR) {
            double acceptance = Math.exp(logDagSum - logOrderSum());
            double trials = count / acceptance;
            if (!(trials <= MAX_TRIALS)) {
                throw new UserError(String.format(Locale.ROOT,
                        "exact DAG sampling under the structure-modular prior would need about %.1e order draws for %d DAGs "
                                + "(acceptance %.2e; at most %.0e): use %s, fewer %s, or %s",
                        trials, count, acceptance, MAX_TRIALS, ls.options().names().methodMcmc(),
                        ls.options().names().samples(), ls.options().names().orderModular()));
            }
        }
        int[] order = new int[n];
        int[] dag = new int[n];
        double[] t = new double[n];
        while (out.size() < count) {
            drawOrder(rng, order, t);
            drawDag(rng, order, dag);
            if (prior == DagPrior.ORDER_MODULAR || canonical(order, dag)) {
                out.add(dag.clone());
            }
        }
        return out;
    }

    /** Expected (order, DAG) pairs for {@code count} structure-modular draws: count · F(V) / Z. */
    public double expectedTrials(int count, double logDagSum) {
        return count / Math.exp(logDagSum - logOrderSum());
    }

    /**
     * {@code count} independent order-modular draws with their importance weights 1 / ext(G)
     * (ext counted among the allowed orders, {@link DagDraws#linearExtensions}): self-normalised,
     * they estimate structure-modular expectations (Ellis &amp; Wong 2008) when rejection would
     * take too many draws.
     */
    public DagDraws drawWeighted(int count, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        List<int[]> out = new ArrayList<>(count);
        double[][] w = new double[1][count];
        int[] order = new int[n];
        int[] dag = new int[n];
        double[] t = new double[n];
        for (int k = 0; k < count; k++) {
            drawOrder(rng, order, t);
            drawDag(rng, order, dag);
            out.add(dag.clone());
            w[0][k] = 1.0 / DagDraws.linearExtensions(dag, before);
        }
        return new DagDraws(n, List.of(out), 1, w);
    }

    /** Backwards through F: the last member of S, then the rest ({@link ExactOrderSum#drawOrder}). */
    private void drawOrder(SplittableRandom rng, int[] order, double[] t) {
        ExactOrderSum.drawOrder(n, alpha, f, after, rng, order, t);
    }

    /** Per child a parent set among those inside its predecessors, with probability β_i(U) / α_i(pred). */
    private void drawDag(SplittableRandom rng, int[] order, int[] dag) {
        int pred = 0;
        for (int i : order) {
            double z = alpha[i][ExactOrderSum.compress(pred, i)];
            int[] cand = ls.candidates(i);
            long allowed = 0;
            for (int k = 0; k < cand.length; k++) {
                allowed |= (long) (pred >>> cand[k] & 1) << k;
            }
            int s = DagFeatures.drawSet(ls, i, allowed, z, rng.nextDouble());
            dag[i] = s < 0 ? -1 : ExactOrderSum.globalMask(ls.masks(i)[s], cand);
            pred |= 1 << i;
        }
    }

    /** True when {@code order} is the canonical (lowest-numbered-first) allowed linear extension of {@code dag}. */
    private boolean canonical(int[] order, int[] dag) {
        int placed = 0;
        for (int p = 0; p < n; p++) {
            int lowest = -1;
            for (int v = 0; v < n; v++) {
                if ((placed >> v & 1) == 0 && ((dag[v] | before[v]) & ~placed) == 0) {
                    lowest = v;
                    break;
                }
            }
            if (order[p] != lowest) {
                return false;
            }
            placed |= 1 << lowest;
        }
        return true;
    }
}
