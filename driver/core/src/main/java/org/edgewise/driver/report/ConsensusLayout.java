package org.edgewise.driver.report;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Where the consensus graph's variables and edges go in a drawing: a most probable order,
 * layers, positions within layers, and a route for every edge.
 *
 * <p>Order: the result's own order when it was computed for a given order; otherwise a greedy
 * topological order of the consensus graph that, among the variables without a consensus parent
 * still unplaced, places first the one with the least incoming posterior mass
 * Σ_{u unplaced} P(u → v) — the variable least likely to have a parent among the rest. When the
 * consensus graph has a directed cycle (possible for three or more variables) the same rule
 * picks among all unplaced variables, and the edges against the order are drawn as arcs.
 *
 * <p>Layer of v: 0 without a consensus parent earlier in the order, else one more than the
 * deepest such parent. Layered drawing after Sugiyama, Tagawa &amp; Toda (1981, IEEE SMC 11):
 * an edge spanning several layers passes through a narrow virtual slot in each layer between,
 * and slots are ordered within layers by the barycentre heuristic, four down-and-up sweeps.
 * Memory: O(n² · layers) in the worst case of long edges.
 */
public final class ConsensusLayout {
    static final double SLOT = 170;
    static final double VIRTUAL = 34;
    static final double LAYER = 110;
    static final double BOX_W = 150;
    static final double BOX_H = 34;
    static final double MARGIN = 20;
    /** Room on the left of a layered drawing for the tiers' names. */
    static final double TIER_LABEL = 60;
    /** Free layout: the widest a row of components grows before the next row starts. */
    static final double ROW_WIDTH = 1100;

    private final int[] order;
    private final int[] layer;
    private final double[] x;
    private final double[] y;
    private final double width;
    private final double height;
    private final Map<Long, double[][]> routes = new HashMap<>();
    private final int n;
    /** Free layout (components placed by forces): edges are straight, nothing is layered. */
    private boolean free;
    /** Each variable's box width. */
    private double[] boxW;
    /** Free layout: where the row of variables joined to no other starts (NaN: none). */
    private double aloneY = Double.NaN;
    /** Layered by tiers: each layer's name (null otherwise). */
    private List<String> layerNames;

    private ConsensusLayout(int n, int[] order, int[] layer, double[] x, double[] y, double width, double height) {
        this.n = n;
        this.order = order;
        this.layer = layer;
        this.x = x;
        this.y = y;
        this.width = width;
        this.height = height;
    }

    /**
     * @param m          the edge posteriors
     * @param g          the consensus graph (defines order and layers)
     * @param drawn      every edge that will be drawn (g plus, e.g., known edges below the threshold)
     * @param givenOrder the result's order, or null
     */
    public static ConsensusLayout of(EdgeMatrix m, boolean[][] g, boolean[][] drawn, List<String> givenOrder) {
        int n = m.size();
        int[] order = givenOrder != null && givenOrder.size() == n && m.variables().containsAll(givenOrder)
                ? givenOrder.stream().mapToInt(v -> m.variables().indexOf(v)).toArray()
                : greedyOrder(m, g);
        int[] pos = new int[n];
        for (int i = 0; i < n; i++) {
            pos[order[i]] = i;
        }
        int[] layer = new int[n];
        for (int v : order) {
            int l = 0;
            for (int u = 0; u < n; u++) {
                if (g[u][v] && pos[u] < pos[v]) {
                    l = Math.max(l, layer[u] + 1);
                }
            }
            layer[v] = l;
        }
        return layered(n, order, layer, drawn);
    }

