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

    /**
     * The reserve behind {@code --reserve}: per child the candidates after those {@code kept}, in the
     * same order (gain highest first, ties to the lower index), until {@code wide} are kept and held in
     * reserve together; then, in the same order, every other candidate x whose own kept candidates hold
     * the child (so that an edge the pruning allows one way, x ← child, can be widened into the other
     * way, x → child, as an undirected search space would allow). Best first (not sorted by index).
     */
    public static int[][] reserve(int[][] candidates, int[][] kept, double[][] gain, int wide) {
        int n = candidates.length;
        int[][] out = new int[n][];
        for (int i = 0; i < n; i++) {
            final int child = i;
            List<Integer> others = new ArrayList<>();
            for (int c : candidates[i]) {
                if (Arrays.binarySearch(kept[i], c) < 0) {
                    others.add(c);
                }
            }
            others.sort((a, b) -> {
                int cmp = Double.compare(gain[child][b], gain[child][a]);
                return cmp != 0 ? cmp : Integer.compare(a, b);
            });
            int room = Math.min(Math.max(0, wide - kept[i].length), others.size());
            List<Integer> res = new ArrayList<>(others.subList(0, room));
            for (int x : others.subList(room, others.size())) {
                if (Arrays.binarySearch(kept[x], i) >= 0) {
                    res.add(x);
                }
            }
            out[i] = res.stream().mapToInt(Integer::intValue).toArray();
        }
        return out;
    }

    /** Per child, the sorted union of its kept candidates and its reserve: the parents the families are counted over. */
    public static int[][] union(int[][] kept, int[][] reserve) {
        int[][] out = new int[kept.length][];
        for (int i = 0; i < kept.length; i++) {
            out[i] = java.util.stream.IntStream.concat(Arrays.stream(kept[i]), Arrays.stream(reserve[i])).sorted().toArray();
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
