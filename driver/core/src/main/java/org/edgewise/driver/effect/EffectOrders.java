package org.edgewise.driver.effect;

import java.util.List;
import org.edgewise.driver.Checks;

/**
 * The orders an effect is averaged over.
 *
 * @param orders   the orders (variable indices, first to last)
 * @param weighted true: every allowed order, each weighted by exp(logEvidence(≺)) — the exact
 *                 order-modular average (one order: the given-order answer); false: an equally
 *                 weighted sample of orders (from the exact order posterior or from order MCMC)
 * @param chains   for a sample from order MCMC, the number of chains (the orders listed chain
 *                 by chain, equally many per chain), so the MCSE accounts for autocorrelation;
 *                 0 for independent draws or a weighted list
 */
public record EffectOrders(List<int[]> orders, boolean weighted, int chains) {
    public EffectOrders {
        orders = List.copyOf(orders);
        Checks.atLeast(orders.size(), 1, "the number of orders");
        Checks.zeroOrMore(chains, "the number of chains");
    }

    /** One given order: exact. */
    public static EffectOrders given(int[] order) {
        return new EffectOrders(List.of(order.clone()), true, 0);
    }

    /** Every allowed order with its exact posterior weight (order-modular prior). */
    public static EffectOrders enumerated(List<int[]> orders) {
        return new EffectOrders(orders, true, 0);
    }

    /** Independent draws from the exact order posterior. */
    public static EffectOrders independent(List<int[]> orders) {
        return new EffectOrders(orders, false, 0);
    }

    /** Orders kept by {@code chains} order-MCMC chains, chain by chain. */
    public static EffectOrders chains(List<int[]> orders, int chains) {
        return new EffectOrders(orders, false, chains);
    }
}
