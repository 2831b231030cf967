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

    private final int[] order;
    private final int[] layer;
    private final double[] x;
    private final double[] y;
    private final double width;
    private final double height;
    private final Map<Long, double[][]> routes = new HashMap<>();
    private final int n;

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
        int layers = 1;
        for (int v : order) {
            int l = 0;
            for (int u = 0; u < n; u++) {
                if (g[u][v] && pos[u] < pos[v]) {
                    l = Math.max(l, layer[u] + 1);
                }
            }
            layer[v] = l;
            layers = Math.max(layers, l + 1);
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
        double width = Math.max(widest + 2 * MARGIN + 60, 420);
        double[] ix = new double[items];
        double[] iy = new double[items];
        for (int l = 0; l < layers; l++) {
            double cursor = (width - rowWidth[l]) / 2;
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

    /** Variables of the order as a readable list (for captions). */
    public String describe(List<String> names) {
        return String.join(", ", Arrays.stream(order).mapToObj(names::get).toList());
    }
}
