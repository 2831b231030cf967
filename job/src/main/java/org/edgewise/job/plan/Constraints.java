package org.edgewise.job.plan;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.Tiers;
import org.edgewise.driver.store.EdgeRule;

/**
 * Tally-time edge constraints resolved against the variables: forbidden edges, required edges and
 * tiers (a parent may not come from a later tier than its child; variables named in no tier are
 * not constrained by tiers). Yields the candidate parents of every child before any pruning by
 * score, and the required parents of every child.
 */
public final class Constraints {
    private final List<String> names;
    private final boolean[][] allowed;
    private final int[][] required;
    private final List<EdgeRule> forbid;
    private final List<EdgeRule> require;
    private final List<List<String>> tiers;

    private Constraints(List<String> names, boolean[][] allowed, int[][] required, List<EdgeRule> forbid,
                        List<EdgeRule> require, List<List<String>> tiers) {
        this.names = names;
        this.allowed = allowed;
        this.required = required;
        this.forbid = forbid;
        this.require = require;
        this.tiers = tiers;
    }

    /** Resolves and checks the constraints; every unknown or contradictory name is a {@link UserError}. */
    public static Constraints resolve(List<String> names, List<EdgeRule> forbid, List<EdgeRule> require,
                                      List<List<String>> tiers, int maxParents) {
        int n = names.size();
        boolean[][] allowed = new boolean[n][n];
        for (int i = 0; i < n; i++) {
            Arrays.fill(allowed[i], true);
            allowed[i][i] = false;
        }
        int[] tierOf = Tiers.resolve(names, tiers, "--tiers");
        for (int child = 0; child < n; child++) {
            for (int p = 0; p < n; p++) {
                if (tierOf[child] >= 0 && tierOf[p] > tierOf[child]) {
                    allowed[child][p] = false;
                }
            }
        }
        for (EdgeRule e : forbid) {
            int from = index(names, e.from(), "--forbid " + e);
            int to = index(names, e.to(), "--forbid " + e);
            if (from == to) {
                throw new UserError("--forbid " + e + ": an edge joins two different variables");
            }
            allowed[to][from] = false;
        }
        List<List<Integer>> req = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            req.add(new ArrayList<>());
        }
        for (EdgeRule e : require) {
            int from = index(names, e.from(), "--require " + e);
            int to = index(names, e.to(), "--require " + e);
            if (from == to) {
                throw new UserError("--require " + e + ": an edge joins two different variables");
            }
            if (forbid.stream().anyMatch(f -> f.from().equals(e.from()) && f.to().equals(e.to()))) {
                throw new UserError("--require " + e + " contradicts --forbid " + e);
            }
            if (!allowed[to][from]) {
                throw new UserError("--require " + e + " contradicts --tiers: '" + e.from()
                        + "' is in a later tier than '" + e.to() + "'");
            }
            if (!req.get(to).contains(from)) {
                req.get(to).add(from);
            }
        }
        int[][] required = new int[n][];
        for (int i = 0; i < n; i++) {
            required[i] = req.get(i).stream().mapToInt(Integer::intValue).sorted().toArray();
            if (required[i].length > maxParents) {
                throw new UserError("--require gives '" + names.get(i) + "' " + required[i].length
                        + " parents but --max-parents is " + maxParents);
            }
        }
        List<Integer> cycle = cycle(required);
        if (!cycle.isEmpty()) {
            StringBuilder path = new StringBuilder();
            for (int v : cycle) {
                path.append(path.length() == 0 ? "" : "->").append(names.get(v));
            }
            throw new UserError("--require: the required edges form a cycle (" + path
                    + "); a DAG can hold at most all but one of them");
        }
        return new Constraints(List.copyOf(names), allowed, required, List.copyOf(forbid), List.copyOf(require),
                tiers.stream().map(List::copyOf).toList());
    }

    /**
     * A directed cycle among the required edges (parent → child), as its variables with the first
     * repeated at the end, or empty when there is none.
     */
    static List<Integer> cycle(int[][] required) {
        int n = required.length;
        int[] state = new int[n]; // 0 unseen, 1 on the path, 2 done
        int[] next = new int[n]; // the parent followed from each variable on the path
        for (int start = 0; start < n; start++) {
            if (state[start] != 0) {
                continue;
            }
            // depth-first along child → parent (a cycle read backwards), iteratively
            java.util.ArrayDeque<int[]> stack = new java.util.ArrayDeque<>();
            stack.push(new int[] {start, 0});
            state[start] = 1;
            while (!stack.isEmpty()) {
                int[] top = stack.peek();
                int v = top[0];
                if (top[1] < required[v].length) {
                    int p = required[v][top[1]++];
                    next[v] = p;
                    if (state[p] == 1) {
                        // p → … → v → p, read forwards: walk from p along next (child → parent) and reverse
                        List<Integer> back = new ArrayList<>();
                        int u = p;
                        back.add(u);
                        do {
                            u = next[u];
                            back.add(u);
                        } while (u != p);
                        java.util.Collections.reverse(back);
                        return back;
                    }
                    if (state[p] == 0) {
                        state[p] = 1;
                        stack.push(new int[] {p, 0});
                    }
                } else {
                    state[v] = 2;
                    stack.pop();
                }
            }
        }
        return List.of();
    }

    private static int index(List<String> names, String name, String option) {
        int v = names.indexOf(name);
        if (v < 0) {
            throw new UserError(option + ": no variable '" + name + "' (variables: " + String.join(", ", names) + ")");
        }
        return v;
    }

    /** Candidate parents of every child (sorted): every other variable that no constraint excludes. */
    public int[][] candidates() {
        int n = names.size();
        int[][] out = new int[n][];
        for (int i = 0; i < n; i++) {
            int k = 0;
            int[] c = new int[n];
            for (int p = 0; p < n; p++) {
                if (allowed[i][p]) {
                    c[k++] = p;
                }
            }
            out[i] = Arrays.copyOf(c, k);
        }
        return out;
    }

    /** Required parents of every child (sorted). */
    public int[][] required() {
        int[][] out = new int[required.length][];
        for (int i = 0; i < required.length; i++) {
            out[i] = required[i].clone();
        }
        return out;
    }

    public List<EdgeRule> forbid() {
        return forbid;
    }

    public List<EdgeRule> require() {
        return require;
    }

    public List<List<String>> tiers() {
        return tiers;
    }
}
