package org.edgewise.driver.query;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.givenorder.OrderPosterior;

/**
 * Prediction when the order is unknown: a mixture over orders of the given-order predictors,
 * <pre>
 *   P(x | D) = Σ_≺ P(≺ | D) P(x | D, ≺),   P(≺ | D) ∝ exp(logEvidence(≺))   (order-modular, uniform order prior)
 * </pre>
 * over either every allowed order with its exact posterior weight ({@link #exact}), or a sample
 * of orders each weighted by its frequency ({@link #sampled}: orders drawn from the exact
 * posterior, or stored by order MCMC). Conditionals are ratios of the mixed joints,
 * P(t | g, D) = P(t, g | D) / P(g | D) — not a mixture of per-order conditionals.
 *
 * <p>Memory: one {@link CasePredictor} per distinct order kept. Immutable, thread-safe.
 */
public final class OrderMixture implements CaseProbability {
    private final CasePredictor[] parts;
    private final double[] logWeight;
    private final int[] bestOrder;
    /** Number of sampled orders (with repeats) for a sampled mixture; 0 for an exact one. */
    private final int draws;
    /** How the caller names the evidence in messages. */
    private final InputNames names;

    private OrderMixture(CasePredictor[] parts, double[] logWeight, int[] bestOrder, int draws, InputNames names) {
        this.parts = parts;
        this.logWeight = logWeight;
        this.bestOrder = bestOrder;
        this.draws = draws;
        this.names = names;
    }

    /** Every order in {@code orders} with weight ∝ exp(logEvidence(≺)) (orders of zero likelihood dropped). */
    public static OrderMixture exact(LocalScores ls, List<int[]> orders, double tailMass, long maxHidden) {
        List<CasePredictor> ps = new ArrayList<>();
        List<Double> lw = new ArrayList<>();
        int[] best = null;
        double bestEv = Double.NEGATIVE_INFINITY;
        for (int[] o : orders) {
            OrderPosterior op;
            try {
                op = OrderPosterior.of(ls, o);
            } catch (UserError e) {
                continue; // a required parent after its child: likelihood zero under this order
            }
            double ev = op.result().logEvidence();
            ps.add(CasePredictor.averaged(op, tailMass).withMaxHiddenStates(maxHidden));
            lw.add(ev);
            if (ev > bestEv) {
                bestEv = ev;
                best = o.clone();
            }
        }
        double[] w = lw.stream().mapToDouble(Double::doubleValue).toArray();
        double z = LogSum.of(w);
        for (int k = 0; k < w.length; k++) {
            w[k] -= z;
        }
        return new OrderMixture(ps.toArray(new CasePredictor[0]), w, best, 0, ls.options().names());
    }

    /** Sampled orders, each distinct order weighted by its share of the sample. */
    public static OrderMixture sampled(LocalScores ls, List<int[]> orders, double tailMass, long maxHidden) {
        return sampled(ls, orders, tailMass, maxHidden, o -> OrderPosterior.of(ls, o));
    }

    /**
     * Sampled ordered partitions (structure-modular prior, partition MCMC): {@code element[v]} per
     * variable, each distinct partition weighted by its share of the sample and averaged over its
     * DAGs ({@link OrderPosterior#ofPartition}); the best order is a linear extension of the
     * partition with the largest summed weight.
     */
    public static OrderMixture sampledPartitions(LocalScores ls, OrderConstraints oc, List<int[]> partitions, double tailMass,
                                                 long maxHidden) {
        return sampled(ls, partitions, tailMass, maxHidden, el -> OrderPosterior.ofPartition(ls, el, oc));
    }

    private static OrderMixture sampled(LocalScores ls, List<int[]> draws, double tailMass, long maxHidden,
                                        java.util.function.Function<int[], OrderPosterior> posterior) {
        Map<String, int[]> distinct = new HashMap<>();
        Map<String, Integer> count = new HashMap<>();
        for (int[] o : draws) {
            String key = java.util.Arrays.toString(o);
            distinct.putIfAbsent(key, o);
            count.merge(key, 1, Integer::sum);
        }
        List<String> keys = new ArrayList<>(new TreeSet<>(distinct.keySet()));
        CasePredictor[] ps = new CasePredictor[keys.size()];
        double[] w = new double[keys.size()];
        int[] best = null;
        double bestEv = Double.NEGATIVE_INFINITY;
        for (int k = 0; k < keys.size(); k++) {
            OrderPosterior op = posterior.apply(distinct.get(keys.get(k)));
            ps[k] = CasePredictor.averaged(op, tailMass).withMaxHiddenStates(maxHidden);
            w[k] = Math.log(count.get(keys.get(k)) / (double) draws.size());
            if (op.result().logEvidence() > bestEv) {
                bestEv = op.result().logEvidence();
                best = op.order();
            }
        }
        return new OrderMixture(ps, w, best, draws.size(), ls.options().names());
    }

