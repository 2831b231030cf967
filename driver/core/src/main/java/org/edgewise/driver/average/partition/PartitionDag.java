package org.edgewise.driver.average.partition;

import java.util.Arrays;
import org.edgewise.driver.average.LocalScores;

/**
 * The DAG half of a {@link PartitionChain}'s state: one DAG G whose partition (each node's longest
 * path from a source) is the chain's partition Λ, with the lookups that single-edge moves need — the
 * index of a parent set among a child's allowed sets, and whether adding an edge closes a cycle.
 *
 * <p>Parent sets are masks over the child's candidates ({@link LocalScores#candidates(int)}); the
 * set index is found in a per-child open-addressing table of the allowed masks (load ≤ 1/2, linear
 * probing). Memory per child: 12 bytes × the table size (≤ 4 × its allowed sets); children as bitsets,
 * n²/8 bytes (31 KB at n = 500); O(n) scratch.
 * Mutable, confined to its chain's thread.
 */
final class PartitionDag {
    private final LocalScores ls;
    private final int n;
    /** Per child: allowed masks by hash slot (−1 empty) and their set indices. */
    private final long[][] slotMask;
    private final int[][] slotSet;
    /** Current parent set of each child (index in ls.masks) and its mask. */
    private final int[] set;
    private int edges;
    /** The largest allowed parent set size over all children. */
    private final int maxSetSize;
    private final long[] mask;
    private final int[] seen;
    private int stamp;
    private final int[] stack;
    private final int[] depth;
    /** The layering's work stack: a node may wait on it once per child, so it grows when needed. */
    private int[] work;
    /** Children of every node as bitsets over the nodes, kept up to date by {@link #setMask}: n²/8 bytes. */
    private final long[][] children;
    /** The children whose masks changed since {@link #clearDirty} (each once), for {@link #relayer}. */
    private final int[] dirty;
    private final int[] dirtyMark;
    private int dirtyStamp = 1;
    private int dirtyCount;
    /** {@link #relayer}'s work queue (circular, each node at most once: {@code queued}) and its changed marks. */
    private final int[] queue;
    private final boolean[] queued;
    private final int[] movedMark;
    private int movedStamp;

    PartitionDag(LocalScores ls, int[] sets) {
        this.ls = ls;
        this.n = ls.variableCount();
        slotMask = new long[n][];
        slotSet = new int[n][];
        for (int i = 0; i < n; i++) {
            long[] masks = ls.masks(i);
            int cap = slots(masks.length);
            slotMask[i] = new long[cap];
            slotSet[i] = new int[cap];
            Arrays.fill(slotMask[i], -1L);
            for (int s = 0; s < masks.length; s++) {
                int h = slot(masks[s], cap);
                while (slotMask[i][h] != -1L) {
                    h = (h + 1) & (cap - 1);
                }
                slotMask[i][h] = masks[s];
                slotSet[i][h] = s;
            }
        }
        int largest = 0;
        for (int i = 0; i < n; i++) {
            for (long mk : ls.masks(i)) {
                largest = Math.max(largest, Long.bitCount(mk));
            }
        }
        maxSetSize = largest;
        set = sets.clone();
        mask = new long[n];
        for (int i = 0; i < n; i++) {
            mask[i] = ls.masks(i)[set[i]];
            edges += Long.bitCount(mask[i]);
        }
        seen = new int[n];
        stack = new int[n];
        depth = new int[n];
        work = new int[2 * n + 2];
        children = new long[n][(n + 63) >>> 6];
        for (int i = 0; i < n; i++) {
            link(i, mask[i], true);
        }
        dirty = new int[n];
        dirtyMark = new int[n];
        queue = new int[n];
        queued = new boolean[n];
        movedMark = new int[n];
    }

    /** Slots of the set index of a child with {@code sets} allowed sets: a power of two, load ≤ 1/2. */
    static int slots(int sets) {
        return Integer.highestOneBit(Math.max(2, sets) * 2 - 1) * 2;
    }

    private static int slot(long m, int cap) {
        long h = m * 0x9E3779B97F4A7C15L;
        return (int) (h >>> 40) & (cap - 1);
    }

    /** Index of the allowed parent set {@code m} of {@code child} in {@code ls.masks(child)}, or −1. */
    int setOf(int child, long m) {
        long[] sm = slotMask[child];
        int cap = sm.length;
        for (int h = slot(m, cap); ; h = (h + 1) & (cap - 1)) {
            if (sm[h] == m) {
                return slotSet[child][h];
            }
            if (sm[h] == -1L) {
                return -1;
            }
        }
    }

