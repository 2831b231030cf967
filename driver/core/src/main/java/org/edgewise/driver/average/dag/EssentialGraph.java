package org.edgewise.driver.average.dag;

/**
 * The essential graph (CPDAG) of a DAG: its skeleton, with an edge directed when every
 * Markov-equivalent DAG (same skeleton and v-structures; Verma &amp; Pearl 1990) orients it alike
 * ("compelled", Chickering 1995; Andersson, Madigan &amp; Perlman 1997) and undirected otherwise.
 * Built as Meek (1995) prescribes: the v-structures a → b ← c (a, c non-adjacent) directed, then
 * rules R1–R3 applied until nothing changes (R4 is needed only with background knowledge):
 * <ul>
 *   <li>R1: a → b, b — c, a and c non-adjacent: b → c;</li>
 *   <li>R2: a → b → c and a — c: a → c;</li>
 *   <li>R3: a — b, a — c, a — d, c → b, d → b, c and d non-adjacent: a → b.</li>
 * </ul>
 * Every rule orients an edge as the DAG does (the DAG is one member of the class).
 *
 * <p>A DAG is given as the parent bitmask of each node (n ≤ 31); the essential graph is returned
 * as {@code compelled[v]} = the bitmask of the parents u of v with u → v compelled. The
 * reversible edges are the rest of the skeleton. Memory: two ints per node.
 */
public final class EssentialGraph {
    private EssentialGraph() {
    }

    /** Per node v, the parents u whose edge u → v is compelled. */
    public static int[] compelled(int[] parents) {
        int n = parents.length;
        int[] adj = new int[n];
        for (int v = 0; v < n; v++) {
            adj[v] |= parents[v];
            for (int rest = parents[v]; rest != 0; rest &= rest - 1) {
                adj[Integer.numberOfTrailingZeros(rest)] |= 1 << v;
            }
        }
        int[] dir = new int[n]; // dir[v]: u with u -> v directed so far
        for (int b = 0; b < n; b++) {
            for (int ra = parents[b]; ra != 0; ra &= ra - 1) {
                int a = Integer.numberOfTrailingZeros(ra);
                if ((parents[b] & ~adj[a] & ~(1 << a)) != 0) {
                    dir[b] |= 1 << a; // a -> b <- c with c not adjacent to a
                }
            }
        }
        boolean changed = true;
        while (changed) {
            changed = false;
            for (int c = 0; c < n; c++) {
                // undirected edges b - c still undirected, oriented as the DAG: b -> c
                for (int rb = parents[c] & ~dir[c]; rb != 0; rb &= rb - 1) {
                    int b = Integer.numberOfTrailingZeros(rb);
                    if (r1(b, c, adj, dir) || r2(b, c, adj, dir) || r3(b, c, adj, dir, parents)) {
                        dir[c] |= 1 << b;
                        changed = true;
                    }
                }
            }
        }
        return dir;
    }

    /** R1 for b → c: some a → b with a not adjacent to c. */
    private static boolean r1(int b, int c, int[] adj, int[] dir) {
        return (dir[b] & ~adj[c] & ~(1 << c)) != 0;
    }

    /** R2 for b → c: some a with b → a → c directed. */
    private static boolean r2(int b, int c, int[] adj, int[] dir) {
        for (int ra = dir[c]; ra != 0; ra &= ra - 1) {
            int a = Integer.numberOfTrailingZeros(ra);
            if ((dir[a] >> b & 1) != 0) {
                return true;
            }
        }
        return false;
    }

    /** R3 for b → c (rule's a = b, b = c): two non-adjacent x, y with b — x, b — y undirected and x → c, y → c. */
    private static boolean r3(int b, int c, int[] adj, int[] dir, int[] parents) {
        int undirectedOfB = 0;
        for (int rest = adj[b]; rest != 0; rest &= rest - 1) {
            int x = Integer.numberOfTrailingZeros(rest);
            if ((dir[b] >> x & 1) == 0 && (dir[x] >> b & 1) == 0) {
                undirectedOfB |= 1 << x;
            }
        }
        int cand = undirectedOfB & dir[c];
        for (int rx = cand; rx != 0; rx &= rx - 1) {
            int x = Integer.numberOfTrailingZeros(rx);
            if ((cand & ~adj[x] & ~(1 << x)) != 0) {
                return true;
            }
        }
        return false;
    }
}
