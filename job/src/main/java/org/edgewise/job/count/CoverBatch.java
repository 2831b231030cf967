package org.edgewise.job.count;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Iterator;
import java.util.List;
import org.edgewise.job.input.Block;

/**
 * One batch of variable sets counted in one pass, and the partition-local kernel that counts them.
 *
 * <p>Each set S = (v_0 &lt; … &lt; v_{m−1}) gets a dense block of Π r_v cells in one flat array at
 * {@code offset[s]}; the cell of a row is its mixed-radix index with v_0 most significant,
 * ((s_0·r_1 + s_1)·r_2 + …)·r_{m−1} + s_{m−1}. Sets are sorted, so consecutive sets often share
 * all but their last variable: they form a group whose prefix index is computed once per block
 * and reused ({@code pre[t]·r_last + s_last}).
 *
 * <p>A block of a table of counts ({@link Block#weights()}) is counted by the weighted kernel,
 * which adds each row's weight (a long) where the plain kernel adds 1, straight into the long
 * array; the job refuses weights whose sum passes {@link Long#MAX_VALUE}, so no partial sum of
 * these non-negative weights can overflow.
 *
 * <p>Memory per task: 4 bytes per cell (int counts) while counting and 8 bytes per cell for the
 * long array handed to the reduce (the weighted kernel's only array), plus one int per block row
 * for the prefix index.
 */
public final class CoverBatch implements Serializable {
    private static final long serialVersionUID = 1L;

    private final int[][] sets;
    private final int[] offset;
    private final int cells;
    private final int[] arity;
    /** groups: prefix variables, and for each member its set index. */
    private final int[][] groupPrefix;
    private final int[][] groupMembers;
    /** Marks "every group, in order" for the kernel. */
    private static final int[] ALL_GROUPS = new int[0];

    /**
     * @param sets  the variable sets, sorted lexicographically, each sorted ascending
     * @param arity states of every variable
     */
    public CoverBatch(int[][] sets, int[] arity) {
        this.sets = sets;
        this.arity = arity.clone();
        this.offset = new int[sets.length + 1];
        long total = 0;
        for (int s = 0; s < sets.length; s++) {
            offset[s] = (int) total;
            long c = 1;
            for (int v : sets[s]) {
                c *= arity[v];
            }
            total += c;
            if (total > Integer.MAX_VALUE - 8) {
                throw new IllegalArgumentException("batch too large: " + total + " cells");
            }
        }
        offset[sets.length] = (int) total;
        this.cells = (int) total;
        List<int[]> prefixes = new ArrayList<>();
        List<int[]> members = new ArrayList<>();
        List<Integer> cur = new ArrayList<>();
        int[] curPrefix = null;
        for (int s = 0; s < sets.length; s++) {
            int[] p = Arrays.copyOf(sets[s], sets[s].length - 1);
            if (curPrefix == null || !Arrays.equals(curPrefix, p)) {
                if (curPrefix != null) {
                    prefixes.add(curPrefix);
                    members.add(cur.stream().mapToInt(Integer::intValue).toArray());
                }
                curPrefix = p;
                cur = new ArrayList<>();
            }
            cur.add(s);
        }
        if (curPrefix != null) {
            prefixes.add(curPrefix);
            members.add(cur.stream().mapToInt(Integer::intValue).toArray());
        }
        this.groupPrefix = prefixes.toArray(int[][]::new);
        this.groupMembers = members.toArray(int[][]::new);
    }

    public int cells() {
        return cells;
    }

    public int offset(int s) {
        return offset[s];
    }

    /**
     * Counts every set of the batch over a partition's blocks. Returns the partition's counts,
     * one long per cell. Ints are folded into the longs before they could overflow.
     */
    public long[] countPartition(Iterator<Block> blocks) {
        int[] counts = new int[cells];
        long[] total = new long[cells];
        int[] pre = new int[Block.ROWS];
        long sinceFold = 0;
        while (blocks.hasNext()) {
            Block b = blocks.next();
            if (b.weights() != null) {
                countWeighted(b, total, pre);
                continue;
            }
            if (sinceFold + b.rows() > Integer.MAX_VALUE) {
                fold(counts, total);
                sinceFold = 0;
            }
            countBlock(b, counts, pre);
            sinceFold += b.rows();
        }
        fold(counts, total);
        return total;
    }

    private static void fold(int[] counts, long[] total) {
        for (int c = 0; c < counts.length; c++) {
            total[c] += counts[c];
            counts[c] = 0;
        }
    }

    /** Writes the mixed-radix index of group g's prefix variables for each of the block's n rows into pre. */
    private void prefix(int g, byte[][] cols, int n, int[] pre) {
        int[] prefix = groupPrefix[g];
        if (prefix.length == 0) {
            Arrays.fill(pre, 0, n, 0);
            return;
        }
        byte[] c0 = cols[prefix[0]];
        for (int t = 0; t < n; t++) {
            pre[t] = c0[t] & 0xFF;
        }
        for (int k = 1; k < prefix.length; k++) {
            byte[] ck = cols[prefix[k]];
            int r = arity[prefix[k]];
            for (int t = 0; t < n; t++) {
                pre[t] = pre[t] * r + (ck[t] & 0xFF);
            }
        }
    }

    /** The kernel: for each group, the prefix index of every row once, then one increment per row per member. */
    void countBlock(Block b, int[] counts, int[] pre) {
        count(b.cols(), b.rows(), counts, pre, ALL_GROUPS, groupMembers);
    }

