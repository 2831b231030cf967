package org.edgewise.job;

import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.SplittableRandom;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.broadcast.Broadcast;
import org.apache.spark.storage.StorageLevel;
import org.edgewise.driver.UserError;
import org.edgewise.driver.Version;
import org.edgewise.driver.analysis.MissingValuesStore;
import org.edgewise.driver.average.augment.Augmentation;
import org.edgewise.driver.average.augment.DrawnNetwork;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.MissingValues;
import org.edgewise.job.augment.IncompleteRows;
import org.edgewise.job.augment.MissingCells;
import org.edgewise.job.count.CoverBatch;
import org.edgewise.job.input.Block;
import org.edgewise.job.plan.FamilyPlan;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * {@code --missing average}: the tally of a table whose missing cells are averaged over by data
 * augmentation ({@link Augmentation}; missing at random assumed). The complete rows are counted once;
 * each round redraws the missing cells of the incomplete rows in one Spark pass per chain (every
 * task's random stream derived from the round's seed and its partition index: the same seed and
 * partitioning give the same store; another partitioning gives other, equally valid draws) and counts those
 * rows again, and the DAGs and parameters of the next round are drawn on the Spark driver. The store
 * holds the last completed table and the kept DAGs ({@link MissingValuesStore}).
 */
public final class AugmentedTally {
    private static final Logger LOG = LoggerFactory.getLogger(AugmentedTally.class);

    /**
     * Most bytes the incomplete rows and their round's counts may take on the driver ({@link IncompleteRows#bytes});
     * beyond it they are redrawn on the cluster. Negative: a quarter of the driver's heap (tests lower it).
     */
    static volatile long driverBound = -1;

    private AugmentedTally() {
    }

    /** What a tally averaged over missing values reports beyond a plain one. */
    public record Report(long incompleteRows, double incompleteRowShare, Map<String, Double> missingCellShare, int rounds,
                  int burnIn, int chains, double[] roundSeconds, double completeRowsSeconds, double maxRhat,
                  boolean converged) {
    }

