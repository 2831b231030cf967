package org.edgewise.job.augment;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.Comparator;
import java.util.List;
import java.util.Random;
import java.util.SplittableRandom;
import org.edgewise.driver.average.augment.DrawnNetwork;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.edgewise.job.count.CoverBatch;
import org.edgewise.job.count.Marginal;
import org.edgewise.job.input.Block;
import org.edgewise.job.plan.FamilyPlan;
import org.junit.jupiter.api.Test;

/**
 * The rounds of {@code --missing average} counted on the driver ({@link IncompleteRows}: fixed sets
 * counted once, each round only the sets a row's missing cells touch, every chain in one pass) against
 * recounting the same draws in full: the independent per-row tally (InMemoryTally) and the cluster
 * path's kernel over every set (CoverBatch over the completed rows, {@link MissingCells#add}). Exact
 * equality of counts. Also: the draws and counts do not depend on how the rows were split into blocks
 * or ordered (the partitioning), on the number of threads, or on which chains share the pass. No Spark.
 */
class IncompleteRowsTest {
    private static final int[] ARITY = {2, 3, 4, 2, 3, 2};
    private static final int N = ARITY.length;
    private static final int D = 2;
    private static final FamilyScore BDEU = FamilyScore.of(ScoreKind.BDEU, 1);

    /** A chain a→b→c, d←a, e←c,d, f←e with 30 % of rows missing one or two cells ({@link Block#MISSING}). */
    static int[][] table(int rows, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        int[][] t = new int[rows][N];
        for (int[] x : t) {
            x[0] = rng.nextInt(2);
            x[1] = rng.nextDouble() < 0.7 ? x[0] : 2;
            x[2] = rng.nextDouble() < 0.6 ? x[1] : rng.nextInt(4);
            x[3] = rng.nextDouble() < 0.8 ? x[0] : 1 - x[0];
            x[4] = (x[2] + x[3] + (rng.nextDouble() < 0.3 ? 1 : 0)) % 3;
            x[5] = rng.nextDouble() < 0.75 ? x[4] % 2 : rng.nextInt(2);
            if (rng.nextDouble() < 0.3) {
                int hide = 1 + rng.nextInt(2);
                for (int h = 0; h < hide; h++) {
                    x[rng.nextInt(N)] = Block.MISSING;
                }
            }
        }
        return t;
    }

    static List<Variable> vars() {
        List<Variable> vs = new ArrayList<>();
        for (int v = 0; v < N; v++) {
            List<String> states = new ArrayList<>();
            for (int k = 0; k < ARITY[v]; k++) {
                states.add("s" + k);
            }
            vs.add(new Variable("v" + v, states));
        }
        return vs;
    }

    static boolean incomplete(int[] x) {
        return Arrays.stream(x).anyMatch(c -> c == Block.MISSING);
    }

    /** Rows as column-major blocks of at most {@code size} rows. */
    static List<Block> blocks(List<int[]> rows, int size) {
        List<Block> out = new ArrayList<>();
        for (int s = 0; s < rows.size(); s += size) {
            int m = Math.min(size, rows.size() - s);
            byte[][] cols = new byte[N][m];
            for (int t = 0; t < m; t++) {
                for (int v = 0; v < N; v++) {
                    cols[v][t] = (byte) rows.get(s + t)[v];
                }
            }
            out.add(new Block(m, cols));
        }
        return out;
    }

    static FamilyPlan plan() {
        int[][] cand = new int[N][];
        for (int v = 0; v < N; v++) {
            int vv = v;
            cand[v] = java.util.stream.IntStream.range(0, N).filter(u -> u != vv).toArray();
        }
        return FamilyPlan.families(ARITY, cand, new int[N][0], D);
    }

