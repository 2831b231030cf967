package org.edgewise.job.plan;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.ParentSets;

/**
 * Which families to count and how the counting work is shared.
 *
 * <p>Families: for each child i (ascending), every parent set U ⊆ cand(i) with |U| ≤ d that holds
 * all required parents of i, ordered by size and then lexicographically — the order of the store.
 *
 * <p>Cover sets: each family (i, U) is assigned the variable set {i} ∪ U extended with the first
 * other candidates of i (ascending) up to min(d + 1, 1 + |cand(i)|) members. The distinct cover
 * sets are counted once each (dense, Π arities cells) and every family is marginalised from its
 * cover set. Without pruning or constraints the cover sets are exactly the (d+1)-subsets.
 *
 * <p>Batches: cover sets in lexicographic order, grouped greedily so that one task's count arrays
 * for a batch fit the per-task budget ({@link #BYTES_PER_CELL} bytes per cell: the task's int
 * array plus the long array it hands to the reduce). One pass over the data per batch.
 */
public final class FamilyPlan {
    /** Per-task bytes per dense cell: 4 (int counts) + 8 (long partial sums sent to the reduce). */
    public static final int BYTES_PER_CELL = 12;
    /**
     * Least driver bytes per family: its parent and cover arrays and list entries while planning
     * (about 100 B), its stored counts and configuration (at least 2 longs and the object headers,
     * about 60 B). An estimate: refusing below it is certain to be right.
     */
    static final int BYTES_PER_FAMILY = 160;

    private final int[] arity;
    private final int[] familyChild;
    private final int[][] familyParents;
    private final int[] familyCover;
    private final int[][] covers;
    private final long[] coverCells;

    private FamilyPlan(int[] arity, int[] familyChild, int[][] familyParents, int[] familyCover,
                       int[][] covers, long[] coverCells) {
        this.arity = arity;
        this.familyChild = familyChild;
        this.familyParents = familyParents;
        this.familyCover = familyCover;
        this.covers = covers;
        this.coverCells = coverCells;
    }

    /**
     * Plans the families of every child.
     *
     * @param arity      states of every variable
     * @param candidates candidate parents of every child, sorted
     * @param required   required parents of every child, sorted, a subset of its candidates
     * @param maxParents d
     */
    public static FamilyPlan families(int[] arity, int[][] candidates, int[][] required, int maxParents) {
        checkFamilyCount(familyCount(candidates, required, maxParents), arity.length, maxParents,
                Runtime.getRuntime().maxMemory());
        List<Integer> childList = new ArrayList<>();
        List<int[]> parentList = new ArrayList<>();
        List<int[]> coverOf = new ArrayList<>();
        for (int i = 0; i < arity.length; i++) {
            int[] cand = candidates[i];
            int[] req = required[i];
            int[] free = Arrays.stream(cand).filter(c -> Arrays.binarySearch(req, c) < 0).toArray();
            List<int[]> sets = new ArrayList<>();
            for (int size = req.length; size <= Math.min(maxParents, cand.length); size++) {
                for (int[] extra : ParentSets.subsets(free, size - req.length)) {
                    int[] u = concatSorted(req, extra);
                    sets.add(u);
                }
            }
            sets.sort(FamilyPlan::bySizeThenLex);
            int coverSize = Math.min(maxParents + 1, 1 + cand.length);
            for (int[] u : sets) {
                childList.add(i);
                parentList.add(u);
                coverOf.add(cover(i, u, cand, coverSize));
            }
        }
        return fromCovers(arity, childList, parentList, coverOf);
    }

    /**
     * The number of families {@link #families} would plan, counted before anything is allocated:
     * Σ_i Σ_{s=|R_i|..min(d,|C_i|)} C(|C_i| − |R_i|, s − |R_i|) for candidates C_i and required R_i
     * (the subsets of the free candidates completing the required ones; exact, as a double).
     */
    public static double familyCount(int[][] candidates, int[][] required, int maxParents) {
        double total = 0;
        for (int i = 0; i < candidates.length; i++) {
            int free = candidates[i].length - required[i].length;
            double binom = 1; // C(free, k), k = 0, 1, …
            for (int k = 0; k <= Math.min(maxParents, candidates[i].length) - required[i].length; k++) {
                total += binom;
                binom = binom * (free - k) / (k + 1);
            }
        }
        return total;
    }

