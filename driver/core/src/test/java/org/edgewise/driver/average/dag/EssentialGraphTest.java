package org.edgewise.driver.average.dag;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.DagEnumeration;

/**
 * Meek's construction against brute force: every DAG on n ≤ 5 nodes (DagEnumerationTest) grouped
 * into Markov-equivalence classes by (skeleton, v-structures) — Verma &amp; Pearl 1990's
 * characterisation — and each DAG's compelled edges must be exactly the edges every member of
 * its class orients alike.
 */
public class EssentialGraphTest {

    /** The class key: skeleton bits and the v-structures a → b ← c (a &lt; c non-adjacent). */
    public static String classKey(int[] pa, int n) {
        StringBuilder sb = new StringBuilder();
        for (int a = 0; a < n; a++) {
            for (int b = a + 1; b < n; b++) {
                sb.append(((pa[b] >> a & 1) | (pa[a] >> b & 1)) != 0 ? '1' : '0');
            }
        }
        sb.append('|');
        for (int b = 0; b < n; b++) {
            for (int a = 0; a < n; a++) {
                for (int c = a + 1; c < n; c++) {
                    boolean adjacent = (pa[c] >> a & 1) != 0 || (pa[a] >> c & 1) != 0;
                    if ((pa[b] >> a & 1) != 0 && (pa[b] >> c & 1) != 0 && !adjacent) {
                        sb.append(a).append('>').append(b).append('<').append(c).append(';');
                    }
                }
            }
        }
        return sb.toString();
    }

    @Test
    void compelledEdgesAreThoseEveryEquivalentDagShares() {
        // number of Markov equivalence classes of DAGs on n = 1..5 nodes: OEIS A007984 (1, 2, 11, 185, 8782; from memory,
        // reproduced here by the grouping itself)
        long[] classCount = {1, 2, 11, 185, 8782};
        for (int n = 1; n <= 5; n++) {
            List<int[]> dags = DagEnumeration.allDags(n);
            Map<String, List<int[]>> classes = new HashMap<>();
            for (int[] g : dags) {
                classes.computeIfAbsent(classKey(g, n), k -> new ArrayList<>()).add(g);
            }
            assertEquals(classCount[n - 1], classes.size(), "classes on n = " + n);
            for (List<int[]> members : classes.values()) {
                int[] alike = new int[n];
                java.util.Arrays.fill(alike, -1);
                for (int[] g : members) {
                    for (int v = 0; v < n; v++) {
                        alike[v] &= g[v];
                    }
                }
                for (int[] g : members) {
                    assertArrayEquals(alike, EssentialGraph.compelled(g), "n = " + n + " class " + classKey(g, n));
                }
            }
        }
    }
}
