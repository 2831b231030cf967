package org.edgewise.driver.average.mcmc;

import java.lang.management.ManagementFactory;
import java.util.function.BooleanSupplier;
import org.edgewise.driver.average.ordermcmc.OrderChain;
import org.edgewise.driver.average.partition.PartitionChain;

/**
 * The step loop both MCMC chains share ({@link OrderChain}, {@link PartitionChain}): run moves,
 * record a draw when the {@link DrawStore} says one is due, publish the step and acceptance counts
 * for the runner's progress every 1024 steps (when {@code stop} is also polled) and add up the
 * thread's CPU time. The subclass supplies one move and the recording of its state.
 *
 * <p>Mutable, confined to one thread at a time; {@link #steps()} and {@link #acceptedSteps()} may be
 * read from another thread (volatile, at most 1023 steps behind while a batch runs).
 */
public abstract class SteppedChain implements ChainRunner.Chain {
    protected final DrawStore draws;
    /** Steps taken so far (the draw index a recorded state carries). */
    protected long stepsDone;
    /** Moves that changed the state. */
    protected long accepted;
    private long cpuNanos;
    private volatile long publishedSteps;
    private volatile long publishedAccepted;

    public SteppedChain(DrawStore draws) {
        this.draws = draws;
    }

    /** One move of the chain (Metropolis–Hastings or Gibbs; the subclass says which). */
    protected abstract void move();

    /** Stores the current state as a draw at {@link #stepsDone}. */
    protected abstract void record();

    @Override
    public final void advance(long count, BooleanSupplier stop) {
        var mx = ManagementFactory.getThreadMXBean();
        long cpu0 = mx.isCurrentThreadCpuTimeSupported() ? mx.getCurrentThreadCpuTime() : 0;
        for (long k = 0; k < count; k++) {
            move();
            stepsDone++;
            if (draws.due(stepsDone)) {
                record();
            }
            if ((stepsDone & 1023) == 0) {
                publishedSteps = stepsDone;
                publishedAccepted = accepted;
                if (stop.getAsBoolean()) {
                    break;
                }
            }
        }
        publishedSteps = stepsDone;
        publishedAccepted = accepted;
        cpuNanos += mx.isCurrentThreadCpuTimeSupported() ? mx.getCurrentThreadCpuTime() - cpu0 : 0;
    }

    @Override
    public final long steps() {
        return publishedSteps;
    }

    @Override
    public final long acceptedSteps() {
        return publishedAccepted;
    }

    /** CPU time this chain's steps have used, seconds (the machine may be shared: wall time misleads). */
    @Override
    public final double cpuSeconds() {
        return cpuNanos / 1e9;
    }

    @Override
    public final DrawStore draws() {
        return draws;
    }
}
