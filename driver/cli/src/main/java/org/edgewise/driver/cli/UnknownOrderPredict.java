package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.average.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.OrderMcmc;
import org.edgewise.driver.query.OrderMixture;

/**
 * {@code predict --method exact|mcmc}: the predictor mixed over orders. Exact: every allowed order
 * with its exact posterior weight when n ≤ {@link #ENUMERATE_MAX} (at most 5,040 orders), else
 * orders drawn from the exact order posterior (Koivisto &amp; Sood 2004). MCMC: the stored orders
 * of the chains. At most {@link #MAX_ORDERS} sampled orders are mixed (evenly spaced).
 */
final class UnknownOrderPredict {
    static final int ENUMERATE_MAX = 7;
    static final int MAX_ORDERS = 1000;

    private UnknownOrderPredict() {
    }

    static OrderMixture mixture(String method, LocalScores ls, UnknownOrderOptions o, double tailMass, long maxHidden,
                                PrintWriter err) {
        int n = ls.variableCount();
        OrderConstraints oc = UnknownOrderEdges.constraints(ls, o);
        if (method.equals("exact")) {
            if (n <= ENUMERATE_MAX) {
                List<int[]> all = new ArrayList<>();
                permute(new int[n], new boolean[n], 0, oc, all);
                return OrderMixture.exact(ls, all, tailMass, maxHidden);
            }
            int k = Math.max(1, Math.min(o.orderSamples, MAX_ORDERS));
            ExactOrderSum.Result r = ExactOrderSum.run(ls, oc, k, o.seed, null);
            return OrderMixture.sampled(ls, Arrays.asList(r.sampledOrders()), tailMass, maxHidden);
        }
        long burn = o.burnIn == null ? o.steps / 4 : o.burnIn;
        OrderMcmc.Settings s = new OrderMcmc.Settings(o.chains, o.steps, burn, o.seed, o.draws,
                o.untilRhat == null ? Double.NaN : o.untilRhat, o.maxSteps == null ? 20 * o.steps : o.maxSteps,
                false, Math.max(64L << 20, Runtime.getRuntime().maxMemory() / 4));
        OrderMcmc.Result r;
        try (Progress p = Progress.start("order MCMC", (burn + o.steps) * o.chains)) {
            long[] shown = {0};
            r = OrderMcmc.run(ls, oc, s, (done, planned, acc, rhat) -> {
                if (done > shown[0]) {
                    p.step(done - shown[0]);
                    shown[0] = done;
                }
            });
        }
        if (!r.converged()) {
            err.println(String.format(Locale.ROOT,
                    "predict: WARNING: the chains disagree (largest split-R-hat %.3f > %.2f): the prediction is not reliable; run longer",
                    r.maxRhat(), UnknownOrderEdges.RHAT_WARN));
        }
        List<int[]> orders = r.orders();
        List<int[]> few = new ArrayList<>();
        int every = Math.max(1, orders.size() / MAX_ORDERS);
        for (int k = 0; k < orders.size(); k += every) {
            few.add(orders.get(k));
        }
        return OrderMixture.sampled(ls, few, tailMass, maxHidden);
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
