package org.edgewise.job;

import java.nio.file.Files;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.HexFormat;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.storage.StorageLevel;
import org.edgewise.driver.UserError;
import org.edgewise.driver.Version;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.InputInfo;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.StoreWriter;
import org.edgewise.driver.store.Variable;
import org.edgewise.job.count.CoverBatch;
import org.edgewise.job.count.Marginal;
import org.edgewise.job.input.Block;
import org.edgewise.job.input.Encoding;
import org.edgewise.job.input.Table;
import org.edgewise.job.input.TableScan;
import org.edgewise.job.plan.Candidates;
import org.edgewise.job.plan.Constraints;
import org.edgewise.job.plan.FamilyPlan;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The tally: read and check the input, encode it once into cached column-major blocks, plan the
 * families and their shared variable sets, count each batch of sets in one pass, marginalise and
 * score every family on the Spark driver, and write the store atomically. Nothing is written
 * unless everything succeeded.
 */
public final class TallyJob {
    private static final Logger LOG = LoggerFactory.getLogger(TallyJob.class);

    private TallyJob() {
    }

    /** What a finished tally did. */
    public record Summary(long rows, long droppedRows, int variables, int families, int coverSets,
                          int batches, long cells, double seconds, String fingerprint, List<String> warnings,
                          AugmentedTally.Report missingValues) {
        public Summary {
            warnings = warnings == null ? List.of() : List.copyOf(warnings);
        }

        public Summary(long rows, long droppedRows, int variables, int families, int coverSets,
                       int batches, long cells, double seconds, String fingerprint, List<String> warnings) {
            this(rows, droppedRows, variables, families, coverSets, batches, cells, seconds, fingerprint, warnings, null);
        }
    }

    /** Families counted and scored, in plan order. */
    record Counted(FamilyCounts[] families, double[] scores, int batches) {
    }

    public static Summary run(SparkSession spark, TallyOptions o) {
        return run(spark, o, table -> { });
    }

    /**
     * As {@link #run(SparkSession, TallyOptions)}; {@code opened} sees the table once its files and
     * their format are known, before any row is read (the command line refuses there what does not
     * apply to that format).
     */
    static Summary run(SparkSession spark, TallyOptions o, java.util.function.Consumer<Table> opened) {
        if (Files.exists(o.out()) && !o.overwrite()) {
            throw new UserError("output " + o.out() + " already exists; pass --overwrite to replace it");
        }
        Table table = Table.open(spark, o.inputs(), o.format(), o.delimiter(), o.encoding());
        opened.accept(table);
        return run(table, o);
    }