    /** The plan's batches as kernels; a small budget splits it into several. */
    static CoverBatch[] kernels(FamilyPlan plan, long budget, List<int[]> ids) {
        CoverBatch[] k = new CoverBatch[ids.size()];
        for (int b = 0; b < k.length; b++) {
            int[][] sets = new int[ids.get(b).length][];
            for (int i = 0; i < sets.length; i++) {
                sets[i] = plan.cover(ids.get(b)[i]);
            }
            k[b] = new CoverBatch(sets, ARITY);
        }
        return k;
    }

    /** A network with edges, its parameters drawn from the posterior given a completion of the table. */
    static DrawnNetwork network(int[][] rows, long seed) {
        int[][] filled = new int[rows.length][];
        SplittableRandom rng = new SplittableRandom(seed);
        for (int t = 0; t < rows.length; t++) {
            filled[t] = rows[t].clone();
            for (int v = 0; v < N; v++) {
                if (filled[t][v] == Block.MISSING) {
                    filled[t][v] = rng.nextInt(ARITY[v]);
                }
            }
        }
        ScoreStore s = InMemoryTally.tally(vars(), filled, D, BDEU);
        int[][] parents = {{}, {0}, {1}, {0}, {2, 3}, {4}};
        return DrawnNetwork.draw(s, BDEU, parents, rng);
    }

    /** Families of the plan from per-batch dense counts. */
    static List<FamilyCounts> families(FamilyPlan plan, List<int[]> ids, CoverBatch[] kernels, long[][] dense) {
        List<FamilyCounts> out = new ArrayList<>();
        for (int b = 0; b < kernels.length; b++) {
            int[] batch = ids.get(b);
            for (int k = 0; k < batch.length; k++) {
                for (int f = 0; f < plan.familyCount(); f++) {
                    if (plan.coverOf(f) == batch[k]) {
                        out.add(Marginal.family(dense[b], kernels[b].offset(k), plan.cover(batch[k]), ARITY, plan.child(f),
                                plan.parents(f)));
                    }
                }
            }
        }
        out.sort(Comparator.comparingInt(FamilyCounts::child).thenComparing(fc -> Arrays.toString(fc.parents())));
        return out;
    }

    static void assertSame(List<FamilyCounts> a, List<FamilyCounts> b) {
        assertEquals(a.size(), b.size());
        for (int i = 0; i < a.size(); i++) {
            assertEquals(a.get(i).child(), b.get(i).child());
            assertArrayEquals(a.get(i).parents(), b.get(i).parents());
            assertArrayEquals(a.get(i).configs(), b.get(i).configs(), "configs of family " + i);
            assertArrayEquals(a.get(i).counts(), b.get(i).counts(), "counts of family " + i);
        }
    }