    int set(int child) {
        return set[child];
    }

    long mask(int child) {
        return mask[child];
    }

    void setParents(int child, int s) {
        set[child] = s;
        setMask(child, ls.masks(child)[s]);
    }

    /** Sets child's parents to {@code m} without a set index (a temporary state while a move looks at G0). */
    void setMask(int child, long m) {
        if (dirtyMark[child] != dirtyStamp) {
            dirtyMark[child] = dirtyStamp;
            dirty[dirtyCount++] = child;
        }
        edges += Long.bitCount(m) - Long.bitCount(mask[child]);
        link(child, mask[child] & ~m, false);
        link(child, m & ~mask[child], true);
        mask[child] = m;
    }

    /** Forgets which masks changed: {@link #relayer} will look at the changes made from now on. */
    void clearDirty() {
        dirtyStamp++;
        dirtyCount = 0;
    }

    /**
     * Brings {@code el} from the layering of G before the changes since {@link #clearDirty} to the
     * layering of G now — the same array {@link #layers} fills, by propagation from the changed
     * children instead of over all n nodes: a node is re-evaluated (longest path = 1 + its parents'
     * largest) when its parents changed or a parent's layer moved, and its children are queued when
     * its own layer moves. On a DAG the equations have one solution, which every node meets once no
     * node is queued. Writes the nodes whose layer was rewritten (each once; a node may end where it
     * began) to {@code moved} and returns their number. O(touched · (n/64 + in-degree)).
     */
    int relayer(int[] el, int[] moved) {
        int head = 0;
        int tail = 0;
        int pending = 0;
        for (int k = 0; k < dirtyCount; k++) {
            int v = dirty[k];
            if (!queued[v]) {
                queued[v] = true;
                queue[tail] = v;
                tail = tail + 1 == n ? 0 : tail + 1;
                pending++;
            }
        }
        movedStamp++;
        int count = 0;
        while (pending > 0) {
            int x = queue[head];
            head = head + 1 == n ? 0 : head + 1;
            pending--;
            queued[x] = false;
            int[] cand = ls.candidates(x);
            int d = 0;
            for (long r = mask[x]; r != 0; r &= r - 1) {
                d = Math.max(d, el[cand[Long.numberOfTrailingZeros(r)]] + 1);
            }
            if (d == el[x]) {
                continue;
            }
            el[x] = d;
            if (movedMark[x] != movedStamp) {
                movedMark[x] = movedStamp;
                moved[count++] = x;
            }
            long[] cs = children[x];
            for (int w = 0; w < cs.length; w++) {
                for (long r = cs[w]; r != 0; r &= r - 1) {
                    int c = (w << 6) + Long.numberOfTrailingZeros(r);
                    if (!queued[c]) {
                        queued[c] = true;
                        queue[tail] = c;
                        tail = tail + 1 == n ? 0 : tail + 1;
                        pending++;
                    }
                }
            }
        }
        return count;
    }

    /** Adds (or removes) {@code child} to the children of the candidates in {@code m}. */
    private void link(int child, long m, boolean add) {
        int[] cand = ls.candidates(child);
        int word = child >>> 6;
        long bit = 1L << child;
        for (long r = m; r != 0; r &= r - 1) {
            long[] c = children[cand[Long.numberOfTrailingZeros(r)]];
            c[word] = add ? c[word] | bit : c[word] & ~bit;
        }
    }

    /** Number of edges of G (kept up to date by every change of a mask). */
    int edgeCount() {
        return edges;
    }

    /**
     * An edge of G drawn uniformly, as {@code child << 32 | candidate position}, or −1 when G has
     * none: by rejection — a child uniformly and a slot below the largest set size D uniformly,
     * kept when the child has that many parents — so each edge has probability 1/(n·D) per trial.
     */
    long randomEdge(java.util.SplittableRandom rng) {
        if (maxSetSize == 0 || edgeCount() == 0) {
            return -1;
        }
        while (true) {
            int i = rng.nextInt(n);
            int r = rng.nextInt(maxSetSize);
            long mk = mask[i];
            if (r < Long.bitCount(mk)) {
                for (int t = 0; t < r; t++) {
                    mk &= mk - 1;
                }
                return (long) i << 32 | Long.numberOfTrailingZeros(mk);
            }
        }
    }

    /** The current sets (a copy). */
    int[] sets() {
        return set.clone();
    }

