package org.edgewise.driver.report;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.UserError;
import org.edgewise.driver.result.EdgeResult;

/**
 * What the consensus graph (HTML and DOT) draws for every unordered pair {a, b}: only what the
 * result can support.
 *
 * <ul>
 * <li>With essential-graph posteriors ({@code essentialGraph}; Chickering 1995, Andersson,
 *     Madigan &amp; Perlman 1997): an <b>arrow</b> a → b when P(a → b compelled) &gt; t (compelled:
 *     oriented alike in every DAG of the Markov equivalence class, so the data and the in-degree
 *     bound, not the prior's tilt, fix it); otherwise a <b>line</b> when P(adjacent) &gt; t —
 *     dependent, but the direction is mostly reversible (or split).</li>
 * <li>Without them (unknown orders): a line when P(adjacent) = P(a → b) + P(b → a) &gt; t (the two
 *     events are disjoint for a DAG, so the sum is the adjacency posterior); directions are
 *     <i>not assessed</i>. The DAG-edge posteriors P(a → b) of an unknown-order result mix
 *     compelled and reversible directions and depend on the DAG prior (DESIGN.md).</li>
 * <li>With tiers, a pair in two different tiers: an <b>arrow</b> from the earlier tier when
 *     P(adjacent) &gt; t — the tiers forbid the other direction, so every network that joins the
 *     pair orients it alike (labelled as fixed by the tiers, not by the data).</li>
 * <li>Given an order ({@code method} {@code order}): an arrow a → b when P(a → b | order) &gt; t,
 *     its direction taken from the order — an assumption the user stated, not learned.</li>
 * </ul>
 * Memory: O(n²) for the pair table.
 *
 * @param matrix     the result's edge posteriors
 * @param grid       the pair {a, b} at {@code grid[a][b]}, a &lt; b ({@link #pair} in either order)
 * @param assessed   whether directions were assessed by essential-graph posteriors
 * @param givenOrder whether the result was computed for a given order (directions then come from the order)
 * @param tier       each variable's tier (0 first) when the result has tiers, -1 for a variable in none; null without tiers
 */
public record ConsensusEdges(EdgeMatrix matrix, Pair[][] grid, boolean assessed, boolean givenOrder, int[] tier) {
    /** How a pair is drawn. */
    public enum Shape { ARROW, LINE }

    /**
     * Posteriors of one unordered pair (a &lt; b in the result's variable order). Without an
     * essential graph {@code aToB}, {@code bToA} and {@code undirected} are NaN (not assessed).
     */
    public record Pair(int a, int b, double adjacent, double aToB, double bToA, double undirected, Double mcse) {
        public boolean assessed() {
            return !Double.isNaN(aToB);
        }
    }

    /**
     * One drawn pair: from → to for an arrow (for a line, the orientation used only for layout); {@code p}
     * labels it; {@code byTiers}: an arrow whose direction the tiers fix (the two are in different tiers).
     */
    public record Drawn(int from, int to, Shape shape, double p, Pair pair, boolean byTiers) {
    }

    /** Whether the tiers fix the direction of a → b (a in an earlier tier than b). */
    public boolean tierFixes(int a, int b) {
        return tier != null && tier[a] >= 0 && tier[b] >= 0 && tier[a] < tier[b];
    }

    /** The pairs of {@code r}; a malformed {@code essentialGraph} entry is the user's (the result file's) mistake. */
    public static ConsensusEdges of(EdgeResult r, EdgeMatrix m) {
        int n = m.size();
        Pair[][] pairs = new Pair[n][n];
        boolean assessed = r.essentialGraph() != null;
        if (assessed) {
            Map<String, Integer> index = new HashMap<>();
            for (int i = 0; i < n; i++) {
                index.put(m.variables().get(i), i);
            }
            for (EdgeResult.EssentialPair e : r.essentialGraph()) {
                Integer a = index.get(e.a());
                Integer b = index.get(e.b());
                if (a == null || b == null || a.equals(b)) {
                    throw new UserError("result has an essentialGraph entry " + e.a() + " - " + e.b()
                            + " that is not a pair of two listed variables");
                }
                for (double v : new double[] {e.adjacent(), e.aToB(), e.bToA(), e.undirected()}) {
                    if (!(v >= 0 && v <= 1 + 1e-9)) {
                        throw new UserError("result has essentialGraph entry " + e.a() + " - " + e.b() + " with " + v
                                + ", not a probability");
                    }
                }
                Pair p = a < b ? new Pair(a, b, cap(e.adjacent()), cap(e.aToB()), cap(e.bToA()), cap(e.undirected()), e.mcse())
                        : new Pair(b, a, cap(e.adjacent()), cap(e.bToA()), cap(e.aToB()), cap(e.undirected()), e.mcse());
                pairs[p.a()][p.b()] = p;
            }
        }
        for (int a = 0; a < n; a++) {
            for (int b = a + 1; b < n; b++) {
                if (pairs[a][b] == null) {
                    // a pair the essential graph does not list was never adjacent in any draw
                    pairs[a][b] = assessed ? new Pair(a, b, 0, 0, 0, 0, null)
                            : new Pair(a, b, m.adjacency(a, b), Double.NaN, Double.NaN, Double.NaN, null);
                }
            }
        }
        int[] tier = null;
        if (r.settings() != null && r.settings().tiers() != null && !r.settings().tiers().isEmpty()) {
            tier = new int[n];
            java.util.Arrays.fill(tier, -1);
            for (int t = 0; t < r.settings().tiers().size(); t++) {
                for (String v : r.settings().tiers().get(t)) {
                    int i = m.variables().indexOf(v);
                    if (i >= 0) {
                        tier[i] = t;
                    }
                }
            }
        }
        return new ConsensusEdges(m, pairs, assessed, "order".equals(r.method()), tier);
    }