    /**
     * @param blocks encoded rows, missing cells {@link Block#MISSING}
     * @param rows   rows in all
     */
    static Report run(JavaRDD<Block> blocks, TallyOptions o, List<String> names, int[] arity, int[][] cand, int[][] req,
                      Manifest manifest, long rows, long[] missingCells, long start) {
        int n = names.size();
        if (n > Augmentation.MAX_VARIABLES) {
            throw new UserError("--missing average draws the network of each round exactly, for at most "
                    + Augmentation.MAX_VARIABLES + " variables; the table has " + n
                    + " (choose fewer with --columns, or --missing drop)");
        }
        long[] observed = blocks.map(MissingCells::observed).reduce(MissingCells::sum);
        long[][] marginals = new long[n][];
        for (int v = 0; v < n; v++) {
            marginals[v] = java.util.Arrays.copyOfRange(observed, v * 256, v * 256 + arity[v]);
            if (missingCells[v] >= rows) {
                throw new UserError("column '" + names.get(v) + "' has no values (every cell is missing); leave it out"
                        + " with --exclude " + names.get(v));
            }
        }
        JavaRDD<Block> complete = blocks.map(b -> MissingCells.select(b, true)).filter(b -> b.rows() > 0)
                .persist(StorageLevel.MEMORY_AND_DISK_SER());
        JavaRDD<Block> incomplete = blocks.map(b -> MissingCells.select(b, false)).filter(b -> b.rows() > 0)
                .persist(StorageLevel.MEMORY_AND_DISK_SER());
        try {
            long incompleteRows = incomplete.map(MissingCells::units).fold(0L, Long::sum);
            long completeRows = rows - incompleteRows;
            int[] ar = arity.clone();
            long[] widest = incomplete.map(b -> MissingCells.largestJoint(b, ar)).fold(new long[] {1}, MissingCells::larger);
            if (widest[0] > DrawnNetwork.MAX_JOINT) {
                List<String> vars = new ArrayList<>();
                for (int i = 1; i < widest.length; i++) {
                    vars.add(names.get((int) widest[i]));
                }
                throw new UserError("--missing average: a row misses " + vars.size() + " values (" + String.join(", ", vars)
                        + ") whose joint takes " + (widest[0] == Long.MAX_VALUE ? "too many" : String.format(Locale.ROOT, "%,d", widest[0]))
                        + " values; at most " + String.format(Locale.ROOT, "%,d", DrawnNetwork.MAX_JOINT)
                        + " are enumerated exactly per row (leave some of them out with --exclude, or choose --missing drop)");
            }
            FamilyScore score = FamilyScore.of(o.score(), o.ess());
            FamilyPlan plan = FamilyPlan.families(arity, cand, req, o.maxParents());
            Augmentation.Settings s = o.rounds() == null ? Augmentation.Settings.untilConverged(o.seedOrDefault())
                    : Augmentation.Settings.of(o.rounds(), o.seedOrDefault());
            int threads = Math.max(1, Runtime.getRuntime().availableProcessors());
            long bytes = IncompleteRows.bytes(incompleteRows, n, plan.totalCells(), s.chains(), threads);
            long c0 = System.nanoTime();
            Augmentation.Recount recount;
            long bound = driverBound >= 0 ? driverBound : Runtime.getRuntime().maxMemory() / 4;
            if (bytes <= bound && incompleteRows * n < Integer.MAX_VALUE) {
                LOG.info("missing values: the {} incomplete rows redrawn and counted on the driver ({} threads, {})",
                        incompleteRows, threads, FamilyPlan.bytes(bytes));
                recount = onDriver(complete, incomplete, plan, score, o, names, rows, n, threads);
            } else if (o.weight() != null) {
                throw new UserError("--missing average with --weight " + o.weight() + ": the incomplete lines stand for "
                        + String.format(Locale.ROOT, "%,d", incompleteRows) + " rows, whose draws need "
                        + FamilyPlan.bytes(bytes) + " on the driver, more than a quarter of its memory ("
                        + FamilyPlan.bytes(Runtime.getRuntime().maxMemory()) + "); give the driver more memory,"
                        + " or choose --missing drop");
            } else {
                LOG.info("missing values: the {} incomplete rows redrawn and counted on the cluster ({} would not fit the"
                        + " driver's memory)", incompleteRows, FamilyPlan.bytes(bytes));
                recount = onCluster(complete, incomplete, plan, score, o, names, arity, rows, completeRows, incompleteRows);
            }
            double completeSeconds = (System.nanoTime() - c0) / 1e9;
            DrawnNetwork first = DrawnNetwork.marginals(arity, marginals, o.score().usesEss() ? o.ess() : 1);
            Augmentation.Outcome outcome = Augmentation.run(manifest, score, first, s, recount, (round, secs, check) ->
                    LOG.info("missing values: round {}{} ({} chains) in {} s{}", round + 1,
                            s.untilConverged() ? " (until converged, at most " + s.rounds() + ")" : " of " + s.rounds(),
                            s.chains(), String.format(Locale.ROOT, "%.1f", secs), check == null ? ""
                                    : String.format(Locale.ROOT, "; over rounds %d-%d largest R̂ %.4f, smallest bulk ESS %.0f%s",
                                    check.fromRound(), check.toRound(), check.maxRhat(), check.minEss(),
                                    check.converged() ? " (converged)" : "")));
            Augmentation.Settings ran = outcome.settings();
            Map<String, Double> share = new LinkedHashMap<>();
            for (int v = 0; v < n; v++) {
                share.put(names.get(v), (double) missingCells[v] / rows);
            }
            MissingValues mv = new MissingValues(MissingValues.METHOD, MissingValues.ASSUMPTION, ran.rounds(), ran.burnIn(),
                    ran.chains(), ran.drawsPerRound(), ran.seed(), DagPrior.ORDER_MODULAR.label(), MissingValues.SAMPLE,
                    "the completed table of chain 1's last round", incompleteRows, (double) incompleteRows / rows, share);
            Manifest m = manifest.withMissingValues(mv);
            double secs = (System.nanoTime() - start) / 1e9;
            MissingValuesStore.Convergence conv = MissingValuesStore.write(o.out(), m, outcome, secs, o.overwrite(),
                    "--overwrite");
            return new Report(incompleteRows, (double) incompleteRows / rows, share, ran.rounds(), ran.burnIn(), ran.chains(),
                    outcome.roundSeconds(), completeSeconds, conv.maxRhat(), conv.converged());
        } finally {
            complete.unpersist(false);
            incomplete.unpersist(false);
        }
    }

