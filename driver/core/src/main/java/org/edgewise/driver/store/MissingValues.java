package org.edgewise.driver.store;

import java.util.Map;

/**
 * How a store's table dealt with its missing cells when they were averaged over by data augmentation
 * (Tanner &amp; Wong 1987) instead of dropped or made a state: the manifest's {@code missingValues}
 * (store format version 2; absent otherwise). Missing at random (Rubin 1976) is assumed.
 *
 * <p><b>What the store then means.</b> Its structure posterior is the sample of DAGs kept in the
 * sample directory {@code sample} inside the store (the DAGs of the rounds after burn-in, chain by
 * chain): the average over rounds of P(G | completed table), which estimates P(G | observed cells).
 * Every query answers from that sample. The Parquet counts and scores are those of one completed
 * table (chain 1's last round): a query's parameters (predictions, effects) come from that one
 * completion.
 *
 * @param method               {@code data augmentation}
 * @param assumption           {@code missing at random}
 * @param rounds               rounds per chain
 * @param burnIn               first rounds of each chain whose DAGs are not kept
 * @param chains               independent chains
 * @param drawsPerRound        DAGs drawn exactly from each kept round's completed table
 * @param seed                 the seed of every draw
 * @param dagPrior             the DAG prior of the draws ({@code order-modular})
 * @param sample               the sample directory inside the store
 * @param countsFrom           which completed table the Parquet parts hold, for people
 * @param incompleteRows       rows with at least one missing cell
 * @param incompleteRowShare   their share of the rows
 * @param missingCellShare     per variable, the share of its cells that were missing
 */
public record MissingValues(String method, String assumption, int rounds, int burnIn, int chains, int drawsPerRound,
                            long seed, String dagPrior, String sample, String countsFrom, long incompleteRows,
                            double incompleteRowShare, Map<String, Double> missingCellShare) {
    public static final String METHOD = "data augmentation";
    public static final String ASSUMPTION = "missing at random";
    /** The sample directory's name inside the store. */
    public static final String SAMPLE = "sample";

    public MissingValues {
        missingCellShare = missingCellShare == null ? Map.of() : java.util.Collections.unmodifiableMap(
                new java.util.LinkedHashMap<>(missingCellShare));
    }

    /** For people: "averaged over missing values by data augmentation, R rounds, burn-in B, …". */
    public String describe() {
        return "averaged over missing values by " + method + " (Tanner & Wong 1987; " + assumption + " assumed), "
                + rounds + " rounds, burn-in " + burnIn + ", " + chains + " chains, " + drawsPerRound
                + " exact " + dagPrior + " DAG draws per kept round";
    }
}
