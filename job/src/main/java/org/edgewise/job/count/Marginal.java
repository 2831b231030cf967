package org.edgewise.job.count;

import java.util.Arrays;
import org.edgewise.driver.store.FamilyCounts;

/**
 * Marginalises a family (child, parents) out of the dense counts of a variable set that contains
 * it, and keeps only the observed parent configurations — the {@link FamilyCounts} layout:
 * configuration j in mixed radix with the first (lowest-index) parent most significant,
 * configurations increasing, {@code counts[m·r + k]} = N_ijk.
 *
 * <p>Memory: a dense long array of q·r cells for the family while marginalising (q = Π parent
 * arities), then 8 bytes per observed configuration plus 8·r for its counts.
 */
public final class Marginal {
    private Marginal() {
    }

    /**
     * @param dense   counts of the variable set, flat from {@code offset}, mixed radix, first variable most significant
     * @param set     the variable set, sorted
     * @param arity   states of every variable
     * @param child   the family's child (a member of {@code set})
     * @param parents the family's parents, sorted (members of {@code set})
     */
    public static FamilyCounts family(long[] dense, int offset, int[] set, int[] arity, int child, int[] parents) {
        int m = set.length;
        int r = arity[child];
        // weight of each set variable in the family's dense index (config·r + k); 0 when summed out
        long[] weight = new long[m];
        long q = 1;
        for (int p = parents.length - 1; p >= 0; p--) {
            weight[position(set, parents[p])] = q * r;
            q *= arity[parents[p]];
        }
        weight[position(set, child)] = 1;
        long[] fam = new long[Math.toIntExact(q * r)];
        int[] digit = new int[m];
        long cells = 1;
        for (int v : set) {
            cells *= arity[v];
        }
        long fi = 0;
        for (long c = 0; c < cells; c++) {
            fam[(int) fi] += dense[offset + (int) c];
            // odometer over the set's digits, last variable fastest
            for (int k = m - 1; k >= 0; k--) {
                int v = set[k];
                if (++digit[k] < arity[v]) {
                    fi += weight[k];
                    break;
                }
                digit[k] = 0;
                fi -= weight[k] * (arity[v] - 1);
            }
        }
        int observed = 0;
        for (int j = 0; j < q; j++) {
            if (rowSum(fam, j, r) > 0) {
                observed++;
            }
        }
        long[] configs = new long[observed];
        long[] counts = new long[observed * r];
        int o = 0;
        for (int j = 0; j < q; j++) {
            if (rowSum(fam, j, r) > 0) {
                configs[o] = j;
                System.arraycopy(fam, j * r, counts, o * r, r);
                o++;
            }
        }
        return new FamilyCounts(child, parents.clone(), configs, counts);
    }

    private static long rowSum(long[] fam, int j, int r) {
        long s = 0;
        for (int k = 0; k < r; k++) {
            s += fam[j * r + k];
        }
        return s;
    }

    private static int position(int[] set, int v) {
        int p = Arrays.binarySearch(set, v);
        if (p < 0) {
            throw new IllegalArgumentException("variable " + v + " is not in the set " + Arrays.toString(set));
        }
        return p;
    }
}