    /** Whether the orders were sampled (then every probability has a Monte Carlo error, {@link #mcse}). */
    @Override
    public boolean sampled() {
        return draws > 0;
    }

    /** Number of sampled orders, repeats counted (K); 0 when every allowed order was mixed exactly. */
    public int draws() {
        return draws;
    }

    /**
     * Monte Carlo standard error of P(target | D) (or of P(target | given, D)) from a sampled
     * mixture; NaN when exact. With K orders drawn independently and Y_k = P(target, given | D, ≺_k),
     * X_k = P(given | D, ≺_k) (X ≡ 1 without {@code given}), the estimate is R = Ȳ / X̄ and, by the
     * delta method for a ratio estimator (Cochran 1977, Sampling Techniques, §6.4),
     * <pre>
     *   MCSE(R) ≈ R · sqrt( Var_k(Y_k/Ȳ − X_k/X̄) / K ),   Var with divisor K − 1
     * </pre>
     * computed on values scaled by their means, so tiny probabilities do not underflow. For orders
     * from MCMC the draws are correlated and this understates the error.
     */
    @Override
    public double mcse(int[] target, int[] given) {
        if (draws < 2) {
            return draws == 0 ? Double.NaN : Double.POSITIVE_INFINITY;
        }
        int[] joint = target;
        if (given != null) {
            joint = CaseConditional.joint(target, given);
            if (joint == null) {
                return 0.0; // contradicts the evidence: probability 0 in every order
            }
        }
        int k = parts.length;
        double[] ly = new double[k];
        double[] lx = new double[k];
        double my = Double.NEGATIVE_INFINITY;
        double mx = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < k; i++) {
            ly[i] = parts[i].logProbability(joint);
            lx[i] = given == null ? 0.0 : parts[i].logProbability(given);
            my = LogSum.add(my, logWeight[i] + ly[i]);
            mx = LogSum.add(mx, logWeight[i] + lx[i]);
        }
        if (my == Double.NEGATIVE_INFINITY) {
            return 0.0;
        }
        double var = 0;
        for (int i = 0; i < k; i++) {
            double d = Math.exp(ly[i] - my) - Math.exp(lx[i] - mx);
            var += Math.exp(logWeight[i]) * d * d;
        }
        var *= draws / (draws - 1.0);
        return Math.exp(my - mx) * Math.sqrt(var / draws);
    }

    /** Number of distinct orders mixed. */
    public int size() {
        return parts.length;
    }

    /** The order of highest evidence among those mixed (for a single-network comparison). */
    public int[] bestOrder() {
        return bestOrder.clone();
    }

    @Override
    public double logProbability(int[] states) {
        double acc = Double.NEGATIVE_INFINITY;
        for (int k = 0; k < parts.length; k++) {
            acc = LogSum.add(acc, logWeight[k] + parts[k].logProbability(states));
        }
        return acc;
    }

    @Override
    public double logConditional(int[] target, int[] given) {
        return CaseConditional.of(this, target, given, names.given() + " has probability zero under the store; a conditional on it is undefined");
    }

    @Override
    public int[] hiddenToSumOut(int[] states) {
        TreeSet<Integer> all = new TreeSet<>();
        for (CasePredictor p : parts) {
            for (int v : p.hiddenToSumOut(states)) {
                all.add(v);
            }
        }
        return all.stream().mapToInt(Integer::intValue).toArray();
    }

    @Override
    public double hiddenJointStates(int[] states) {
        double max = 0;
        for (CasePredictor p : parts) {
            max = Math.max(max, p.hiddenJointStates(states));
        }
        return max;
    }

    @Override
    public double skippedMass() {
        double s = 0;
        for (int k = 0; k < parts.length; k++) {
            s += Math.exp(logWeight[k]) * parts[k].skippedMass();
        }
        return s;
    }
}
