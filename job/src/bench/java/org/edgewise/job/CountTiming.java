package org.edgewise.job;

import java.util.List;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.sql.SparkSession;
import org.apache.spark.storage.StorageLevel;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.job.input.Block;
import org.edgewise.job.input.Table;
import org.edgewise.job.input.TableScan;
import org.edgewise.job.plan.Constraints;
import org.edgewise.job.plan.FamilyPlan;

/**
 * For {@code scripts/bench missing}: the time of one counting pass of a plain tally (count every
 * family of the plan, marginalise and score) over a table's rows, read and encoded beforehand and not
 * timed. Not a test; never in a jar.
 */
public final class CountTiming {
    private CountTiming() {
    }

    /** Seconds of the counting pass over the table {@code o} names. */
    public static double countSeconds(SparkSession spark, TallyOptions o) {
        Table table = Table.open(spark, o.inputs(), o.format(), o.delimiter(), o.encoding());
        List<String> names = TableScan.selected(table, o);
        Constraints cons = Constraints.resolve(names, o.forbid(), o.require(), o.tiers(), o.maxParents());
        TableScan.Result scan = TableScan.scan(table, o);
        JavaRDD<Block> blocks = scan.rawBlocks().map(scan.encoding()::encode).persist(StorageLevel.MEMORY_AND_DISK_SER());
        try {
            long rows = blocks.map(b -> (long) b.rows()).fold(0L, Long::sum);
            FamilyPlan plan = FamilyPlan.families(scan.encoding().arities(), cons.candidates(), cons.required(),
                    o.maxParents());
            long t0 = System.nanoTime();
            TallyJob.count(blocks, plan, FamilyScore.of(o.score(), o.ess()), o.memoryBudget(), names, rows,
                    "families, the incomplete rows alone");
            return (System.nanoTime() - t0) / 1e9;
        } finally {
            blocks.unpersist(false);
            scan.rawBlocks().unpersist(false);
        }
    }
}
