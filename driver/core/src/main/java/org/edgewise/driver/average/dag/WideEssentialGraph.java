package org.edgewise.driver.average.dag;

/**
 * {@link EssentialGraph} for any number of variables: the same construction (v-structures, then
 * Meek's rules R1–R3 until nothing changes), node sets as multi-word bitsets ({@code long[]}, one
 * bit per variable) instead of one {@code int}. Input: per node its parents (any order); output:
 * per node the parents whose edge into it is compelled, ascending. Memory while running: three
 * n × ⌈n/64⌉ word tables.
 */
public final class WideEssentialGraph {
    private WideEssentialGraph() {
    }

    /** Per node v, the parents u whose edge u → v is compelled, ascending. */
    public static int[][] compelled(int[][] parents) {
        int n = parents.length;
        int words = (n + 63) >>> 6;
        long[][] pa = new long[n][words];
        long[][] adj = new long[n][words];
        for (int v = 0; v < n; v++) {
            for (int u : parents[v]) {
                set(pa[v], u);
                set(adj[v], u);
                set(adj[u], v);
            }
        }
        long[][] dir = new long[n][words]; // dir[v]: u with u -> v directed so far
        for (int b = 0; b < n; b++) {
            for (int a : parents[b]) {
                // a -> b <- c with c not adjacent to a (c != a)
                for (int c : parents[b]) {
                    if (c != a && !get(adj[a], c)) {
                        set(dir[b], a);
                        break;
                    }
                }
            }
        }
        boolean changed = true;
        while (changed) {
            changed = false;
            for (int c = 0; c < n; c++) {
                for (int b : parents[c]) {
                    if (!get(dir[c], b) && (r1(b, c, adj, dir, words) || r2(b, c, dir, words) || r3(b, c, adj, dir, words))) {
                        set(dir[c], b);
                        changed = true;
                    }
                }
            }
        }
        int[][] out = new int[n][];
        for (int v = 0; v < n; v++) {
            int m = 0;
            int[] l = new int[parents[v].length];
            for (int u = 0; u < n; u++) {
                if (get(dir[v], u)) {
                    l[m++] = u;
                }
            }
            out[v] = java.util.Arrays.copyOf(l, m);
        }
        return out;
    }

    /** R1 for b → c: some a → b with a not adjacent to c (a ≠ c). */
    private static boolean r1(int b, int c, long[][] adj, long[][] dir, int words) {
        for (int w = 0; w < words; w++) {
            long x = dir[b][w] & ~adj[c][w];
            if (w == c >>> 6) {
                x &= ~(1L << c);
            }
            if (x != 0) {
                return true;
            }
        }
        return false;
    }

    /** R2 for b → c: some a with b → a → c directed. */
    private static boolean r2(int b, int c, long[][] dir, int words) {
        for (int w = 0; w < words; w++) {
            for (long rest = dir[c][w]; rest != 0; rest &= rest - 1) {
                int a = (w << 6) + Long.numberOfTrailingZeros(rest);
                if (get(dir[a], b)) {
                    return true;
                }
            }
        }
        return false;
    }

    /** R3 for b → c: two non-adjacent x, y with b — x, b — y undirected and x → c, y → c. */
    private static boolean r3(int b, int c, long[][] adj, long[][] dir, int words) {
        long[] cand = new long[words];
        for (int w = 0; w < words; w++) {
            for (long rest = adj[b][w]; rest != 0; rest &= rest - 1) {
                int x = (w << 6) + Long.numberOfTrailingZeros(rest);
                if (!get(dir[b], x) && !get(dir[x], b) && get(dir[c], x)) {
                    set(cand, x);
                }
            }
        }
        for (int w = 0; w < words; w++) {
            for (long rest = cand[w]; rest != 0; rest &= rest - 1) {
                int x = (w << 6) + Long.numberOfTrailingZeros(rest);
                for (int v = 0; v < words; v++) {
                    long y = cand[v] & ~adj[x][v];
                    if (v == x >>> 6) {
                        y &= ~(1L << x);
                    }
                    if (y != 0) {
                        return true;
                    }
                }
            }
        }
        return false;
    }

    static void set(long[] bits, int i) {
        bits[i >>> 6] |= 1L << i;
    }

    static boolean get(long[] bits, int i) {
        return (bits[i >>> 6] >>> i & 1L) != 0;
    }
}