    /**
     * The sets of this batch that hold a variable of {@code mask} (bit v for variable v;
     * {@code meets}) or none of them ({@code !meets}): the selection {@link #count(byte[][], int, int[], int[], Selection)}
     * counts. With both, every set is in exactly one of the two selections.
     */
    public Selection select(long mask, boolean meets) {
        List<Integer> gs = new ArrayList<>();
        List<int[]> ms = new ArrayList<>();
        for (int g = 0; g < groupPrefix.length; g++) {
            long prefixMask = 0;
            for (int v : groupPrefix[g]) {
                prefixMask |= 1L << v;
            }
            List<Integer> keep = new ArrayList<>();
            for (int m : groupMembers[g]) {
                int[] set = sets[m];
                boolean hit = (prefixMask & mask) != 0 || (mask >>> set[set.length - 1] & 1) != 0;
                if (hit == meets) {
                    keep.add(m);
                }
            }
            if (!keep.isEmpty()) {
                gs.add(g);
                ms.add(keep.stream().mapToInt(Integer::intValue).toArray());
            }
        }
        return new Selection(gs.stream().mapToInt(Integer::intValue).toArray(), ms.toArray(int[][]::new));
    }

    /** Some sets of a batch, by group: {@code groups[i]} and its members {@code members[i]} (set indices). */
    public record Selection(int[] groups, int[][] members) implements Serializable {
        /** Count of sets selected. */
        public int sets() {
            int s = 0;
            for (int[] m : members) {
                s += m.length;
            }
            return s;
        }
    }

    /**
     * The kernel over the selected sets only: {@code n} column-major rows {@code cols} (no missing cell
     * in a selected set's variables) counted into the batch's cells, {@code counts} indexed as in
     * {@link #countPartition} (the whole batch); {@code pre} holds at least n ints.
     */
    public void count(byte[][] cols, int n, int[] counts, int[] pre, Selection sel) {
        count(cols, n, counts, pre, sel.groups(), sel.members());
    }

    /** The one kernel: for the groups {@code gs} and, of group gs[i], the members {@code ms[i]}. */
    private void count(byte[][] cols, int n, int[] counts, int[] pre, int[] gs, int[][] ms0) {
        for (int gi = 0; gi < (gs == ALL_GROUPS ? groupPrefix.length : gs.length); gi++) {
            int g = gs == ALL_GROUPS ? gi : gs[gi];
            prefix(g, cols, n, pre);
            int[] ms = ms0[gi];
            int i = 0;
            // members two at a time: one load of the prefix index feeds two independent increment
            // chains, which hides the latency of repeated increments of the same cell
            for (; i + 1 < ms.length; i += 2) {
                int[] s1 = sets[ms[i]];
                int[] s2 = sets[ms[i + 1]];
                byte[] l1 = cols[s1[s1.length - 1]];
                byte[] l2 = cols[s2[s2.length - 1]];
                int r1 = arity[s1[s1.length - 1]];
                int r2 = arity[s2[s2.length - 1]];
                int o1 = offset[ms[i]];
                int o2 = offset[ms[i + 1]];
                for (int t = 0; t < n; t++) {
                    int p = pre[t];
                    counts[o1 + p * r1 + (l1[t] & 0xFF)]++;
                    counts[o2 + p * r2 + (l2[t] & 0xFF)]++;
                }
            }
            if (i < ms.length) {
                int[] set = sets[ms[i]];
                int last = set[set.length - 1];
                byte[] cl = cols[last];
                int r = arity[last];
                int off = offset[ms[i]];
                for (int t = 0; t < n; t++) {
                    counts[off + pre[t] * r + (cl[t] & 0xFF)]++;
                }
            }
        }
    }

    /**
     * The weighted kernel (a table of counts): as {@link #countBlock}, adding each row's weight into
     * the long counts instead of 1 into the int counts.
     */
    void countWeighted(Block b, long[] counts, int[] pre) {
        int n = b.rows();
        byte[][] cols = b.cols();
        long[] w = b.weights();
        for (int g = 0; g < groupPrefix.length; g++) {
            prefix(g, cols, n, pre);
            int[] ms = groupMembers[g];
            int i = 0;
            for (; i + 1 < ms.length; i += 2) {
                int[] s1 = sets[ms[i]];
                int[] s2 = sets[ms[i + 1]];
                byte[] l1 = cols[s1[s1.length - 1]];
                byte[] l2 = cols[s2[s2.length - 1]];
                int r1 = arity[s1[s1.length - 1]];
                int r2 = arity[s2[s2.length - 1]];
                int o1 = offset[ms[i]];
                int o2 = offset[ms[i + 1]];
                for (int t = 0; t < n; t++) {
                    int p = pre[t];
                    long wt = w[t];
                    counts[o1 + p * r1 + (l1[t] & 0xFF)] += wt;
                    counts[o2 + p * r2 + (l2[t] & 0xFF)] += wt;
                }
            }
            if (i < ms.length) {
                int[] set = sets[ms[i]];
                int last = set[set.length - 1];
                byte[] cl = cols[last];
                int r = arity[last];
                int off = offset[ms[i]];
                for (int t = 0; t < n; t++) {
                    counts[off + pre[t] * r + (cl[t] & 0xFF)] += w[t];
                }
            }
        }
    }

    /** Adds {@code b} into {@code a} and returns {@code a} (the reduce step). */
    public static long[] sum(long[] a, long[] b) {
        for (int c = 0; c < a.length; c++) {
            a[c] += b[c];
        }
        return a;
    }
}
