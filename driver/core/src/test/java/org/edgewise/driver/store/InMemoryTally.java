package org.edgewise.driver.store;

import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.IntStream;
import org.edgewise.driver.score.FamilyScore;

/**
 * A plain, single-threaded tally of an in-memory table into a {@link ScoreStore}: every family
 * (child, parent set of at most d other variables, lexicographic order of parent sets by size then
 * members) counted row by row. It is deliberately simple — the independent recount the Spark
 * job is checked against, and a quick way for tests and benchmarks to build stores. A test
 * fixture: it ships in the core's test-jar, never in a runtime jar.
 *
 * Children are counted in parallel; the result does not depend on the thread count.
 *
 * <p>Memory: a dense table of 8·q·r bytes per family while it is counted (q = Π r_parents), then
 * 8·(r + 1) bytes per observed parent configuration.
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
        // One child per task; the families are concatenated in child order, so the store is the
        // same whatever the number of threads.
        @SuppressWarnings("unchecked")
        List<FamilyCounts>[] byChild = new List[n];
        double[][] scoresByChild = new double[n][];
        IntStream.range(0, n).parallel().forEach(child -> {
            int[] others = new int[n - 1];
            for (int v = 0, k = 0; v < n; v++) {
                if (v != child) {
                    others[k++] = v;
                }
            }
            List<FamilyCounts> fams = new ArrayList<>();
            for (int size = 0; size <= Math.min(maxParents, n - 1); size++) {
                for (int[] parents : ParentSets.subsets(others, size)) {
                    fams.add(count(variables, rows, child, parents));
                }
            }
            double[] sc = new double[fams.size()];
            for (int f = 0; f < sc.length; f++) {
                FamilyCounts fc = fams.get(f);
                double q = 1;
                for (int p : fc.parents()) {
                    q *= variables.get(p).arity();
                }
                sc[f] = score.logScore(fc.counts(), variables.get(child).arity(), q);
            }
            byChild[child] = fams;
            scoresByChild[child] = sc;
        });
        List<FamilyCounts> families = new ArrayList<>();
        for (List<FamilyCounts> l : byChild) {
            families.addAll(l);
        }
        double[] scores = new double[families.size()];
        for (int c = 0, at = 0; c < n; c++) {
            System.arraycopy(scoresByChild[c], 0, scores, at, scoresByChild[c].length);
            at += scoresByChild[c].length;
        }
        Manifest m = Manifest.of("edgewise", "in-memory", Instant.EPOCH.toString(),
                new InputInfo(List.of("(in memory)"), "memory", rows.length, 0, "error", "0"),
                variables, maxParents, null, List.of(), List.of(), List.of(), score.kind().label(), score.ess());
        return new ScoreStore(m, families, scores);
    }

    /**
     * Counts one family by a direct loop over the rows into a dense q·r table (q = Π r_parents),
     * then keeps the observed parent configurations in increasing order.
     */
    public static FamilyCounts count(List<Variable> variables, int[][] rows, int child, int[] parents) {
        int r = variables.get(child).arity();
        int q = 1;
        for (int p : parents) {
            q = Math.multiplyExact(q, variables.get(p).arity());
        }
        long[] dense = new long[Math.multiplyExact(q, r)];
        for (int[] row : rows) {
            int j = 0;
            for (int p : parents) {
                j = j * variables.get(p).arity() + row[p];
            }
            dense[j * r + row[child]]++;
        }
        int observed = 0;
        for (int j = 0; j < q; j++) {
            observed += rowTotal(dense, j, r) > 0 ? 1 : 0;
        }
        long[] configs = new long[observed];
        long[] counts = new long[observed * r];
        for (int j = 0, m = 0; j < q; j++) {
            if (rowTotal(dense, j, r) > 0) {
                configs[m] = j;
                System.arraycopy(dense, j * r, counts, m * r, r);
                m++;
            }
        }
        return new FamilyCounts(child, parents.clone(), configs, counts);
    }

    private static long rowTotal(long[] dense, int j, int r) {
        long s = 0;
        for (int k = 0; k < r; k++) {
            s += dense[j * r + k];
        }
        return s;
    }
}
