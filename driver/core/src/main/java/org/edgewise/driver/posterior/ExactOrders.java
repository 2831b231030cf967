package org.edgewise.driver.posterior;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.dag.DagDraws;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.average.exact.ExactDagSampler;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ordermcmc.SampledOrders;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.effect.EffectOrders;
import org.edgewise.driver.query.ExactCasePrediction;
import org.edgewise.driver.query.OrderMixture;

/**
 * Every allowed order, summed exactly by dynamic programming under the order-modular DAG prior
 * (Koivisto &amp; Sood 2004; Koivisto 2006): exact edges, parent sets and log evidence; features
 * from orders drawn from the exact order posterior; predictions and effects over every allowed
 * order with its exact weight while there are few, else over orders drawn exactly (then sampled,
 * with a Monte Carlo error).
 */
public final class ExactOrders extends ExactSum {
    /** Largest n for which prediction mixes every allowed order (at most 5,040). */
    public static final int PREDICT_ENUMERATE_MAX = 7;
    /** Largest n for which an effect averages over every allowed order (at most 40,320). */
    public static final int EFFECT_ENUMERATE_MAX = 8;
    /** At most this many sampled orders are mixed for prediction. */
    public static final int PREDICT_MAX_ORDERS = 1000;
    /** Orders drawn from the exact order posterior for an effect beyond {@link #EFFECT_ENUMERATE_MAX}. */
    public static final int EFFECT_SAMPLED_ORDERS = 2000;

    private ExactOrderSum.Result sum;

    ExactOrders(LocalScores ls, UnknownOrderSettings s, ProgressListener progress) {
        super(ls, s, progress);
    }

    /** The exact sum, with the orders features need drawn alongside. */
    @Override
    Figures compute() {
        progress.start("exact sum over orders", 1_000_000);
        try {
            sum = ExactOrderSum.run(ls, oc, s.features() ? s.orderSamples() : 0, s.seed(), progress.partsPerMillion());
        } finally {
            progress.finish();
        }
        return new Figures(sum.edgePosterior(), sum.setPosterior(), sum.logEvidence());
    }

    @Override
    public String cost() {
        ExactOrderSum.Estimate e = ExactOrderSum.estimateHere(ls.variableCount());
        return costNote(e.seconds(), e.largestN(), e);
    }

    @Override
    public Labels labels() {
        return new Labels("exact", DagPrior.ORDER_MODULAR, null);
    }

    @Override
    public Features features() {
        if (!s.features()) {
            return null;
        }
        figures();
        int[][] orders = sum.sampledOrders();
        double[][][] f = SampledOrders.features(ls, Arrays.asList(orders), s.seed() + 1);
        return DagLists.bounded(f[0], f[2], f[1], f[3], orders.length);
    }

    @Override
    public DagDraws essentialDraws() {
        if (!s.essentialGraph()) {
            return null;
        }
        List<int[]> dags = ExactDagSampler.of(ls, oc).draw(DagPrior.ORDER_MODULAR, s.orderSamples(), s.seed() + 2, Double.NaN);
        return DagLists.knowing(new DagDraws(ls.variableCount(), List.of(dags), 1, null), ls, oc);
    }

    @Override
    public Cases cases(double tailMass, long maxHiddenStates) {
        int n = ls.variableCount();
        OrderMixture mix;
        if (n <= PREDICT_ENUMERATE_MAX) {
            mix = OrderMixture.exact(ls, allowedOrders(oc, n), tailMass, maxHiddenStates);
            return Cases.mixture(mix, "exact: all " + mix.size() + " allowed orders", DagPrior.ORDER_MODULAR, "orders");
        }
        int k = Math.max(1, Math.min(s.orderSamples(), PREDICT_MAX_ORDERS));
        ExactOrderSum.Result r = ExactOrderSum.run(ls, oc, k, s.seed(), null);
        mix = OrderMixture.sampled(ls, Arrays.asList(r.sampledOrders()), tailMass, maxHiddenStates);
        return Cases.mixture(mix, "exact: " + mix.draws() + " sampled orders, " + mix.size() + " distinct",
                DagPrior.ORDER_MODULAR, "orders");
    }

    /** Complete cases exactly, as Z(D + case) / Z(D): one exact sum over all orders per case. */
    public ExactCasePrediction exactCases() {
        return new ExactCasePrediction(ls, oc);
    }

    @Override
    public EffectSource effectSource() {
        int n = ls.variableCount();
        if (n <= EFFECT_ENUMERATE_MAX) {
            List<int[]> all = allowedOrders(oc, n);
            return new OverOrders(EffectOrders.enumerated(all), "every allowed order (" + all.size()
                    + ") with its exact posterior weight, and every DAG consistent with each (exact)", null, null);
        }
        ExactOrderSum.Result er = ExactOrderSum.run(ls, oc, EFFECT_SAMPLED_ORDERS, s.seed(), null);
        return new OverOrders(EffectOrders.independent(Arrays.asList(er.sampledOrders())), EFFECT_SAMPLED_ORDERS
                + " orders drawn from the exact order posterior, and every DAG consistent with each (sampled; see mcse)", null, null);
    }

    /** Every order of {@code n} variables that {@code oc} allows, in lexicographic order. */
    public static List<int[]> allowedOrders(OrderConstraints oc, int n) {
        List<int[]> all = new ArrayList<>();
        permute(new int[n], new boolean[n], 0, oc, all);
        return all;
    }

    private static void permute(int[] cur, boolean[] used, int depth, OrderConstraints oc, List<int[]> out) {
        int n = cur.length;
        if (depth == n) {
            out.add(cur.clone());
            return;
        }
        for (int v = 0; v < n; v++) {
            if (used[v]) {
                continue;
            }
            boolean ok = true;
            for (int u = 0; u < n && ok; u++) {
                ok = used[u] || !oc.mustPrecede(u, v);
            }
            if (!ok) {
                continue;
            }
            used[v] = true;
            cur[depth] = v;
            permute(cur, used, depth + 1, oc, out);
            used[v] = false;
        }
    }

    /** {@code count} DAGs drawn exactly from the order-modular posterior (an order drawn exactly, then a DAG given it). */
    @Override
    public Sampled sampleDags(int count, long seed) {
        DagLists.checkDrawable(ls);
        List<int[]> dags = ExactDagSampler.of(ls, oc).draw(DagPrior.ORDER_MODULAR, count, seed, Double.NaN);
        return new Sampled(DagSample.fromMasks(ls.variableCount(), dags, null), count
                + " DAGs drawn exactly from the order-modular posterior (an order drawn exactly, then a DAG given it)");
    }
}
