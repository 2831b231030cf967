package org.edgewise.driver.report;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

/**
 * Where the consensus graph's variables go in a drawing: a most probable order, layers and
 * positions within layers.
 *
 * <p>Order: the result's own order when it was computed for a given order; otherwise a greedy
 * topological order of the consensus graph that, among the variables without a consensus parent
 * still unplaced, places first the one with the least incoming posterior mass
 * Σ_{u unplaced} P(u → v) — the variable least likely to have a parent among the rest. When the
 * consensus graph has a directed cycle (possible for three or more variables) the same rule
 * picks among all unplaced variables, and the edges against the order are drawn as back edges.
 *
 * <p>Layer of v: 0 without a consensus parent earlier in the order, else one more than the
 * deepest such parent. Within a layer, variables are sorted by the mean position of their
 * consensus parents (the barycentre heuristic of Sugiyama, Tagawa &amp; Toda 1981), one sweep.
 */
public record ConsensusLayout(int[] order, int[] layer, int[] slot, int layers, int widest) {

    public static ConsensusLayout of(EdgeMatrix m, boolean[][] g, List<String> givenOrder) {
        int n = m.size();
        int[] order = givenOrder != null && givenOrder.size() == n && m.variables().containsAll(givenOrder)
                ? givenOrder.stream().mapToInt(v -> m.variables().indexOf(v)).toArray()
                : greedyOrder(m, g);
        int[] pos = new int[n];
        for (int i = 0; i < n; i++) {
            pos[order[i]] = i;
        }
        int[] layer = new int[n];
        int layers = 0;
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
        int[] slot = new int[n];
        double[] xs = new double[n];
        int widest = 0;
        for (int l = 0; l < layers; l++) {
            List<Integer> in = new ArrayList<>();
            for (int v : order) {
                if (layer[v] == l) {
                    in.add(v);
                }
            }
            double[] key = new double[n];
            for (int v : in) {
                double s = 0;
                int k = 0;
                for (int u = 0; u < n; u++) {
                    if (g[u][v] && layer[u] < l) {
                        s += xs[u];
                        k++;
                    }
                }
                key[v] = k == 0 ? pos[v] / (double) n * in.size() : s / k;
            }
            in.sort((a, b) -> key[a] != key[b] ? Double.compare(key[a], key[b]) : Integer.compare(pos[a], pos[b]));
            widest = Math.max(widest, in.size());
            for (int i = 0; i < in.size(); i++) {
                slot[in.get(i)] = i;
                xs[in.get(i)] = i - (in.size() - 1) / 2.0;
            }
        }
        return new ConsensusLayout(order, layer, slot, Math.max(layers, 1), Math.max(widest, 1));
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

    /** Variables of the order as a readable list (for captions). */
    public String describe(List<String> names) {
        return String.join(", ", Arrays.stream(order).mapToObj(names::get).toList());
    }
}