    /**
     * Whether {@code target} is an ancestor of {@code from} (or equal to it), ignoring the edge
     * {@code skipParent → skipChild} (−1: none). Walks up parents depth first, pruning every node
     * whose element is not after the target's: an ancestor's longest path from a source is shorter.
     */
    boolean reaches(int target, int from, int skipParent, int skipChild, int[] element) {
        if (from == target) {
            return true;
        }
        int floor = element[target];
        stamp++;
        int top = 0;
        stack[top++] = from;
        seen[from] = stamp;
        while (top > 0) {
            int x = stack[--top];
            int[] cand = ls.candidates(x);
            for (long r = mask[x]; r != 0; r &= r - 1) {
                int p = cand[Long.numberOfTrailingZeros(r)];
                if (x == skipChild && p == skipParent) {
                    continue;
                }
                if (p == target) {
                    return true;
                }
                if (seen[p] != stamp && element[p] > floor) {
                    seen[p] = stamp;
                    stack[top++] = p;
                }
            }
        }
        return false;
    }

    /**
     * Marks the descendants of {@code root} in G (root included) and returns the mark: afterwards
     * {@code isMarked(v, mark)} tells whether v is one. O(descendants · n/64).
     */
    int markDescendants(int root) {
        stamp++;
        int top = 0;
        stack[top++] = root;
        seen[root] = stamp;
        while (top > 0) {
            long[] cs = children[stack[--top]];
            for (int w = 0; w < cs.length; w++) {
                for (long r = cs[w]; r != 0; r &= r - 1) {
                    int c = (w << 6) + Long.numberOfTrailingZeros(r);
                    if (seen[c] != stamp) {
                        seen[c] = stamp;
                        stack[top++] = c;
                    }
                }
            }
        }
        return stamp;
    }

    /**
     * For a block of nodes whose parents are all removed (masks 0): {@code reach[x]} gets bit p set
     * for every node x reachable from {@code block[p]} (x ≠ block[p]); the other entries are cleared.
     * No path passes through another block node (they have no parents). O(m · reached · n/64).
     */
    void reachFrom(int[] block, int m, int[] reach) {
        java.util.Arrays.fill(reach, 0);
        for (int p = 0; p < m; p++) {
            int bit = 1 << p;
            int top = 0;
            stack[top++] = block[p];
            while (top > 0) {
                long[] cs = children[stack[--top]];
                for (int w = 0; w < cs.length; w++) {
                    for (long r = cs[w]; r != 0; r &= r - 1) {
                        int c = (w << 6) + Long.numberOfTrailingZeros(r);
                        if ((reach[c] & bit) == 0) {
                            reach[c] |= bit;
                            stack[top++] = c;
                        }
                    }
                }
            }
        }
    }

    boolean isMarked(int v, int mark) {
        return seen[v] == mark;
    }

    /** Mask over {@code child}'s candidates of those marked by {@code mark}. */
    long markedCandidates(int child, int mark) {
        int[] cand = ls.candidates(child);
        long m = 0;
        for (int k = 0; k < cand.length; k++) {
            if (seen[cand[k]] == mark) {
                m |= 1L << k;
            }
        }
        return m;
    }

    /**
     * The partition of G: {@code out[v]} = the number of edges on the longest path from a source to
     * v (0 for the sources); returns the number of elements. O(n + edges), iterative.
     */
    int layers(int[] out) {
        Arrays.fill(depth, -1);
        int m = 0;
        for (int v = 0; v < n; v++) {
            if (depth[v] < 0) {
                m = Math.max(m, settle(v) + 1);
            }
        }
        System.arraycopy(depth, 0, out, 0, n);
        return m;
    }

    /** depth[v] by an explicit stack: a node is settled once all its parents are. */
    private int settle(int root) {
        int top = 0;
        work[top++] = root;
        while (top > 0) {
            int x = work[top - 1];
            int[] cand = ls.candidates(x);
            int d = 0;
            boolean ready = true;
            for (long r = mask[x]; r != 0; r &= r - 1) {
                int p = cand[Long.numberOfTrailingZeros(r)];
                if (depth[p] < 0) {
                    ready = false;
                    if (top == work.length) {
                        work = Arrays.copyOf(work, 2 * work.length);
                    }
                    work[top++] = p;
                } else {
                    d = Math.max(d, depth[p] + 1);
                }
            }
            if (ready) {
                depth[x] = d;
                top--;
            }
        }
        return depth[root];
    }
}
