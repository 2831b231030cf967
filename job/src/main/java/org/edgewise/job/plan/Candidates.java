package org.edgewise.job.plan;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * Candidate-parent pruning ({@code --candidates K}): per child keep its required parents and then
 * the best other candidates by single-parent score gain s(i,{j}) − s(i,∅) (ties: lower index
 * first) until K are kept.
 */
public final class Candidates {
    private Candidates() {
    }

    /**
     * @param candidates candidates of every child (sorted)
     * @param required   required parents of every child (a subset of its candidates)
     * @param gain       {@code gain[i][j]} = s(i,{j}) − s(i,∅) (only read for candidates)
     * @param k          parents to keep per child (required parents always kept, even beyond k)
     * @return the pruned candidates of every child, sorted
     */
    public static int[][] prune(int[][] candidates, int[][] required, double[][] gain, int k) {
        int n = candidates.length;
        int[][] out = new int[n][];
        for (int i = 0; i < n; i++) {
            final int child = i;
            List<Integer> kept = new ArrayList<>();
            for (int r : required[i]) {
                kept.add(r);
            }
            List<Integer> others = new ArrayList<>();
            for (int c : candidates[i]) {
                if (Arrays.binarySearch(required[i], c) < 0) {
                    others.add(c);
                }
            }
            others.sort((a, b) -> {
                int cmp = Double.compare(gain[child][b], gain[child][a]);
                return cmp != 0 ? cmp : Integer.compare(a, b);
            });
            for (int m = 0; m < others.size() && kept.size() < k; m++) {
                kept.add(others.get(m));
            }
            out[i] = kept.stream().mapToInt(Integer::intValue).sorted().toArray();
        }
        return out;
    }

    /** True when some child has more than k candidates (so pruning changes something). */
    public static boolean needed(int[][] candidates, int k) {
        for (int[] c : candidates) {
            if (c.length > k) {
                return true;
            }
        }
        return false;
    }
}