    /**
     * Refuses a plan that could not fit from the header alone, before any pass over the data: the
     * family count depends only on the candidate and required parents of every child and d (with
     * {@code --candidates K}, every child keeps its required parents and at most K in all).
     *
     * @param k the candidates kept per child, or null for all
     */
    public static void checkBeforeScan(int[][] candidates, int[][] required, int maxParents, Integer k) {
        int[][] kept = candidates;
        if (k != null) {
            kept = new int[candidates.length][];
            for (int i = 0; i < candidates.length; i++) {
                // only the sizes count: required ones first, then the others up to k
                kept[i] = new int[Math.max(required[i].length, Math.min(k, candidates[i].length))];
            }
        }
        checkFamilyCount(familyCount(kept, required, maxParents), candidates.length, maxParents,
                Runtime.getRuntime().maxMemory());
    }

    /**
     * Refuses, in seconds, a plan whose families alone would not fit: at least
     * {@link #BYTES_PER_FAMILY} bytes each on the driver (the plan's arrays and the stored family),
     * against half the heap; and at most {@code Integer.MAX_VALUE} families (the store indexes them
     * with int32).
     */
    static void checkFamilyCount(double families, int variables, int maxParents, long heap) {
        double need = families * BYTES_PER_FAMILY;
        if (families > Integer.MAX_VALUE - 8 || need > heap / 2.0) {
            throw new UserError("cannot plan the tally: " + variables + " variables with --max-parents " + maxParents
                    + " give " + String.format(Locale.ROOT, "%,.0f", families) + " families, at least " + bytes(need)
                    + " on the driver, more than half its memory (" + bytes(heap) + "); lower --max-parents or use"
                    + " --candidates K");
        }
    }

    /**
     * Refuses a per-task budget larger than the memory of the JVM the tasks run in ({@code heap}):
     * the count arrays could never be allocated and the job would die in the counting kernel.
     */
    public static void checkBudget(long budgetBytes, long heap, String where) {
        if (budgetBytes > heap) {
            throw new UserError("--memory-budget " + bytes(budgetBytes) + " is more than the memory of " + where + " ("
                    + bytes(heap) + "); give at most that, or give " + where + " more memory");
        }
    }

    /**
     * Plans the pairwise pass behind {@code --candidates}: families (i, ∅) and (i, {j}) for every
     * candidate j of i, counted from the pairs {i, j}.
     */
    public static FamilyPlan pairs(int[] arity, int[][] candidates) {
        List<Integer> childList = new ArrayList<>();
        List<int[]> parentList = new ArrayList<>();
        List<int[]> coverOf = new ArrayList<>();
        for (int i = 0; i < arity.length; i++) {
            int[] cand = candidates[i];
            childList.add(i);
            parentList.add(new int[0]);
            coverOf.add(cand.length == 0 ? new int[] {i} : sorted(i, cand[0]));
            for (int j : cand) {
                childList.add(i);
                parentList.add(new int[] {j});
                coverOf.add(sorted(i, j));
            }
        }
        return fromCovers(arity, childList, parentList, coverOf);
    }

    private static int[] sorted(int a, int b) {
        return a < b ? new int[] {a, b} : new int[] {b, a};
    }

    private static FamilyPlan fromCovers(int[] arity, List<Integer> childList, List<int[]> parentList,
                                         List<int[]> coverOf) {
        List<int[]> unique = new ArrayList<>();
        Map<String, Boolean> seen = new HashMap<>();
        for (int[] c : coverOf) {
            if (seen.putIfAbsent(Arrays.toString(c), Boolean.TRUE) == null) {
                unique.add(c);
            }
        }
        unique.sort(Arrays::compare);
        Map<String, Integer> index = new HashMap<>();
        for (int s = 0; s < unique.size(); s++) {
            index.put(Arrays.toString(unique.get(s)), s);
        }
        int f = childList.size();
        int[] familyChild = new int[f];
        int[][] familyParents = new int[f][];
        int[] familyCover = new int[f];
        for (int m = 0; m < f; m++) {
            familyChild[m] = childList.get(m);
            familyParents[m] = parentList.get(m);
            familyCover[m] = index.get(Arrays.toString(coverOf.get(m)));
        }
        int[][] covers = unique.toArray(int[][]::new);
        long[] cells = new long[covers.length];
        for (int s = 0; s < covers.length; s++) {
            cells[s] = cells(arity, covers[s]);
        }
        return new FamilyPlan(arity.clone(), familyChild, familyParents, familyCover, covers, cells);
    }

    /** {child} ∪ u extended with the first other candidates up to {@code size} members, sorted. */
    static int[] cover(int child, int[] u, int[] cand, int size) {
        int[] s = new int[size];
        int k = 0;
        s[k++] = child;
        for (int p : u) {
            s[k++] = p;
        }
        for (int c = 0; c < cand.length && k < size; c++) {
            if (Arrays.binarySearch(u, cand[c]) < 0) {
                s[k++] = cand[c];
            }
        }
        Arrays.sort(s);
        return s;
    }