    /**
     * The rounds on the Spark driver ({@link IncompleteRows}): the complete rows counted once on the
     * cluster, the incomplete rows collected once in canonical order and their fixed sets counted once;
     * each round redraws and counts every chain in one multi-threaded pass over the incomplete rows,
     * then marginalises and scores the families. The counts do not depend on the partitioning.
     */
    static Augmentation.Recount onDriver(JavaRDD<Block> complete, JavaRDD<Block> incomplete, FamilyPlan plan,
                                         FamilyScore score, TallyOptions o, List<String> names, long rows, int n,
                                         int threads) {
        List<int[]> ids = plan.batches(o.memoryBudget(), names);
        CoverBatch[] kernels = new CoverBatch[ids.size()];
        long[][] fixed = new long[ids.size()][];
        for (int b = 0; b < kernels.length; b++) {
            kernels[b] = TallyJob.kernel(plan, ids.get(b));
            fixed[b] = TallyJob.dense(complete, kernels[b]);
        }
        IncompleteRows inc = IncompleteRows.of(incomplete.collect(), n);
        long[][] once = inc.fixedCounts(kernels);
        for (int b = 0; b < kernels.length; b++) {
            CoverBatch.sum(fixed[b], once[b]);
        }
        int[][] byCover = TallyJob.familiesByCover(plan);
        return (round, networks, seeds) -> {
            long r0 = System.nanoTime();
            long[][][] redrawn = inc.round(kernels, networks, seeds, threads);
            long r1 = System.nanoTime();
            Augmentation.Completed[] out = new Augmentation.Completed[networks.length];
            for (int c = 0; c < networks.length; c++) {
                FamilyCounts[] fams = new FamilyCounts[plan.familyCount()];
                double[] scores = new double[plan.familyCount()];
                for (int b = 0; b < kernels.length; b++) {
                    long[] dense = CoverBatch.sum(redrawn[c][b], fixed[b]);
                    TallyJob.families(plan, ids.get(b), byCover, kernels[b], dense, score, rows, fams, scores);
                }
                out[c] = new Augmentation.Completed(Arrays.asList(fams), scores);
            }
            LOG.info("missing values: round {}: redrawn and counted in {} s, families marginalised and scored in {} s",
                    round + 1, String.format(Locale.ROOT, "%.2f", (r1 - r0) / 1e9),
                    String.format(Locale.ROOT, "%.2f", (System.nanoTime() - r1) / 1e9));
            return out;
        };
    }

    /**
     * The rounds on the cluster, chain by chain: one Spark pass per chain and round redraws every
     * missing cell (each task's stream from the round's seed and its partition index: the draws depend
     * on the partitioning) and counts the completed rows, added to the complete rows' counts.
     */
    static Augmentation.Recount onCluster(JavaRDD<Block> complete, JavaRDD<Block> incomplete, FamilyPlan plan,
                                          FamilyScore score, TallyOptions o, List<String> names, int[] arity, long rows,
                                          long completeRows, long incompleteRows) {
        FamilyCounts[] fixed = TallyJob.count(complete, plan, score, o.memoryBudget(), names, completeRows,
                "families, complete rows").families();
        return Augmentation.chainByChain((chain, round, net, seed) -> {
            Broadcast<DrawnNetwork> b = org.apache.spark.api.java.JavaSparkContext.fromSparkContext(incomplete.context()).broadcast(net);
            JavaRDD<Block> filled = incomplete.mapPartitionsWithIndex((part, it) -> {
                SplittableRandom rng = new SplittableRandom(seed ^ (0x9E3779B97F4A7C15L * (part + 1)));
                List<Block> out = new ArrayList<>();
                it.forEachRemaining(blk -> out.add(MissingCells.complete(blk, b.value(), rng)));
                return out.iterator();
            }, true);
            FamilyCounts[] redrawn = TallyJob.count(filled, plan, score, o.memoryBudget(), names, incompleteRows,
                    "families, completed rows, chain " + (chain + 1) + " round " + (round + 1)).families();
            b.destroy();
            List<FamilyCounts> all = new ArrayList<>(fixed.length);
            double[] scores = new double[fixed.length];
            for (int f = 0; f < fixed.length; f++) {
                FamilyCounts fc = MissingCells.add(fixed[f], redrawn[f], arity[fixed[f].child()]);
                double q = 1;
                for (int p : fc.parents()) {
                    q *= arity[p];
                }
                all.add(fc);
                scores[f] = score.logScore(fc.counts(), arity[fc.child()], q);
            }
            return new Augmentation.Completed(all, scores);
        });
    }
}
