package org.edgewise.driver.query;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.DagPrior;
import org.edgewise.driver.average.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.OrderMcmc;
import org.edgewise.driver.average.OrderSampling;
import org.edgewise.driver.average.PartitionMcmc;
import org.edgewise.driver.average.UnknownOrderSettings;

/**
 * The case predictor mixed over unknown orders. Exact: every allowed order with its exact
 * posterior weight when n ≤ {@link #ENUMERATE_MAX} (at most 5,040 orders), else orders drawn from
 * the exact order posterior (Koivisto &amp; Sood 2004). MCMC: the stored orders of the chains, or under
 * the structure-modular prior the stored partitions of partition MCMC (each averaged over its DAGs,
 * {@link OrderMixture#sampledPartitions}). At
 * most {@link #MAX_ORDERS} sampled orders are mixed (evenly spaced). A sampled mixture says so
 * ({@link Mixture#orders()} "sampled", with K) and every probability then has a Monte Carlo
 * error ({@link OrderMixture#mcse}); for an exact answer on a complete case with n ≥ 8 use
 * {@link ExactCasePrediction}. Exactly mixed orders are weighted by their evidence: the order-modular
 * DAG prior.
 */
public final class UnknownOrderPrediction {
    public static final int ENUMERATE_MAX = 7;
    public static final int MAX_ORDERS = 1000;

    /**
     * The mixture, and for MCMC whether the chains agreed.
     *
     * @param converged true for exact; for MCMC whether the largest split-R̂ is below the threshold
     * @param maxRhat   the largest split-R̂ (NaN for exact)
     */
    public record Mixture(OrderMixture mixture, boolean converged, double maxRhat) {
        /** {@code "all"} when every allowed order was mixed with its exact weight, {@code "sampled"} otherwise. */
        public String orders() {
            return mixture.sampled() ? "sampled" : "all";
        }

        /** The number K of sampled orders (repeats counted), or null when all were mixed. */
        public Integer orderSamples() {
            return mixture.sampled() ? mixture.draws() : null;
        }
    }

    private UnknownOrderPrediction() {
    }

    public static Mixture mixture(LocalScores ls, UnknownOrderSettings s, double tailMass, long maxHidden,
                                  ProgressListener progress) {
        int n = ls.variableCount();
        OrderConstraints oc = s.constraints(ls);
        if (s.method() == UnknownOrderSettings.Method.EXACT) {
            if (n <= ENUMERATE_MAX) {
                return new Mixture(OrderMixture.exact(ls, allowedOrders(oc, n), tailMass, maxHidden), true, Double.NaN);
            }
            int k = Math.max(1, Math.min(s.orderSamples(), MAX_ORDERS));
            ExactOrderSum.Result r = ExactOrderSum.run(ls, oc, k, s.seed(), null);
            return new Mixture(OrderMixture.sampled(ls, Arrays.asList(r.sampledOrders()), tailMass, maxHidden),
                    true, Double.NaN);
        }
        if (s.dagPrior() == DagPrior.STRUCTURE_MODULAR) {
            PartitionMcmc.Result p = OrderSampling.runPartitionMcmc(ls, oc, s, false, progress);
            return new Mixture(OrderMixture.sampledPartitions(ls, oc, OrderSampling.evenlySpaced(p.partitions(), MAX_ORDERS),
                    tailMass, maxHidden), p.chains().converged(), p.chains().maxRhat());
        }
        OrderMcmc.Result r = OrderSampling.runMcmc(ls, oc, s, false, progress);
        return new Mixture(OrderMixture.sampled(ls, OrderSampling.evenlySpaced(r.orders(), MAX_ORDERS),
                tailMass, maxHidden), r.converged(), r.maxRhat());
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
}
