package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.result.EdgeResult;
import org.junit.jupiter.api.Test;

/** The drawing order is a topological order of an acyclic consensus graph, and layers follow edges. */
class ConsensusLayoutTest {
    static EdgeMatrix matrix(int n, double[][] p) {
        List<String> names = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            names.add("v" + i);
        }
        List<EdgeResult.Edge> e = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a != b) {
                    e.add(new EdgeResult.Edge(names.get(a), names.get(b), p[a][b]));
                }
            }
        }
        return EdgeMatrix.of(names, e, "test");
    }

    /** Random posteriors of a random DAG (edges i → j only for i before j in a hidden permutation). */
    @Test
    void greedyOrderIsTopologicalForAcyclicConsensus() {
        SplittableRandom rng = new SplittableRandom(5);
        for (int trial = 0; trial < 100; trial++) {
            int n = 2 + rng.nextInt(9);
            int[] perm = rng.ints(0, 1000).limit(n).toArray();
            double[][] p = new double[n][n];
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    boolean forward = perm[a] < perm[b] || perm[a] == perm[b] && a < b;
                    if (a != b) {
                        p[a][b] = forward ? rng.nextDouble() : 0.5 * rng.nextDouble(); // backward never above 0.5
                    }
                }
            }
            EdgeMatrix m = matrix(n, p);
            boolean[][] g = m.consensus(0.5);
            ConsensusLayout lay = ConsensusLayout.of(m, g, g, null);
            int[] pos = new int[n];
            int[] order = lay.order();
            for (int i = 0; i < n; i++) {
                pos[order[i]] = i;
            }
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (g[a][b]) {
                        assertTrue(pos[a] < pos[b], "trial " + trial + ": parent before child");
                        assertTrue(lay.layer(b) > lay.layer(a), "trial " + trial + ": child in a deeper layer");
                        assertTrue(lay.y(b) > lay.y(a));
                    }
                }
            }
        }
    }

    @Test
    void givenOrderIsKeptAndCyclesStillDraw() {
        // a three-cycle v0 → v1 → v2 → v0, each 0.9: the consensus graph is cyclic
        double[][] p = {{0, 0.9, 0}, {0, 0, 0.9}, {0.9, 0, 0}};
        EdgeMatrix m = matrix(3, p);
        boolean[][] g = m.consensus(0.5);
        ConsensusLayout lay = ConsensusLayout.of(m, g, g, List.of("v2", "v0", "v1"));
        assertArrayEquals(new int[] {2, 0, 1}, lay.order());
        assertEquals(0, lay.layer(2));
        EdgeResult r = new EdgeResult("order", m.variables(), null, null, null, List.of("v2", "v0", "v1"), null, null,
                edgesOf(m), null, null, null, null, null, null, null);
        ConsensusEdges ce = ConsensusEdges.of(r, m);
        String svg = Charts.graph(m, ce, ce.drawn(0.5), lay, null);
        assertEquals(3, svg.split("marker-end=").length - 1, "all three edges drawn, one of them as an arc");
    }

    static List<EdgeResult.Edge> edgesOf(EdgeMatrix m) {
        List<EdgeResult.Edge> e = new ArrayList<>();
        for (int a = 0; a < m.size(); a++) {
            for (int b = 0; b < m.size(); b++) {
                if (a != b) {
                    e.add(new EdgeResult.Edge(m.variables().get(a), m.variables().get(b), m.p()[a][b]));
                }
            }
        }
        return e;
    }
}
