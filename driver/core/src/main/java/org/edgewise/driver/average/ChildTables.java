package org.edgewise.driver.average;

import java.util.Arrays;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.givenorder.OrderSum;
import org.edgewise.driver.average.mcmc.McmcMemory;

/**
 * Per child, log Σ_{U ⊆ P} exp(s(i,U) + log ρ_i(U)) for every subset P of its candidates, as one
 * table of 2^K doubles filled by a fast subset (zeta) transform in log space
 * (Koivisto &amp; Sood 2004's α_i restricted to the candidates): a sampled order then costs one
 * lookup per child, and the edge posterior given the order is
 * P(j → i | ≺) = 1 − exp(α_i(P∖{j}) − α_i(P)) for a candidate j ∈ P (the sets without j are
 * exactly the subsets of P∖{j}).
 *
 * <p>Memory: 8·2^K bytes per tabulated child (K = 10: 8 KiB; K = 20: 8 MiB), planned before any
 * is built ({@link #plan}, {@link McmcMemory}). Children are tabulated, fewest candidates first,
 * until {@code budgetBytes} is used; the others (and any with K &gt; 26) are summed directly
 * ({@link OrderSum#childLogSum}) with a small per-chain cache.
 */
public final class ChildTables {
    static final int MAX_TABLE_BITS = 26;
    private final double[][] table;

    /** Which children get a table within a budget, and the bytes those tables take. */
    public record Plan(int[] children, long bytes) {
    }

    /** The children tabulated within {@code budgetBytes}: fewest candidates first, 8·2^K bytes each. */
    public static Plan plan(LocalScores ls, long budgetBytes) {
        int n = ls.variableCount();
        Integer[] byK = new Integer[n];
        for (int i = 0; i < n; i++) {
            byK[i] = i;
        }
        Arrays.sort(byK, (a, b) -> Integer.compare(ls.candidates(a).length, ls.candidates(b).length));
        long used = 0;
        int[] chosen = new int[n];
        int count = 0;
        for (int i : byK) {
            int k = ls.candidates(i).length;
            long bytes = 8L << k;
            if (k > MAX_TABLE_BITS || used + bytes > budgetBytes) {
                break;
            }
            used += bytes;
            chosen[count++] = i;
        }
        return new Plan(Arrays.copyOf(chosen, count), used);
    }

    public ChildTables(LocalScores ls, long budgetBytes) {
        table = new double[ls.variableCount()][];
        int[] chosen = plan(ls, budgetBytes).children();
        // children are independent: build their tables on all cores
        Arrays.stream(chosen).parallel().forEach(i -> {
            int k = ls.candidates(i).length;
            double[] t = new double[1 << k];
            Arrays.fill(t, Double.NEGATIVE_INFINITY);
            long[] masks = ls.masks(i);
            double[] w = ls.weights(i);
            for (int s = 0; s < masks.length; s++) {
                int c = (int) masks[s];
                t[c] = LogSum.add(t[c], w[s]);
            }
            ExactOrderSum.subsetZeta(t, k);
            table[i] = t;
        });
    }

    /** The table of {@code child}, or null when it is summed directly. */
    public double[] table(int child) {
        return table[child];
    }
}
