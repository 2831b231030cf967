package org.edgewise.driver.query;

import java.util.concurrent.atomic.AtomicLong;
import java.util.stream.IntStream;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LogSum;

/**
 * P(y = k | evidence, D) for every state k of a target y and every row, from a model-averaged
 * {@link CaseProbability}: the ratio of averaged joints,
 * <pre>
 *   P(y = k | e, D) = P(y = k, e | D) / Σ_k' P(y = k', e | D),
 * </pre>
 * (the denominator is P(e | D), summed over y's states: one joint per state, normalised in log
 * space, so the states' probabilities add to 1 to rounding). Where the model is sampled, each
 * probability carries its Monte Carlo standard error ({@link CaseProbability#mcse}). Parallel over rows;
 * each row's numbers equal those of a call for that row alone.
 */
public final class TargetPrediction {
    /**
     * @param probability {@code probability[i][k]} = P(y = k | row i's evidence, D)
     * @param mcse        the same shape: Monte Carlo standard errors, or null when the model is not sampled
     */
    public record Result(double[][] probability, double[][] mcse) {
    }

    private TargetPrediction() {
    }

    /**
     * @param where per row how a message names it (e.g. "cases.csv: line 3")
     */
    public static Result run(CaseProbability model, TargetCases cases, int states, String[] where, ProgressListener progress) {
        int rows = cases.evidence().length;
        double[][] p = new double[rows][];
        double[][] e = model.sampled() ? new double[rows][] : null;
        AtomicLong done = new AtomicLong();
        progress.start("predict", rows);
        try {
            IntStream.range(0, rows).parallel().forEach(i -> {
                try {
                    if (model instanceof DagMixture dm) { // one pass per state gives both
                        double[][] pe = dm.conditionalOverStates(cases.target(), states, cases.evidence()[i]);
                        p[i] = pe[0];
                        e[i] = pe[1];
                    } else {
                        p[i] = row(model, cases.target(), cases.evidence()[i], states, where[i]);
                    }
                    if (e != null && e[i] == null) {
                        e[i] = new double[states];
                        for (int k = 0; k < states; k++) {
                            e[i][k] = model.mcse(single(cases.target(), k, cases.evidence()[i].length), cases.evidence()[i]);
                        }
                    }
                } catch (UserError x) {
                    throw x.getMessage().startsWith(where[i]) ? x : new UserError(where[i] + ": " + x.getMessage(), x);
                }
                long k = done.incrementAndGet();
                if (k % BatchPrediction.REPORT_EVERY == 0) {
                    progress.done(k);
                }
            });
            progress.done(rows);
        } finally {
            progress.finish();
        }
        return new Result(p, e);
    }

    /** P(y = k | evidence) for every k, from the joints log P(y = k, evidence). */
    static double[] row(CaseProbability model, int target, int[] evidence, int states, String where) {
        double[] lj = new double[states];
        int[] x = evidence.clone();
        for (int k = 0; k < states; k++) {
            x[target] = k;
            lj[k] = model.logProbability(x);
        }
        double z = LogSum.of(lj);
        if (z == Double.NEGATIVE_INFINITY) {
            throw new UserError(where + ": the row's cells have probability zero under the model; no prediction is defined");
        }
        double[] p = new double[states];
        for (int k = 0; k < states; k++) {
            p[k] = Math.exp(lj[k] - z);
        }
        return p;
    }

    /** A case observing only y = k. */
    static int[] single(int target, int k, int n) {
        int[] t = new int[n];
        java.util.Arrays.fill(t, CaseParser.HIDDEN);
        t[target] = k;
        return t;
    }
}
