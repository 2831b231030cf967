package org.edgewise.driver.store;

import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
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
        int[][] all = new int[n][];
        for (int child = 0; child < n; child++) {
            final int c = child;
            all[child] = IntStream.range(0, n).filter(v -> v != c).toArray();
        }
        return tally(variables, rows, maxParents, score, all, null, null);
    }

    /**
     * A store as {@code tally --candidates k --reserve reserve} writes it, by the job's rule restated
     * (job/plan/Candidates): per child the variables ranked by single-parent gain s(i,{j}) − s(i,∅),
     * highest first, ties to the lower index; the first {@code k} are its candidates, the next
     * {@code reserve} and then every other variable that keeps the child among its own k best form its
     * reserve (best first); families are every subset of candidates and reserve, of size ≤ d.
     * {@code reserve} −1 gives a plain pruned store (no reserve at all; the manifest has none).
     */
    public static ScoreStore pruned(List<Variable> variables, int[][] rows, int maxParents, FamilyScore score, int k,
                                    int reserve) {
        int n = variables.size();
        int[][] kept = new int[n][];
        Map<String, List<String>> cand = new LinkedHashMap<>();
        Map<String, List<String>> res = new LinkedHashMap<>();
        List<List<Integer>> ranked = new ArrayList<>();
        for (int child = 0; child < n; child++) {
            double empty = score(variables, rows, child, new int[0], score);
            double[] gain = new double[n];
            List<Integer> others = new ArrayList<>();
            for (int v = 0; v < n; v++) {
                if (v != child) {
                    others.add(v);
                    gain[v] = score(variables, rows, child, new int[] {v}, score) - empty;
                }
            }
            others.sort((a, b) -> {
                int cmp = Double.compare(gain[b], gain[a]);
                return cmp != 0 ? cmp : Integer.compare(a, b);
            });
            ranked.add(others);
        }
        for (int child = 0; child < n; child++) {
            List<Integer> others = ranked.get(child);
            List<Integer> top = others.subList(0, Math.min(k, others.size()));
            List<Integer> more = new ArrayList<>();
            if (reserve >= 0) {
                more.addAll(others.subList(top.size(), Math.min(k + reserve, others.size())));
                // then every other variable that keeps this child among its own k best (the job's symmetric closure)
                for (int v : others.subList(top.size() + more.size(), others.size())) {
                    if (ranked.get(v).subList(0, Math.min(k, ranked.get(v).size())).contains(child)) {
                        more.add(v);
                    }
                }
            }
            kept[child] = java.util.stream.Stream.concat(top.stream(), more.stream()).mapToInt(Integer::intValue).sorted().toArray();
            cand.put(variables.get(child).name(), top.stream().sorted().map(v -> variables.get(v).name()).toList());
            res.put(variables.get(child).name(), more.stream().map(v -> variables.get(v).name()).toList());
        }
        return tally(variables, rows, maxParents, score, kept, cand, reserve >= 0 ? res : null);
    }

    private static double score(List<Variable> variables, int[][] rows, int child, int[] parents, FamilyScore score) {
        double q = 1;
        for (int p : parents) {
            q *= variables.get(p).arity();
        }
        return score.logScore(count(variables, rows, child, parents).counts(), variables.get(child).arity(), q);
    }

    private static ScoreStore tally(List<Variable> variables, int[][] rows, int maxParents, FamilyScore score,
                                    int[][] allowed, Map<String, List<String>> candidates, Map<String, List<String>> reserve) {
        int n = variables.size();
        // One child per task; the families are concatenated in child order, so the store is the
        // same whatever the number of threads.
        @SuppressWarnings("unchecked")
        List<FamilyCounts>[] byChild = new List[n];
        double[][] scoresByChild = new double[n][];
        IntStream.range(0, n).parallel().forEach(child -> {
            int[] others = allowed[child];
            List<FamilyCounts> fams = new ArrayList<>();
            for (int size = 0; size <= Math.min(maxParents, others.length); size++) {
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
                variables, maxParents, candidates, List.of(), List.of(), List.of(), score.kind().label(), score.ess())
                .withReserve(reserve);
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