    @Test
    void aRoundCountsWhatARecountOfTheSameDrawsCounts() {
        int[][] rows = table(3000, 11);
        List<int[]> complete = new ArrayList<>();
        List<int[]> missing = new ArrayList<>();
        for (int[] x : rows) {
            (incomplete(x) ? missing : complete).add(x);
        }
        assertTrue(missing.size() > 700 && missing.size() < 1100, "about 30 % incomplete: " + missing.size());
        FamilyPlan plan = plan();
        List<String> names = vars().stream().map(Variable::name).toList();
        for (long budget : new long[] {256L << 20, 12L * 40}) { // one batch; several small ones
            List<int[]> ids = plan.batches(budget, names);
            CoverBatch[] kernels = kernels(plan, budget, ids);
            IncompleteRows inc = IncompleteRows.of(blocks(missing, 100), N);
            long[][] fixed = inc.fixedCounts(kernels);
            for (int b = 0; b < kernels.length; b++) {
                CoverBatch.sum(fixed[b], kernels[b].countPartition(blocks(complete, 500).iterator()));
            }
            DrawnNetwork[] nets = {network(rows, 1), network(rows, 2)};
            long[] seeds = {101, 202};
            long[][][] round = inc.round(kernels, nets, seeds, 2);
            for (int c = 0; c < 2; c++) {
                long[][] dense = new long[kernels.length][];
                for (int b = 0; b < kernels.length; b++) {
                    dense[b] = CoverBatch.sum(round[c][b].clone(), fixed[b]);
                }
                List<FamilyCounts> mine = families(plan, ids, kernels, dense);
                // the same draws, recounted in full
                int[][] completed = inc.completed(nets[c], seeds[c]);
                List<int[]> all = new ArrayList<>(complete);
                all.addAll(Arrays.asList(completed));
                // (1) the independent per-row tally
                List<FamilyCounts> ref = new ArrayList<>(InMemoryTally.tally(vars(), all.toArray(int[][]::new), D, BDEU)
                        .families());
                ref.sort(Comparator.comparingInt(FamilyCounts::child).thenComparing(fc -> Arrays.toString(fc.parents())));
                assertSame(ref, mine);
                // (2) the cluster path: every set over the completed rows, added to the complete rows' families
                long[][] full = new long[kernels.length][];
                long[][] ofComplete = new long[kernels.length][];
                for (int b = 0; b < kernels.length; b++) {
                    full[b] = kernels[b].countPartition(blocks(Arrays.asList(completed), 300).iterator());
                    ofComplete[b] = kernels[b].countPartition(blocks(complete, 500).iterator());
                }
                List<FamilyCounts> a = families(plan, ids, kernels, ofComplete);
                List<FamilyCounts> r = families(plan, ids, kernels, full);
                List<FamilyCounts> added = new ArrayList<>();
                for (int i = 0; i < a.size(); i++) {
                    added.add(MissingCells.add(a.get(i), r.get(i), ARITY[a.get(i).child()]));
                }
                assertSame(added, mine);
            }
        }
    }

    @Test
    void drawsAndCountsDoNotDependOnBlocksOrderThreadsOrTheOtherChain() {
        int[][] rows = table(2000, 5);
        List<int[]> missing = new ArrayList<>();
        for (int[] x : rows) {
            if (incomplete(x)) {
                missing.add(x);
            }
        }
        FamilyPlan plan = plan();
        List<int[]> ids = plan.batches(256L << 20, vars().stream().map(Variable::name).toList());
        CoverBatch[] kernels = kernels(plan, 256L << 20, ids);
        DrawnNetwork a = network(rows, 3);
        DrawnNetwork b = network(rows, 4);
        IncompleteRows one = IncompleteRows.of(blocks(missing, Block.ROWS), N);
        List<int[]> shuffled = new ArrayList<>(missing);
        Collections.shuffle(shuffled, new Random(9)); // fixed seed: common practice
        IncompleteRows many = IncompleteRows.of(blocks(shuffled, 37), N);
        assertEquals(missing.size(), many.rows());
        int[][] c1 = one.completed(a, 77);
        int[][] c2 = many.completed(a, 77);
        for (int t = 0; t < c1.length; t++) {
            assertArrayEquals(c1[t], c2[t], "row " + t + " of the canonical order");
        }
        long[][][] both = one.round(kernels, new DrawnNetwork[] {a, b}, new long[] {77, 88}, 1);
        long[][][] bothMany = many.round(kernels, new DrawnNetwork[] {a, b}, new long[] {77, 88}, 3);
        long[][][] onlyB = many.round(kernels, new DrawnNetwork[] {b}, new long[] {88}, 2);
        assertArrayEquals(both[0][0], bothMany[0][0]);
        assertArrayEquals(both[1][0], bothMany[1][0]);
        assertArrayEquals(both[1][0], onlyB[0][0]);
        // another seed draws otherwise (the test can fail)
        long[][][] other = one.round(kernels, new DrawnNetwork[] {a}, new long[] {78}, 1);
        assertTrue(!Arrays.equals(both[0][0], other[0][0]), "seed 78 draws the same as 77");
        // the fixed sets' counts are those of the observed cells alone, whatever the split
        assertArrayEquals(one.fixedCounts(kernels)[0], many.fixedCounts(kernels)[0]);
    }
}
