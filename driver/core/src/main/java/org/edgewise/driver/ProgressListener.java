package org.edgewise.driver;

import java.util.function.LongConsumer;

/**
 * Progress of a long computation, reported by the engines (exact sum over orders, order MCMC,
 * batch prediction) to whoever shows it — the CLI adapts it to its progress bar; a library user
 * passes {@link #NONE}. Calls may come from several threads; {@link #done} is cumulative.
 */
public interface ProgressListener {
    /** Ignores everything. */
    ProgressListener NONE = done -> { };

    /** Work named {@code task} with {@code total} units (≤ 0: unknown) begins. */
    default void start(String task, long total) {
    }

    /** {@code done} units of the current task are complete (non-decreasing, at most the total). */
    void done(long done);

    /**
     * MCMC: the acceptance rate so far, and from the last convergence check the largest R̂ and the
     * smallest bulk-ESS (NaN before the first check).
     */
    default void chainState(double acceptance, double maxRhat, double minEss) {
    }

    /**
     * MCMC after a convergence check: the acceptance rate, the largest R̂, the smallest bulk-ESS and
     * the largest Monte Carlo standard error of a reported probability (each NaN before the first
     * check), with the targets each is held to.
     */
    record ChainState(double acceptance, double maxRhat, double minEss, double maxMcse, double rhatTarget,
                      double essTarget, double mcseTarget) {
    }

    /** MCMC progress with the MCSE and the targets; by default passed on to {@link #chainState(double, double, double)}. */
    default void chainState(ChainState s) {
        chainState(s.acceptance(), s.maxRhat(), s.minEss());
    }

    /** One line worth showing before or during a task (e.g. the memory a run has planned). */
    default void note(String line) {
    }

    /** The current task ended (normally or not). */
    default void finish() {
    }

    /**
     * A sink for an engine that reports parts per million from several threads, possibly out of
     * order: passes on to {@link #done} only values above the largest seen, so {@code done} stays
     * non-decreasing.
     */
    default LongConsumer partsPerMillion() {
        long[] last = {0};
        return ppm -> {
            synchronized (last) {
                if (ppm > last[0]) {
                    last[0] = ppm;
                    done(ppm);
                }
            }
        };
    }
}
