package org.edgewise.driver.average.mcmc;

import java.util.Locale;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.partition.PartitionChain;

/**
 * The memory an MCMC run over orders or partitions will hold, planned before any chain starts
 * from the store and the settings alone, and checked against the JVM's heap.
 *
 * <ul>
 *   <li>Per-child tables ({@link ChildTables}): 8·2^K bytes for a child with K candidates when it
 *       is tabulated (fewest candidates first, within the table budget; K ≤ {@value ChildTables#MAX_TABLE_BITS}),
 *       shared by all chains.</li>
 *   <li>Per non-tabulated child and per chain (each rung of a tempered ladder is a chain): a
 *       direct-mapped cache of 4,096 entries of 17 bytes (key, value, used flag) = 69,632 bytes.</li>
 *   <li>Per chain (each rung): the state, {@value #STATE_BYTES_PER_VARIABLE} bytes per variable
 *       (order, positions, masks, log sums and the scratch of one proposal and one relocation);
 *       shared by all chains, the index of each child's candidates, 4n² bytes (order chains; counted
 *       for every sampler, an upper bound). A partition chain holds besides its DAG: children
 *       bitsets, a set index per child and its partition state ({@code PartitionChain.extraBytes}).</li>
 *   <li>Per reported chain, its {@link DrawStore}: at most 2·cap draws of
 *       4·E + 8n + 2n²/8 (with features) + {@value #DRAW_OVERHEAD} bytes, E the candidate edges
 *       (one float each), 8n an upper bound of the stored state (an order, and for partitions the
 *       parent-set choice), 2n² feature bits, and object headers and the step and score.</li>
 * </ul>
 * The figures count the arrays' payload plus a fixed header per object; they are an estimate to
 * within a few per cent, not a measurement. Transient memory (the diagnostics' per-quantity
 * arrays, made and dropped check by check) is not counted.
 *
 * @param tableBytes     bytes of the per-child tables
 * @param tabulated      children with a table
 * @param direct         children summed directly (with a cache per chain)
 * @param chainBytes     bytes per chain or rung (state and caches)
 * @param sharedBytes    bytes of state all chains share (the candidate index)
 * @param drawBytes      bytes per reported chain's draw store, when full (2·cap draws)
 * @param chains         reported chains
 * @param rungs          chains per reported chain (tempering; 1 without)
 */
public record McmcMemory(long tableBytes, int tabulated, int direct, long chainBytes, long sharedBytes, long drawBytes,
                         int chains, int rungs) {
    /** Bytes of one chain's state per variable: 3 int arrays and 9 long/double arrays of length n. */
    static final int STATE_BYTES_PER_VARIABLE = 3 * 4 + 9 * 8;
    /** Bytes of one direct-mapped cache (one per non-tabulated child per chain). */
    static final long CACHE_BYTES = 4096L * 17;
    /** Per stored draw: headers of the row, state record and its arrays, the list slot, step and score. */
    static final int DRAW_OVERHEAD = 96;

    /** Everything together, bytes. */
    public long totalBytes() {
        return tableBytes + sharedBytes + (long) chains * (rungs * chainBytes + drawBytes);
    }

    /**
     * The plan for {@code s} on {@code ls}, each reported chain a ladder of {@code rungs} chains:
     * which children the table budget tabulates, and the chains' and draw stores' bytes.
     */
    public static McmcMemory plan(LocalScores ls, McmcSettings s, int rungs) {
        return plan(ls, s, rungs, 0);
    }

    /**
     * As above, each chain holding {@code extraChainBytes} more than an order chain (a partition
     * chain's DAG and set index: {@code PartitionChain.extraBytes}).
     */
    public static McmcMemory plan(LocalScores ls, McmcSettings s, int rungs, long extraChainBytes) {
        int n = ls.variableCount();
        ChildTables.Plan tp = ChildTables.plan(ls, s.tableBudget());
        int direct = n - tp.children().length;
        long chain = (long) STATE_BYTES_PER_VARIABLE * n + direct * CACHE_BYTES + extraChainBytes;
        long edges = ChainSet.edgeOffsets(ls)[n];
        long perDraw = 4 * edges + 8L * n + (s.features() ? ((2L * n * n + 63) >>> 6) * 8 : 0) + DRAW_OVERHEAD;
        long cap = s.untilConverged() ? s.targets().drawsPerChain(s.draws(), s.chains()) : s.draws();
        return new McmcMemory(tp.bytes(), tp.children().length, direct, chain, 4L * n * n, 2 * cap * perDraw, s.chains(),
                rungs);
    }

    /** One line: the total and its parts, in MiB. */
    public String describe() {
        return String.format(Locale.ROOT, "%s (per-child tables %s for %d of %d children, draw stores %s, chain state %s)",
                mib(totalBytes()), mib(tableBytes), tabulated, tabulated + direct, mib(chains * drawBytes),
                mib((long) chains * rungs * chainBytes + sharedBytes));
    }

    static String mib(long bytes) {
        return String.format(Locale.ROOT, "%.1f MiB", bytes / 1048576.0);
    }

    /**
     * Refuses when the plan needs more than {@code freeHeap} bytes.
     *
     * @param freeHeap bytes the heap can still give (its maximum less what is in use)
     * @param maxHeap  the heap's maximum, bytes (named in the refusal)
     */
    public void check(long freeHeap, long maxHeap) {
        if (totalBytes() > freeHeap) {
            throw new TooLittleHeap(this, freeHeap, maxHeap);
        }
    }

    /**
     * Checks the plan against this JVM: its maximum heap less what is in use; when that is too
     * little, once more after a garbage collection (the in-use figure counts garbage).
     */
    public void checkHere() {
        Runtime rt = Runtime.getRuntime();
        if (totalBytes() <= rt.maxMemory() - (rt.totalMemory() - rt.freeMemory())) {
            return;
        }
        System.gc();
        check(rt.maxMemory() - (rt.totalMemory() - rt.freeMemory()), rt.maxMemory());
    }

    /**
     * The planned memory does not fit the heap: carries the plan and the heap so a front end can
     * name its own way to raise the heap.
     */
    public static final class TooLittleHeap extends org.edgewise.driver.WordedError {
        private final McmcMemory plan;
        private final long freeHeap;
        private final long maxHeap;

        TooLittleHeap(McmcMemory plan, long freeHeap, long maxHeap) {
            super(text(plan, freeHeap, maxHeap, "give the JVM more heap (-Xmx), or store fewer draws or run fewer chains"));
            this.plan = plan;
            this.freeHeap = freeHeap;
            this.maxHeap = maxHeap;
        }

        /** The refusal with {@code remedy} (how to raise the heap, what to lower) in the front end's words. */
        public String message(String remedy) {
            return text(plan, freeHeap, maxHeap, remedy);
        }

        private static String text(McmcMemory plan, long freeHeap, long maxHeap, String remedy) {
            return "the MCMC run needs about " + plan.describe() + " but the heap has " + mib(freeHeap) + " free of "
                    + mib(maxHeap) + "; " + remedy;
        }

        @Override
        public String worded(org.edgewise.driver.InputNames names, String heapSetting) {
            return message("raise it with " + heapSetting + ", or lower " + names.draws() + " or " + names.chains());
        }

        public McmcMemory plan() {
            return plan;
        }
    }
}