    /** Π arities of a variable set, saturating at Long.MAX_VALUE. */
    static long cells(int[] arity, int[] vars) {
        long c = 1;
        for (int v : vars) {
            if (c > Long.MAX_VALUE / arity[v]) {
                return Long.MAX_VALUE;
            }
            c *= arity[v];
        }
        return c;
    }

    static int bySizeThenLex(int[] a, int[] b) {
        return a.length != b.length ? Integer.compare(a.length, b.length) : Arrays.compare(a, b);
    }

    static int[] concatSorted(int[] a, int[] b) {
        int[] out = Arrays.copyOf(a, a.length + b.length);
        System.arraycopy(b, 0, out, a.length, b.length);
        Arrays.sort(out);
        return out;
    }

    /**
     * Splits the cover sets into batches whose per-task count arrays fit {@code budgetBytes}; refuses
     * at once (a {@link UserError} with the estimate and what to change) when one cover set alone
     * does not fit.
     *
     * @param names variable names for the message
     * @return per batch, the cover-set indices (ascending)
     */
    public List<int[]> batches(long budgetBytes, List<String> names) {
        long maxCells = Math.min(budgetBytes / BYTES_PER_CELL, Integer.MAX_VALUE - 8);
        List<int[]> out = new ArrayList<>();
        List<Integer> cur = new ArrayList<>();
        long used = 0;
        for (int s = 0; s < covers.length; s++) {
            long c = coverCells[s];
            if (c > maxCells) {
                List<String> vs = new ArrayList<>();
                for (int v : covers[s]) {
                    vs.add(names.get(v) + "(" + arity[v] + ")");
                }
                double need = c * (double) BYTES_PER_CELL;
                long heap = Runtime.getRuntime().maxMemory();
                throw new UserError("cannot fit the tally: the variable set {" + String.join(", ", vs) + "} needs "
                        + String.format(Locale.ROOT, "%,d", c) + " count cells (" + bytes(need)
                        + ") in one task, more than --memory-budget " + bytes(budgetBytes)
                        + "; lower --max-parents, use --candidates K, exclude or discretise wide variables"
                        + (need <= heap / 2.0 ? ", or raise --memory-budget" : " or lower --max-states (raising"
                        + " --memory-budget cannot help: this JVM has " + bytes(heap) + ")"));
            }
            if (used + c > maxCells && !cur.isEmpty()) {
                out.add(cur.stream().mapToInt(Integer::intValue).toArray());
                cur.clear();
                used = 0;
            }
            cur.add(s);
            used += c;
        }
        if (!cur.isEmpty()) {
            out.add(cur.stream().mapToInt(Integer::intValue).toArray());
        }
        return out;
    }

    /**
     * Upper bound of the count cells the stored families need on the driver: per family
     * min(q, rows)·r counts plus min(q, rows) configuration indices, 8 bytes each.
     */
    public double storedBytesBound(long rows) {
        double b = 0;
        for (int f = 0; f < familyChild.length; f++) {
            double q = 1;
            for (int p : familyParents[f]) {
                q *= arity[p];
            }
            double configs = Math.min(q, rows);
            b += 8.0 * configs * (arity[familyChild[f]] + 1);
        }
        return b;
    }

    /** A byte count for people: 512 MB, 3.2 GB. */
    public static String bytes(double b) {
        String[] units = {"B", "KB", "MB", "GB", "TB"};
        int u = 0;
        while (b >= 1024 && u < units.length - 1) {
            b /= 1024;
            u++;
        }
        return (b == Math.rint(b) ? String.format(Locale.ROOT, "%.0f", b) : String.format(Locale.ROOT, "%.1f", b))
                + " " + units[u];
    }

    public int familyCount() {
        return familyChild.length;
    }

    public int child(int family) {
        return familyChild[family];
    }

    public int[] parents(int family) {
        return familyParents[family];
    }

    public int coverOf(int family) {
        return familyCover[family];
    }

    public int coverCount() {
        return covers.length;
    }

    public int[] cover(int s) {
        return covers[s];
    }

    public long coverCells(int s) {
        return coverCells[s];
    }

    /** Σ dense cells of all cover sets. */
    public long totalCells() {
        long t = 0;
        for (long c : coverCells) {
            t += c;
        }
        return t;
    }

    public int[] arity() {
        return arity.clone();
    }
}