    /**
     * The layout the report draws: layered down the given order when there is one (its arrows follow
     * it); one row per tier when the result has tiers (earlier tiers above; variables in no tier in a
     * last row), so a line between two tiers runs the way the tiers allow; otherwise every connected
     * component of the drawn graph placed on its own by forces ({@link #free}), because a layered
     * top-down drawing would make undirected lines look causal.
     */
    public static ConsensusLayout of(EdgeMatrix m, boolean[][] g, boolean[][] drawn, List<String> givenOrder,
                                     List<List<String>> tiers) {
        int n = m.size();
        if (givenOrder != null && !givenOrder.isEmpty()) {
            return of(m, g, drawn, givenOrder);
        }
        if (tiers == null || tiers.isEmpty()) {
            return free(m, drawn);
        }
        int[] layer = new int[n];
        Arrays.fill(layer, tiers.size());
        for (int t = 0; t < tiers.size(); t++) {
            for (String v : tiers.get(t)) {
                int i = m.variables().indexOf(v);
                if (i >= 0) {
                    layer[i] = t;
                }
            }
        }
        int[] greedy = greedyOrder(m, g);
        Integer[] ord = new Integer[n];
        int[] rank = new int[n];
        for (int i = 0; i < n; i++) {
            ord[i] = greedy[i];
            rank[greedy[i]] = i;
        }
        Arrays.sort(ord, (p, q) -> layer[p] != layer[q] ? Integer.compare(layer[p], layer[q]) : Integer.compare(rank[p], rank[q]));
        int[] order = Arrays.stream(ord).mapToInt(Integer::intValue).toArray();
        ConsensusLayout lay = layered(n, order, layer, drawn);
        List<String> names = new ArrayList<>();
        boolean rest = false;
        for (int v = 0; v < n; v++) {
            rest |= layer[v] == tiers.size();
        }
        for (int t = 0; t < tiers.size() + (rest ? 1 : 0); t++) {
            names.add(t < tiers.size() ? "tier " + (t + 1) : "no tier");
        }
        lay.layerNames = names;
        return lay;
    }

