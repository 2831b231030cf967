package org.edgewise.driver.average.givenorder;

import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;

/**
 * Averaging over every DAG consistent with a fixed variable order, with in-degree ≤ d — in closed
 * form, because the sum factorises into one sum per variable over its allowed parent sets
 * (Buntine 1991, "Theory refinement on Bayesian networks", UAI; Friedman &amp; Koller 2003,
 * "Being Bayesian about network structure", Machine Learning 50):
 * <pre>
 *   logEvidence      = Σ_i log Σ_{U ⊆ pred(i)} exp(s(i,U) + log ρ_i(U))
 *   P(j → i | D, ≺)  = Σ_{U ∋ j, U ⊆ pred(i)} exp(s(i,U) + log ρ_i(U) − logZ_i)
 * </pre>
 * {@code logEvidence} uses the modular weights ρ as they are (Koivisto &amp; Sood 2004's
 * convention); {@code logEvidenceNormalized} subtracts Σ_i log Σ_{U ⊆ pred(i)} ρ_i(U) and is a
 * proper log P(D | ≺) under the prior renormalised over the DAGs consistent with ≺.
 */
public final class OrderSum {
    private OrderSum() {
    }

    /** Result for one order. {@code edgePosterior[from][to]}. */
    public record OrderResult(double logEvidence, double logEvidenceNormalized, double[] childLogSum,
                              double[][] edgePosterior) {
    }

    /** log Σ_{U allowed, U ⊆ pred} exp(weight(U)) for one child; −∞ when no set fits. */
    public static double childLogSum(LocalScores ls, int child, long predMask) {
        return LogSum.ofSubsets(ls.masks(child), ls.weights(child), predMask);
    }

    /** log Σ_{U allowed, U ⊆ pred} ρ_i(U): the prior mass renormalising one child's sum. */
    public static double childLogPriorMass(LocalScores ls, int child, long predMask) {
        return LogSum.ofSubsets(ls.masks(child), ls.logPriors(child), predMask);
    }

    /**
     * Adds exp(weight − logZ) of every allowed set of {@code child} to the posterior of each of its
     * members, into {@code into[from][child]} scaled by {@code factor} (1 for a single order).
     */
    public static void addEdgePosteriors(LocalScores ls, int child, long predMask, double logZ,
                                         double factor, double[][] into) {
        long[] masks = ls.masks(child);
        double[] w = ls.weights(child);
        int[] cand = ls.candidates(child);
        for (int s = 0; s < masks.length; s++) {
            long m = masks[s];
            if ((m & ~predMask) != 0 || m == 0) {
                continue;
            }
            double p = factor * Math.exp(w[s] - logZ);
            while (m != 0) {
                int pos = Long.numberOfTrailingZeros(m);
                into[cand[pos]][child] += p;
                m &= m - 1;
            }
        }
    }

    /** Position of each variable in {@code order} (a permutation of 0..n−1). */
    public static int[] positions(int[] order, int n) {
        int[] pos = new int[n];
        java.util.Arrays.fill(pos, -1);
        for (int p = 0; p < order.length; p++) {
            pos[order[p]] = p;
        }
        return pos;
    }

    /** Evidence, per-child sums and every edge posterior for one order. */
    public static OrderResult evaluate(LocalScores ls, int[] order) {
        int n = ls.variableCount();
        if (order.length != n) {
            throw new IllegalArgumentException("order has " + order.length + " variables, expected " + n);
        }
        int[] pos = positions(order, n);
        double[] childLogSum = new double[n];
        double[][] edges = new double[n][n];
        double evidence = 0;
        double priorMass = 0;
        for (int child = 0; child < n; child++) {
            long pred = ls.predecessorMask(child, pos);
            double z = childLogSum(ls, child, pred);
            if (z == Double.NEGATIVE_INFINITY) {
                throw new UserError("variable " + ls.store().variables().get(child).name()
                        + " has no allowed parent set under this order (a required parent comes after it)");
            }
            childLogSum[child] = z;
            evidence += z;
            priorMass += childLogPriorMass(ls, child, pred);
            addEdgePosteriors(ls, child, pred, z, 1.0, edges);
        }
        return new OrderResult(evidence, evidence - priorMass, childLogSum, edges);
    }
}