    /** The tally of an opened table (files, or a caller's Dataset through {@link Tally}); {@code o.inputs()} only labels it. */
    static Summary run(Table table, TallyOptions o) {
        long start = System.nanoTime();
        // every name the user gave is checked against the header before any pass over the data
        List<String> names = TableScan.selected(table, o);
        Constraints cons = Constraints.resolve(names, o.forbid(), o.require(), o.tiers(), o.maxParents());
        // the family count depends only on the header and d: refused before the rows are read
        FamilyPlan.checkBeforeScan(cons.candidates(), cons.required(), o.maxParents(),
                o.candidates() == null ? null : o.candidates() + (o.reserve() == null ? 0 : o.reserve()));
        if (o.missing() == TallyOptions.MissingPolicy.AVERAGE && o.candidates() != null) {
            throw new UserError("--missing average does not take --candidates: candidates chosen on one completion would"
                    + " bound every round; choose --missing drop or state with it");
        }
        TableScan.Result scan = TableScan.scan(table, o);
        Encoding enc = scan.encoding();
        List<String> warnings = new ArrayList<>();
        String sameNumber = org.edgewise.job.input.SameNumber.warning(names, scan.stats(), o.discretize().keySet());
        if (sameNumber != null) {
            LOG.info(sameNumber);
            warnings.add(sameNumber);
        }
        List<Variable> variables = enc.variables();
        for (String fewer : org.edgewise.job.input.BinCount.warnings(variables, o.discretize())) {
            LOG.info(fewer);
            warnings.add(fewer);
        }
        int[] arity = enc.arities();
        LOG.info("input: {} rows read, {} counted, {} variables ({})", scan.stats().rows(), scan.countedRows(),
                names.size(), describeArities(names, arity));

        JavaRDD<Block> blocks = scan.rawBlocks().map(enc::encode).persist(StorageLevel.MEMORY_AND_DISK_SER());
        try {
            long[] fp = blocks.map(Block::fingerprint).reduce((a, b) -> new long[] {a[0] + b[0], a[1] + b[1], a[2] ^ b[2]});
            scan.rawBlocks().unpersist(false);
            long rows = fp[0];
            if (rows != scan.countedRows()) {
                throw new IllegalStateException("encoded " + rows + " rows, expected " + scan.countedRows());
            }
            String fingerprint = HexFormat.of().toHexDigits(fp[1]) + HexFormat.of().toHexDigits(fp[2]);
            FamilyScore score = FamilyScore.of(o.score(), o.ess());

            int[][] cand = cons.candidates();
            int[][] req = cons.required();
            Map<String, List<String>> candidateMap = null;
            Map<String, List<String>> reserveMap = null;
            if (o.candidates() != null) {
                int[][] kept = cand;
                int[][] reserve = new int[names.size()][0];
                int wide = o.candidates() + (o.reserve() == null ? 0 : o.reserve());
                if (Candidates.needed(cand, o.candidates())) {
                    FamilyPlan pairs = FamilyPlan.pairs(arity, cand);
                    LOG.info("candidates: pairwise pass over {} variable pairs for --candidates {}", pairs.coverCount(),
                            o.candidates());
                    Counted pc = count(blocks, pairs, score, o.memoryBudget(), names, rows, "pairs");
                    double[][] gain = gains(pairs, pc, names.size());
                    kept = Candidates.prune(cand, req, gain, o.candidates());
                    if (o.reserve() != null) {
                        reserve = Candidates.reserve(cand, kept, gain, wide);
                    }
                }
                candidateMap = new LinkedHashMap<>();
                for (int i = 0; i < names.size(); i++) {
                    candidateMap.put(names.get(i), named(names, kept[i]));
                }
                if (o.reserve() != null) {
                    reserveMap = new LinkedHashMap<>();
                    for (int i = 0; i < names.size(); i++) {
                        reserveMap.put(names.get(i), named(names, reserve[i]));
                    }
                }
                cand = Candidates.union(kept, reserve);
            }
            FamilyPlan plan = FamilyPlan.families(arity, cand, req, o.maxParents());
            double bound = plan.storedBytesBound(rows);
            long heap = Runtime.getRuntime().maxMemory();
            if (bound > heap / 2.0) {
                throw new UserError("cannot fit the tally: " + plan.familyCount() + " families could hold up to "
                        + FamilyPlan.bytes(bound) + " of counts, more than half the driver's memory ("
                        + FamilyPlan.bytes(heap) + "); lower --max-parents or use --candidates K"
                        + " (or give the driver more memory)");
            }
            if (o.missing() == TallyOptions.MissingPolicy.AVERAGE && anyMissing(scan.stats(), names.size())) {
                long[] missingCells = new long[names.size()];
                for (int v = 0; v < missingCells.length; v++) {
                    missingCells[v] = scan.stats().missing(v);
                }
                Manifest m = Manifest.of("edgewise", Version.PROGRAM, Instant.now().toString(),
                        new InputInfo(o.inputs(), table.format(), rows, 0, o.missing().label(), fingerprint, o.weight()),
                        variables, o.maxParents(), null, cons.forbid(), cons.require(), cons.tiers(), o.score().label(),
                        o.ess());
                AugmentedTally.Report rep = AugmentedTally.run(blocks, o, names, arity, cand, req, m, rows, missingCells,
                        start);
                double secs = (System.nanoTime() - start) / 1e9;
                LOG.info("wrote {}: {} families from {} rows, averaged over missing values in {} rounds, {} s", o.out(),
                        plan.familyCount(), rows, rep.rounds(), String.format(Locale.ROOT, "%.1f", secs));
                // a pass over the complete rows, then one per chain and round over the incomplete ones
                int passes = plan.batches(o.memoryBudget(), names).size() * (1 + rep.rounds() * rep.chains());
                return new Summary(rows, 0, names.size(), plan.familyCount(), plan.coverCount(), passes, plan.totalCells(),
                        secs, fingerprint, warnings, rep);
            }
            Counted counted = count(blocks, plan, score, o.memoryBudget(), names, rows, "families");
            List<FamilyCounts> families = Arrays.asList(counted.families());
            Manifest m = Manifest.of("edgewise", Version.PROGRAM,
                    Instant.now().toString(),
                    new InputInfo(o.inputs(), table.format(), rows, scan.stats().dropped(),
                            o.missing().label(), fingerprint, o.weight()),
                    variables, o.maxParents(), candidateMap, cons.forbid(), cons.require(), cons.tiers(),
                    o.score().label(), o.ess()).withReserve(reserveMap);
            StoreWriter.write(o.out(), m, families, counted.scores(), o.overwrite(), "--overwrite");
            double secs = (System.nanoTime() - start) / 1e9;
            LOG.info("wrote {}: {} families from {} rows in {} s", o.out(), plan.familyCount(), rows,
                    String.format(Locale.ROOT, "%.1f", secs));
            return new Summary(rows, scan.stats().dropped(), names.size(), plan.familyCount(), plan.coverCount(),
                    counted.batches(), plan.totalCells(), secs, fingerprint, warnings);
        } finally {
            blocks.unpersist(false);
            scan.rawBlocks().unpersist(false);
        }
    }

    private static List<String> named(List<String> names, int[] vars) {
        List<String> out = new ArrayList<>();
        for (int v : vars) {
            out.add(names.get(v));
        }
        return out;
    }