    /** Layered drawing of {@code order} with the layers given (Sugiyama et al.; the class comment). */
    private static ConsensusLayout layered(int n, int[] order, int[] layer, boolean[][] drawn) {
        int layers = 1;
        for (int v = 0; v < n; v++) {
            layers = Math.max(layers, layer[v] + 1);
        }
        // items: 0..n-1 the variables, then virtual slots of long edges
        List<Integer> itemLayer = new ArrayList<>();
        List<List<Integer>> up = new ArrayList<>();
        List<List<Integer>> down = new ArrayList<>();
        for (int v = 0; v < n; v++) {
            itemLayer.add(layer[v]);
            up.add(new ArrayList<>());
            down.add(new ArrayList<>());
        }
        Map<Long, int[]> chains = new HashMap<>();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (!drawn[a][b] || layer[b] <= layer[a]) {
                    continue;
                }
                int prev = a;
                int[] chain = new int[layer[b] - layer[a] - 1];
                for (int l = layer[a] + 1; l < layer[b]; l++) {
                    int d = itemLayer.size();
                    itemLayer.add(l);
                    up.add(new ArrayList<>());
                    down.add(new ArrayList<>());
                    chain[l - layer[a] - 1] = d;
                    up.get(d).add(prev);
                    down.get(prev).add(d);
                    prev = d;
                }
                up.get(b).add(prev);
                down.get(prev).add(b);
                chains.put((long) a * n + b, chain);
            }
        }
        int items = itemLayer.size();
        List<List<Integer>> rows = new ArrayList<>();
        for (int l = 0; l < layers; l++) {
            rows.add(new ArrayList<>());
        }
        for (int v : order) {
            rows.get(layer[v]).add(v);
        }
        for (int d = n; d < items; d++) {
            rows.get(itemLayer.get(d)).add(d);
        }
        double[] rank = new double[items];
        renumber(rows, rank);
        for (int sweep = 0; sweep < 4; sweep++) {
            for (int l = 1; l < layers; l++) {
                sortByBarycentre(rows.get(l), up, rank);
                renumber(rows, rank);
            }
            for (int l = layers - 2; l >= 0; l--) {
                sortByBarycentre(rows.get(l), down, rank);
                renumber(rows, rank);
            }
        }
        double[] rowWidth = new double[layers];
        double widest = 0;
        for (int l = 0; l < layers; l++) {
            for (int it : rows.get(l)) {
                rowWidth[l] += it < n ? SLOT : VIRTUAL;
            }
            widest = Math.max(widest, rowWidth[l]);
        }
        double width = Math.max(widest + 2 * MARGIN + 60 + TIER_LABEL, 420);
        double[] ix = new double[items];
        double[] iy = new double[items];
        for (int l = 0; l < layers; l++) {
            double cursor = TIER_LABEL + (width - TIER_LABEL - rowWidth[l]) / 2;
            for (int it : rows.get(l)) {
                double w = it < n ? SLOT : VIRTUAL;
                ix[it] = cursor + w / 2;
                iy[it] = MARGIN + l * LAYER + BOX_H / 2 + 10;
                cursor += w;
            }
        }
        ConsensusLayout lay = new ConsensusLayout(n, order, layer, Arrays.copyOf(ix, n), Arrays.copyOf(iy, n),
                width, (layers - 1) * LAYER + BOX_H + 10 + 2 * MARGIN + 50);
        for (Map.Entry<Long, int[]> e : chains.entrySet()) {
            int a = (int) (e.getKey() / n);
            int b = (int) (e.getKey() % n);
            int[] chain = e.getValue();
            double[][] pts = new double[chain.length + 2][];
            pts[0] = new double[] {ix[a], iy[a] + BOX_H / 2};
            for (int i = 0; i < chain.length; i++) {
                pts[i + 1] = new double[] {ix[chain[i]], iy[chain[i]]};
            }
            pts[chain.length + 1] = new double[] {ix[b], iy[b] - BOX_H / 2};
            lay.routes.put(e.getKey(), pts);
        }
        return lay;
    }

    /**
     * Every connected component of {@code drawn} (either direction) laid out on its own by the
     * force-directed placement of Fruchterman &amp; Reingold (1991, Software — Practice and Experience
     * 21(11)): pairs repel with k²/d, joined pairs attract with d²/k, every variable is pulled towards
     * the centre in proportion to its distance (so long chains fold), the moves cooled linearly over
     * {@value #FORCE_STEPS} steps from a circle in the component's order; computed with x divided by the
     * boxes' aspect, so that wide boxes space out like square ones, then overlapping boxes pushed apart.
     * Components are packed into rows, the largest first; variables joined to no other go in a last
     * row. Deterministic (no random start). Time O(k² · steps) per component of k variables.
     */
    static ConsensusLayout free(EdgeMatrix m, boolean[][] drawn) {
        int n = m.size();
        double[] bw = new double[n];
        for (int v = 0; v < n; v++) {
            bw[v] = fitted(m.variables().get(v).length());
        }
        int[] comp = new int[n];
        Arrays.fill(comp, -1);
        List<List<Integer>> comps = new ArrayList<>();
        List<Integer> alone = new ArrayList<>();
        for (int s = 0; s < n; s++) {
            if (comp[s] >= 0) {
                continue;
            }
            List<Integer> c = new ArrayList<>();
            java.util.ArrayDeque<Integer> queue = new java.util.ArrayDeque<>();
            queue.add(s);
            comp[s] = comps.size();
            while (!queue.isEmpty()) {
                int v = queue.poll();
                c.add(v);
                for (int u = 0; u < n; u++) {
                    if (comp[u] < 0 && (drawn[v][u] || drawn[u][v])) {
                        comp[u] = comp[s];
                        queue.add(u);
                    }
                }
            }
            if (c.size() == 1) {
                alone.add(s);
                comp[s] = Integer.MAX_VALUE;
            } else {
                comps.add(c);
            }
        }
        comps.sort((p, q) -> q.size() - p.size());
        double[] x = new double[n];
        double[] y = new double[n];
        List<Integer> order = new ArrayList<>();
        double rowX = MARGIN;
        double rowY = MARGIN;
        double rowH = 0;
        double right = 0;
        for (List<Integer> c : comps) {
            double[][] p = forces(c, drawn, bw);
            double minX = Double.POSITIVE_INFINITY;
            double minY = Double.POSITIVE_INFINITY;
            double maxX = Double.NEGATIVE_INFINITY;
            double maxY = Double.NEGATIVE_INFINITY;
            for (int i = 0; i < c.size(); i++) {
                double[] q = p[i];
                minX = Math.min(minX, q[0] - bw[c.get(i)] / 2);
                maxX = Math.max(maxX, q[0] + bw[c.get(i)] / 2);
                minY = Math.min(minY, q[1]);
                maxY = Math.max(maxY, q[1]);
            }
            double w = maxX - minX + 40;
            double h = maxY - minY + BOX_H + 40;
            if (rowX > MARGIN && rowX + w > ROW_WIDTH) {
                rowX = MARGIN;
                rowY += rowH;
                rowH = 0;
            }
            for (int i = 0; i < c.size(); i++) {
                int v = c.get(i);
                x[v] = rowX + 20 + p[i][0] - minX;
                y[v] = rowY + 20 + BOX_H / 2 + p[i][1] - minY;
                order.add(v);
            }
            rowX += w;
            rowH = Math.max(rowH, h);
            right = Math.max(right, rowX);
        }
        double aloneY = Double.NaN;
        double bottom = rowY + rowH;
        if (!alone.isEmpty()) {
            aloneY = bottom + 16;
            int perRow = (int) Math.max(1, Math.floor((ROW_WIDTH - MARGIN) / SLOT));
            for (int i = 0; i < alone.size(); i++) {
                int v = alone.get(i);
                x[v] = MARGIN + SLOT / 2 + (i % perRow) * SLOT;
                y[v] = aloneY + 24 + BOX_H / 2 + (i / perRow) * (BOX_H + 16);
                order.add(v);
                right = Math.max(right, x[v] + SLOT / 2);
            }
            bottom = aloneY + 24 + ((alone.size() - 1) / perRow + 1) * (BOX_H + 16);
        }
        ConsensusLayout lay = new ConsensusLayout(n, order.stream().mapToInt(Integer::intValue).toArray(), new int[n], x, y,
                Math.max(420, right + MARGIN), bottom + MARGIN);
        lay.free = true;
        lay.aloneY = aloneY;
        lay.boxW = bw;
        return lay;
    }

    static final int FORCE_STEPS = 400;
    /** The ideal distance between joined variables, in the halved-x space. */
    static final double FORCE_K = 110;
    /** Pull towards the component's centre per unit of distance (added to Fruchterman &amp; Reingold's forces). */
    static final double GRAVITY = 0.35;

    /** Positions (real coordinates, any origin) of the variables of one component; see {@link #free}. */
    private static double[][] forces(List<Integer> c, boolean[][] drawn, double[] bw) {
        int k = c.size();
        double meanW = 0;
        for (int v : c) {
            meanW += bw[v] / k;
        }
        // forces act where the boxes look square: x divided by how much wider than tall a box is
        double xScale = Math.max(1, meanW / 75);
        double[][] p = new double[k][2];
        double radius = FORCE_K * Math.sqrt(k) / 2;
        for (int i = 0; i < k; i++) {
            p[i][0] = radius * Math.cos(2 * Math.PI * i / k);
            p[i][1] = radius * Math.sin(2 * Math.PI * i / k);
        }
        boolean[][] joined = new boolean[k][k];
        for (int i = 0; i < k; i++) {
            for (int j = 0; j < k; j++) {
                joined[i][j] = drawn[c.get(i)][c.get(j)] || drawn[c.get(j)][c.get(i)];
            }
        }
        double kk = FORCE_K * FORCE_K;
        double[][] move = new double[k][2];
        for (int step = 0; step < FORCE_STEPS; step++) {
            double temp = radius * (1 - step / (double) FORCE_STEPS) / 4 + 1;
            for (double[] mv : move) {
                mv[0] = 0;
                mv[1] = 0;
            }
            for (int i = 0; i < k; i++) {
                for (int j = i + 1; j < k; j++) {
                    double dx = p[i][0] - p[j][0];
                    double dy = p[i][1] - p[j][1];
                    double d = Math.max(1e-3, Math.hypot(dx, dy));
                    double f = kk / d - (joined[i][j] ? d * d / FORCE_K : 0);
                    move[i][0] += dx / d * f;
                    move[i][1] += dy / d * f;
                    move[j][0] -= dx / d * f;
                    move[j][1] -= dy / d * f;
                }
            }
            double cx = 0;
            double cy = 0;
            for (double[] q : p) {
                cx += q[0] / k;
                cy += q[1] / k;
            }
            for (int i = 0; i < k; i++) {
                // gravity towards the centre keeps a long chain folded into a compact block
                move[i][0] -= GRAVITY * (p[i][0] - cx);
                move[i][1] -= GRAVITY * (p[i][1] - cy);
                double d = Math.hypot(move[i][0], move[i][1]);
                if (d > 0) {
                    double s = Math.min(d, temp) / d;
                    p[i][0] += move[i][0] * s;
                    p[i][1] += move[i][1] * s;
                }
            }
        }
        for (double[] q : p) {
            q[0] *= xScale;
        }
        // overlapping boxes pushed apart along the axis of the smaller overlap
        double gapY = BOX_H + 26;
        for (int pass = 0; pass < 200; pass++) {
            boolean moved = false;
            for (int i = 0; i < k; i++) {
                for (int j = i + 1; j < k; j++) {
                    // joined boxes keep room between them for the edge's label
                    double gapX = (bw[c.get(i)] + bw[c.get(j)]) / 2 + (joined[i][j] ? 64 : 24);
                    double dx = p[j][0] - p[i][0];
                    double dy = p[j][1] - p[i][1];
                    double ox = gapX - Math.abs(dx);
                    double oy = gapY - Math.abs(dy);
                    if (ox > 0 && oy > 0) {
                        moved = true;
                        if (ox / gapX < oy / gapY) {
                            double s = (dx >= 0 ? 1 : -1) * ox / 2;
                            p[i][0] -= s;
                            p[j][0] += s;
                        } else {
                            double s = (dy >= 0 ? 1 : -1) * oy / 2;
                            p[i][1] -= s;
                            p[j][1] += s;
                        }
                    }
                }
            }
            if (!moved) {
                break;
            }
        }
        return p;
    }

    private static void renumber(List<List<Integer>> rows, double[] rank) {
        for (List<Integer> row : rows) {
            for (int i = 0; i < row.size(); i++) {
                rank[row.get(i)] = i - (row.size() - 1) / 2.0;
            }
        }
    }

    /** Stable sort by the mean rank of the neighbours in the adjacent layer; items without keep their rank. */
    private static void sortByBarycentre(List<Integer> row, List<List<Integer>> nbrs, double[] rank) {
        Map<Integer, Double> key = new HashMap<>();
        for (int it : row) {
            List<Integer> nb = nbrs.get(it);
            double k = rank[it];
            if (!nb.isEmpty()) {
                double s = 0;
                for (int u : nb) {
                    s += rank[u];
                }
                k = s / nb.size();
            }
            key.put(it, k);
        }
        row.sort((p, q) -> Double.compare(key.get(p), key.get(q)));
    }

    static int[] greedyOrder(EdgeMatrix m, boolean[][] g) {
        int n = m.size();
        boolean[] placed = new boolean[n];
        int[] order = new int[n];
        for (int step = 0; step < n; step++) {
            int best = -1;
            boolean bestFree = false;
            double bestMass = Double.POSITIVE_INFINITY;
            for (int v = 0; v < n; v++) {
                if (placed[v]) {
                    continue;
                }
                boolean free = true;
                double mass = 0;
                for (int u = 0; u < n; u++) {
                    if (!placed[u] && u != v) {
                        mass += m.p()[u][v];
                        free &= !g[u][v];
                    }
                }
                if (best < 0 || (free && !bestFree) || (free == bestFree && mass < bestMass)) {
                    best = v;
                    bestFree = free;
                    bestMass = mass;
                }
            }
            placed[best] = true;
            order[step] = best;
        }
        return order;
    }

    public int[] order() {
        return order.clone();
    }

    public int layer(int v) {
        return layer[v];
    }

    public double x(int v) {
        return x[v];
    }

    public double y(int v) {
        return y[v];
    }

    public double width() {
        return width;
    }

    public double height() {
        return height;
    }

    /** The points a downward edge a → b passes (box bottom, virtual slots, box top), or null if it is not downward. */
    public double[][] route(int a, int b) {
        return routes.get((long) a * n + b);
    }

    /** The width of variable v's box: fitted to its name in a free layout, {@link #BOX_W} in a layered one. */
    public double boxW(int v) {
        return boxW == null ? BOX_W : boxW[v];
    }

    /** A box that fits a name of {@code len} characters (drawn at most 20) at 12 px sans-serif: about 7 px a character. */
    static double fitted(int len) {
        return Math.max(60, 7.2 * Math.min(len, 20) + 22);
    }

    /** Whether the layout is free (components placed by forces, straight edges) rather than layered. */
    public boolean free() {
        return free;
    }

    /** Free layout: the top of the row of variables joined to no other, or NaN when there are none. */
    public double aloneY() {
        return aloneY;
    }

    /** Layered by tiers: the name of each layer, top first; null otherwise. */
    public List<String> layerNames() {
        return layerNames;
    }

    /** Variables of the order as a readable list (for captions). */
    public String describe(List<String> names) {
        return String.join(", ", Arrays.stream(order).mapToObj(names::get).toList());
    }
}
