package org.edgewise.driver.store;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.TreeMap;
import org.edgewise.driver.score.FamilyScore;

/**
 * A plain, single-threaded tally of an in-memory table into a {@link ScoreStore}: every family
 * (child, parent set of at most d other variables, lexicographic order of parent sets by size then
 * members) counted row by row. It is deliberately simple — the independent recount the Spark
 * job is checked against, and a quick way for tests and benchmarks to build stores. A test
 * fixture: it ships in the core's test-jar, never in a runtime jar.
 *
 * <p>Memory: a sorted map entry per observed configuration per family (≈ 100 bytes + 8·r).
 */
public final class InMemoryTally {
    private InMemoryTally() {
    }

    /**
     * @param variables the variables (state labels give the arities)
     * @param rows      {@code rows[t][v]} = state index of variable v in row t
     * @param maxParents d
     * @param score     the family score to store
     */
    public static ScoreStore tally(List<Variable> variables, int[][] rows, int maxParents, FamilyScore score) {
        int n = variables.size();
        List<FamilyCounts> families = new ArrayList<>();
        List<Double> scores = new ArrayList<>();
        for (int child = 0; child < n; child++) {
            int[] others = new int[n - 1];
            for (int v = 0, k = 0; v < n; v++) {
                if (v != child) {
                    others[k++] = v;
                }
            }
            for (int size = 0; size <= Math.min(maxParents, n - 1); size++) {
                for (int[] parents : ParentSets.subsets(others, size)) {
                    FamilyCounts fc = count(variables, rows, child, parents);
                    families.add(fc);
                    double q = 1;
                    for (int p : parents) {
                        q *= variables.get(p).arity();
                    }
                    scores.add(score.logScore(fc.counts(), variables.get(child).arity(), q));
                }
            }
        }
        Manifest m = new Manifest(StoreFormat.VERSION, "edgewise", "in-memory", Instant.EPOCH.toString(),
                new InputInfo(List.of("(in memory)"), "memory", rows.length, 0, "error", "0"),
                variables, maxParents, null, List.of(), List.of(), List.of(), score.kind().label(), score.ess(), null);
        return new ScoreStore(m, families, scores.stream().mapToDouble(Double::doubleValue).toArray());
    }

    /** Counts one family by a direct loop over the rows. */
    public static FamilyCounts count(List<Variable> variables, int[][] rows, int child, int[] parents) {
        int r = variables.get(child).arity();
        TreeMap<Long, long[]> byConfig = new TreeMap<>();
        for (int[] row : rows) {
            long j = 0;
            for (int p : parents) {
                j = j * variables.get(p).arity() + row[p];
            }
            byConfig.computeIfAbsent(j, x -> new long[r])[row[child]]++;
        }
        long[] configs = new long[byConfig.size()];
        long[] counts = new long[byConfig.size() * r];
        int m = 0;
        for (var e : byConfig.entrySet()) {
            configs[m] = e.getKey();
            System.arraycopy(e.getValue(), 0, counts, m * r, r);
            m++;
        }
        return new FamilyCounts(child, parents.clone(), configs, counts);
    }
}
