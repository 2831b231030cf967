package org.edgewise.driver.report;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.UserError;
import org.edgewise.driver.result.EdgeResult;

/**
 * Edge posteriors of a result as a dense matrix: {@code p[a][b]} = P(a → b | D), variables in
 * the result's order. A pair the result does not list counts 0. Memory: 8·n² bytes.
 */
public record EdgeMatrix(List<String> variables, double[][] p) {

    public static EdgeMatrix of(EdgeResult r) {
        return of(r.variables(), r.edges(), "result");
    }

    /** The matrix of one list of edges (the main result's or a sensitivity entry's). */
    public static EdgeMatrix of(List<String> variables, List<EdgeResult.Edge> edges, String what) {
        int n = variables.size();
        Map<String, Integer> index = new HashMap<>();
        for (int i = 0; i < n; i++) {
            if (index.put(variables.get(i), i) != null) {
                throw new UserError(what + " lists variable '" + variables.get(i) + "' twice");
            }
        }
        double[][] p = new double[n][n];
        for (EdgeResult.Edge e : edges) {
            Integer a = index.get(e.from());
            Integer b = index.get(e.to());
            if (a == null || b == null) {
                throw new UserError(what + " has an edge " + e.from() + " -> " + e.to()
                        + " between variables it does not list");
            }
            if (!(e.posterior() >= 0 && e.posterior() <= 1 + 1e-9)) {
                throw new UserError(what + " has edge " + e.from() + " -> " + e.to()
                        + " with posterior " + e.posterior() + ", not a probability");
            }
            if (a.equals(b)) {
                throw new UserError(what + " has a self-edge on '" + e.from() + "'");
            }
            p[a][b] = Math.min(1, e.posterior());
        }
        return new EdgeMatrix(List.copyOf(variables), p);
    }

    public int size() {
        return variables.size();
    }

    /** Skeleton score of the pair {a, b}: min(1, P(a→b) + P(b→a)). For a posterior over DAGs the
     * two events are disjoint, so the sum is P(a and b adjacent) exactly; the cap only absorbs
     * rounding and Monte Carlo error. */
    public double adjacency(int a, int b) {
        return Math.min(1, p[a][b] + p[b][a]);
    }

    /** The consensus graph: a → b when P(a → b) &gt; threshold. */
    public boolean[][] consensus(double threshold) {
        int n = size();
        boolean[][] g = new boolean[n][n];
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                g[a][b] = a != b && p[a][b] > threshold;
            }
        }
        return g;
    }
}
