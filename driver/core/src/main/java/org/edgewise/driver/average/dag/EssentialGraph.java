package org.edgewise.driver.average.dag;

/**
 * The essential graph (CPDAG) of a DAG: its skeleton, with an edge directed when every
 * Markov-equivalent DAG (same skeleton and v-structures; Verma &amp; Pearl 1990) orients it alike
 * ("compelled", Chickering 1995; Andersson, Madigan &amp; Perlman 1997) and undirected otherwise.
 * Built as Meek (1995) prescribes: the v-structures a → b ← c (a, c non-adjacent) directed, then
 * rules R1–R4 applied until nothing changes (R4 never fires without background knowledge):
 * <ul>
 *   <li>R1: a → b, b — c, a and c non-adjacent: b → c;</li>
 *   <li>R2: a → b → c and a — c: a → c;</li>
 *   <li>R3: a — b, a — c, a — d, c → b, d → b, c and d non-adjacent: a → b.</li>
 * </ul>
 * Every rule orients an edge as the DAG does (the DAG is one member of the class).
 *
 * <p><b>Background knowledge</b> ({@link #compelled(int[], int[])}): when the DAG was drawn under
 * constraints (tiers, required or forbidden edges), the class is restricted to the Markov-equivalent
 * DAGs that also obey them. Each constraint that fixes the direction of an adjacent pair (an edge
 * between tiers points forward; a required a → b; a forbidden b → a) orients that edge first, and
 * R1–R4 propagate from the pattern plus those edges (Meek 1995, "Causal inference and causal
 * explanation with background knowledge": with consistent knowledge of this kind the rules are
 * sound and complete). R4 is sound whatever the marks on a — c and a — d: were b → a, acyclicity
 * would give d → a and c → a, so c → a ← b would be a v-structure absent from the pattern.
 *
 * <p>Knowledge only of the form "u → v whenever u and v are adjacent" is used. An order constraint
 * also excludes directed paths against it through variables in no tier (for tiers {x} before {y},
 * y → z → x is excluded with z free); directions fixed only by such paths stay reversible here:
 * every reported direction is compelled in the restricted class, but that class may fix a few more.
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
        return compelled(parents, null);
    }

    /**
     * Per node v, the parents u whose edge u → v is compelled among the Markov-equivalent DAGs that
     * obey the background knowledge.
     *
     * @param fixed per node v, the bitmask of the nodes u such that, when u and v are adjacent, the
     *              edge must be u → v (or null: no knowledge). An entry the DAG itself breaks is
     *              ignored (the DAG was not drawn under that knowledge).
     */
    public static int[] compelled(int[] parents, int[] fixed) {
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
            if (fixed != null) {
                dir[b] |= parents[b] & fixed[b]; // a -> b fixed by the knowledge
            }
        }
        boolean changed = true;
        while (changed) {
            changed = false;
            for (int c = 0; c < n; c++) {
                // undirected edges b - c still undirected, oriented as the DAG: b -> c
                for (int rb = parents[c] & ~dir[c]; rb != 0; rb &= rb - 1) {
                    int b = Integer.numberOfTrailingZeros(rb);
                    if (r1(b, c, adj, dir) || r2(b, c, adj, dir) || r3(b, c, adj, dir, parents)
                            || r4(b, c, adj, dir)) {
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

    /** R4 for b → c (rule's a = b, b = c): some x → y → c directed with x, y adjacent to b and x not adjacent to c. */
    private static boolean r4(int b, int c, int[] adj, int[] dir) {
        for (int ry = dir[c] & adj[b]; ry != 0; ry &= ry - 1) {
            int y = Integer.numberOfTrailingZeros(ry);
            if ((dir[y] & adj[b] & ~adj[c] & ~(1 << c)) != 0) {
                return true;
            }
        }
        return false;
    }
}