    private static double cap(double p) {
        return Math.min(1, p);
    }

    public Pair pair(int a, int b) {
        return a < b ? grid[a][b] : grid[b][a];
    }

    /** Every unordered pair, a &lt; b. */
    public List<Pair> pairs() {
        List<Pair> out = new ArrayList<>();
        for (int a = 0; a < matrix.size(); a++) {
            for (int b = a + 1; b < matrix.size(); b++) {
                out.add(grid[a][b]);
            }
        }
        return out;
    }

    /** The pairs drawn at threshold {@code t}, by the rules of the class comment. */
    public List<Drawn> drawn(double t) {
        List<Drawn> out = new ArrayList<>();
        double[][] p = matrix.p();
        for (Pair x : pairs()) {
            int a = x.a();
            int b = x.b();
            if (givenOrder) {
                if (p[a][b] > t) {
                    out.add(new Drawn(a, b, Shape.ARROW, p[a][b], x, false));
                }
                if (p[b][a] > t) {
                    out.add(new Drawn(b, a, Shape.ARROW, p[b][a], x, false));
                }
            } else if ((tierFixes(a, b) || tierFixes(b, a)) && x.adjacent() > t) {
                // the tiers forbid the other direction: every network joining the pair orients it alike
                boolean ab = tierFixes(a, b);
                out.add(new Drawn(ab ? a : b, ab ? b : a, Shape.ARROW, x.adjacent(), x, true));
            } else if (assessed && x.aToB() > t) {
                out.add(new Drawn(a, b, Shape.ARROW, x.aToB(), x, false));
            } else if (assessed && x.bToA() > t) {
                out.add(new Drawn(b, a, Shape.ARROW, x.bToA(), x, false));
            } else if (x.adjacent() > t) {
                // laid out along the more probable DAG direction; drawn without an arrowhead
                boolean ab = p[a][b] >= p[b][a];
                out.add(new Drawn(ab ? a : b, ab ? b : a, Shape.LINE, x.adjacent(), x, false));
            }
        }
        return out;
    }

    /** {@code g[from][to]} for every drawn pair: the graph the layout layers. */
    public boolean[][] layoutGraph(List<Drawn> drawn) {
        int n = matrix.size();
        boolean[][] g = new boolean[n][n];
        for (Drawn d : drawn) {
            g[d.from()][d.to()] = true;
        }
        return g;
    }

    /** The pair's posteriors for a tooltip or a DOT comment, e.g. "adjacent 0.91; a → b compelled 0.02; …". */
    public String describe(Pair x) {
        String a = matrix.variables().get(x.a());
        String b = matrix.variables().get(x.b());
        if (!x.assessed()) {
            return a + " \u2013 " + b + ": P(adjacent) " + Html.f(x.adjacent(), 3) + " (P(" + a + " \u2192 " + b + ") "
                    + Html.f(matrix.p()[x.a()][x.b()], 3) + " + P(" + b + " \u2192 " + a + ") " + Html.f(matrix.p()[x.b()][x.a()], 3)
                    + "); direction not assessed";
        }
        return a + " \u2013 " + b + ": P(adjacent) " + Html.f(x.adjacent(), 3) + "; compelled " + a + " \u2192 " + b + " "
                + Html.f(x.aToB(), 3) + "; compelled " + b + " \u2192 " + a + " " + Html.f(x.bToA(), 3) + "; reversible "
                + Html.f(x.undirected(), 3) + (x.mcse() != null ? " (MCSE \u2264 " + Html.f(x.mcse(), 4) + ")" : "");
    }
}
