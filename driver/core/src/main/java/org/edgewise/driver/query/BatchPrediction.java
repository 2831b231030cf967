package org.edgewise.driver.query;

import java.util.concurrent.atomic.AtomicLong;
import java.util.stream.IntStream;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;

/**
 * Log probabilities of many cases at once, in parallel over the cases, under the averaged model
 * and under the single best network; each case's numbers equal those of a one-by-one call. A
 * user mistake in one case is reported as {@code case k: …} (k from 1).
 */
public final class BatchPrediction {
    /** Progress is reported every this many cases. */
    static final int REPORT_EVERY = 1000;

    /**
     * One log probability per case, in input order.
     *
     * @param averaged log P(case | D) (or the conditional) under the averaged model
     * @param best     the same under the single best network
     */
    public record Result(double[] averaged, double[] best) {
    }

    private BatchPrediction() {
    }

    /**
     * log P(case | D) for every case, or log P(case | given, D) when {@code given} is not null.
     *
     * @param cases    state indices per case, {@link CaseParser#HIDDEN} for hidden variables
     * @param progress told {@code start("predict", cases.length)}, then cases done
     */
    public static Result run(CaseProbability averaged, CaseProbability best, int[][] cases, int[] given,
                             ProgressListener progress) {
        int rows = cases.length;
        double[] a = new double[rows];
        double[] b = new double[rows];
        AtomicLong done = new AtomicLong();
        progress.start("predict", rows);
        try {
            IntStream.range(0, rows).parallel().forEach(i -> {
                try {
                    a[i] = logProbability(averaged, cases[i], given);
                    b[i] = logProbability(best, cases[i], given);
                } catch (UserError e) {
                    throw new UserError("case " + (i + 1) + ": " + e.getMessage(), e);
                }
                long k = done.incrementAndGet();
                if (k % REPORT_EVERY == 0) {
                    progress.done(k);
                }
            });
            progress.done(rows);
        } finally {
            progress.finish();
        }
        return new Result(a, b);
    }

    /** log P(target | D), or log P(target | given, D) when {@code given} is not null. */
    public static double logProbability(CaseProbability p, int[] target, int[] given) {
        return given == null ? p.logProbability(target) : p.logConditional(target, given);
    }
}