    /** Counts every family of a plan, batch by batch (one pass over the blocks per batch), and scores it. */
    static Counted count(JavaRDD<Block> blocks, FamilyPlan plan, FamilyScore score, long budget,
                         List<String> names, long rows, String what) {
        List<int[]> batches = plan.batches(budget, names);
        LOG.info("plan ({}): {} families from {} variable sets, {} count cells, {} {} (per-task budget {})", what,
                plan.familyCount(), plan.coverCount(), String.format(Locale.ROOT, "%,d", plan.totalCells()),
                batches.size(), batches.size() == 1 ? "batch" : "batches", FamilyPlan.bytes(budget));
        int[][] byCover = familiesByCover(plan);
        FamilyCounts[] out = new FamilyCounts[plan.familyCount()];
        double[] scores = new double[plan.familyCount()];
        int done = 0;
        TallyProgress progress = TallyProgress.start(what, plan.familyCount(), batches.size(), rows, LOG);
        for (int b = 0; b < batches.size(); b++) {
            int[] ids = batches.get(b);
            CoverBatch cb = kernel(plan, ids);
            long[] dense = dense(blocks, cb);
            done += families(plan, ids, byCover, cb, dense, score, rows, out, scores);
            progress.update(b + 1, done, System.nanoTime());
        }
        return new Counted(out, scores, batches.size());
    }

    /** The counting kernel of one batch (the plan's cover sets {@code ids}, in that order). */
    static CoverBatch kernel(FamilyPlan plan, int[] ids) {
        int[][] sets = new int[ids.length][];
        for (int k = 0; k < ids.length; k++) {
            sets[k] = plan.cover(ids[k]);
        }
        return new CoverBatch(sets, plan.arity());
    }

    /** One pass over the blocks: the batch's dense counts (per partition, then summed). */
    static long[] dense(JavaRDD<Block> blocks, CoverBatch cb) {
        return blocks.mapPartitions(it -> Collections.singletonList(cb.countPartition(it)).iterator())
                .treeReduce(CoverBatch::sum, 2);
    }

    /** The families of each cover set, by cover set. */
    static int[][] familiesByCover(FamilyPlan plan) {
        List<List<Integer>> byCover = new ArrayList<>();
        for (int s = 0; s < plan.coverCount(); s++) {
            byCover.add(new ArrayList<>());
        }
        for (int f = 0; f < plan.familyCount(); f++) {
            byCover.get(plan.coverOf(f)).add(f);
        }
        int[][] out = new int[plan.coverCount()][];
        for (int s = 0; s < out.length; s++) {
            out[s] = byCover.get(s).stream().mapToInt(Integer::intValue).toArray();
        }
        return out;
    }

    /**
     * Marginalises and scores the families of one batch from its dense counts into {@code out} and
     * {@code scores} (families in parallel; each writes only its own slot). Returns how many.
     */
    static int families(FamilyPlan plan, int[] ids, int[][] byCover, CoverBatch cb, long[] dense, FamilyScore score,
                        long rows, FamilyCounts[] out, double[] scores) {
        int[] arity = plan.arity();
        int count = 0;
        for (int k = 0; k < ids.length; k++) {
            count += byCover[ids[k]].length;
        }
        int[] setOf = new int[count];
        int[] fam = new int[count];
        int i = 0;
        for (int k = 0; k < ids.length; k++) {
            for (int f : byCover[ids[k]]) {
                setOf[i] = k;
                fam[i++] = f;
            }
        }
        java.util.stream.IntStream.range(0, count).parallel().forEach(x -> {
            int k = setOf[x];
            int f = fam[x];
            FamilyCounts fc = Marginal.family(dense, cb.offset(k), plan.cover(ids[k]), arity, plan.child(f),
                    plan.parents(f));
            if (fc.total() != rows) {
                throw new IllegalStateException("family " + f + " sums to " + fc.total() + ", not " + rows);
            }
            double q = 1;
            for (int p : fc.parents()) {
                q *= arity[p];
            }
            out[f] = fc;
            scores[f] = score.logScore(fc.counts(), arity[fc.child()], q);
        });
        return count;
    }

    private static boolean anyMissing(org.edgewise.job.input.ColumnStats stats, int n) {
        for (int v = 0; v < n; v++) {
            if (stats.missing(v) > 0) {
                return true;
            }
        }
        return false;
    }

    /** gain[i][j] = s(i,{j}) − s(i,∅) from the pairwise pass. */
    static double[][] gains(FamilyPlan pairs, Counted c, int n) {
        double[] empty = new double[n];
        for (int f = 0; f < pairs.familyCount(); f++) {
            if (pairs.parents(f).length == 0) {
                empty[pairs.child(f)] = c.scores()[f];
            }
        }
        double[][] g = new double[n][n];
        for (int f = 0; f < pairs.familyCount(); f++) {
            if (pairs.parents(f).length == 1) {
                g[pairs.child(f)][pairs.parents(f)[0]] = c.scores()[f] - empty[pairs.child(f)];
            }
        }
        return g;
    }

    private static String describeArities(List<String> names, int[] arity) {
        StringBuilder sb = new StringBuilder();
        for (int v = 0; v < names.size() && v < 12; v++) {
            if (v > 0) {
                sb.append(", ");
            }
            sb.append(names.get(v)).append(':').append(arity[v]);
        }
        if (names.size() > 12) {
            sb.append(", …");
        }
        return sb.toString();
    }
}
