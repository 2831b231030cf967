package org.edgewise.driver.average.mcmc;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.function.BooleanSupplier;
import org.edgewise.driver.average.convergence.ConvergenceTargets;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;

/**
 * Runs several Markov chains, each on its own thread, either for a fixed number of steps or
 * until {@link MultiChainDiagnostics} says converged (R̂, bulk-ESS and MCSE targets,
 * {@link ConvergenceTargets}), the step cap or the time budget is reached.
 * Sampler-independent: order MCMC today; any chain that fills a {@link DrawStore} plugs in.
 *
 * <p>Until converged: the first check after {@code steps} steps per chain, then rounds that double
 * the steps done so far — for as long as any target is missed, the MCSE one included: a run whose
 * R̂ and ESS are met keeps doubling until every reported probability's MCSE is at most its target
 * (MCSE falls as 1/√steps once the chains mix) — so there are O(log(total/first)) checks, each over at most 2·cap
 * stored draws per chain — the checks together cost a bounded share of the sampling. At every
 * check the first half of each chain is discarded as warm-up (Gelman et al., Bayesian Data
 * Analysis, 3rd ed., sec. 11.4) and the rest diagnosed. Rounds end at step counts only, so a
 * seed gives the same result unless the time budget stops the run (then the steps done depend
 * on the machine's speed, which the stop reason says).
 */
public final class ChainRunner {
    private ChainRunner() {
    }

    /** A chain the runner can drive. */
    public interface Chain {
        /** Runs {@code count} steps, or fewer if {@code stop} turns true (checked every few hundred steps). */
        void advance(long count, BooleanSupplier stop);

        long steps();

        long acceptedSteps();

        double cpuSeconds();

        DrawStore draws();

        /** Tempered chains: per adjacent pair of rungs, the share of proposed exchanges accepted; else empty. */
        default double[] swapAcceptance() {
            return new double[0];
        }
    }

    /**
     * @param steps          fixed: steps per chain after burn-in; until converged: steps before the first check
     * @param burnIn         fixed: steps discarded first (until converged: the first half is discarded)
     * @param untilConverged run until converged (else exactly burnIn + steps)
     * @param maxSteps       until converged: cap on steps per chain
     * @param maxSeconds     until converged: wall-clock budget of the sampling
     * @param targets        what counts as converged (R̂, bulk-ESS, MCSE of the probabilities)
     */
    public record Plan(long steps, long burnIn, boolean untilConverged, long maxSteps, double maxSeconds,
                       ConvergenceTargets targets) {
    }

    /** Why a run stopped. */
    public enum StopReason {
        STEPS("ran the requested steps"),
        CONVERGED("converged"),
        MAX_STEPS("reached the step cap before converging"),
        MAX_TIME("reached the time budget before converging");

        private final String text;

        StopReason(String text) {
            this.text = text;
        }

        public String text() {
            return text;
        }

        public String label() {
            return name().toLowerCase(Locale.ROOT).replace('_', '-');
        }
    }

    /** Progress (on the calling thread). */
    public interface Listener {
        /** {@code latest} is the last check's report (null before the first). */
        void progress(long stepsDone, long stepsPlanned, double acceptance, MultiChainDiagnostics.Report latest);
    }

    /**
     * @param report          the diagnostics of the draws used
     * @param stepsPerChain   steps run per chain (smallest over chains after a time stop)
     * @param discarded       steps per chain discarded as burn-in / warm-up
     * @param checks          diagnostic checks made
     * @param checkSeconds    wall time spent in the checks
     * @param samplingSeconds wall time spent running chains
     */
    public record Outcome(MultiChainDiagnostics.Report report, StopReason stop, long stepsPerChain, long discarded,
                          int checks, double checkSeconds, double samplingSeconds) {
    }

    public static Outcome run(List<? extends Chain> chains, Plan p, MultiChainDiagnostics.Quantities q, Listener l) {
        int threads = Math.min(chains.size(), Runtime.getRuntime().availableProcessors());
        ExecutorService pool = Executors.newFixedThreadPool(threads, r -> {
            Thread t = new Thread(r, "mcmc-chain");
            t.setDaemon(true);
            return t;
        });
        long t0 = System.nanoTime();
        long deadline = p.untilConverged() && p.maxSeconds() > 0 ? t0 + (long) (p.maxSeconds() * 1e9) : Long.MAX_VALUE;
        BooleanSupplier stop = () -> System.nanoTime() > deadline;
        List<DrawStore> stores = new ArrayList<>();
        for (Chain c : chains) {
            stores.add(c.draws());
        }
        double checkSec = 0;
        int checks = 0;
        MultiChainDiagnostics.Report report = null;
        StopReason reason;
        long done = 0;
        try {
            if (!p.untilConverged()) {
                long target = p.burnIn() + p.steps();
                done = advance(pool, chains, target, stop, null, l, target);
                reason = StopReason.STEPS;
            } else {
                long target = Math.min(p.maxSteps(), Math.max(4, p.steps()));
                while (true) {
                    done = advance(pool, chains, target - done, stop, report, l, target) + done;
                    done = minSteps(chains);
                    long c0 = System.nanoTime();
                    report = MultiChainDiagnostics.evaluate(stores, done / 2, q, p.targets());
                    checkSec += (System.nanoTime() - c0) / 1e9;
                    checks++;
                    if (l != null) {
                        l.progress(done * chains.size(), target * chains.size(), acceptance(chains), report);
                    }
                    if (report.converged()) {
                        reason = StopReason.CONVERGED;
                        break;
                    }
                    if (stop.getAsBoolean() || done < target) {
                        reason = StopReason.MAX_TIME;
                        break;
                    }
                    if (done >= p.maxSteps()) {
                        reason = StopReason.MAX_STEPS;
                        break;
                    }
                    target = Math.min(p.maxSteps(), done + Math.max(1, done));
                }
            }
        } finally {
            pool.shutdownNow();
        }
        double sampling = (System.nanoTime() - t0) / 1e9 - checkSec;
        long discarded = p.untilConverged() ? done / 2 : p.burnIn();
        if (!p.untilConverged()) {
            long c0 = System.nanoTime();
            report = MultiChainDiagnostics.evaluate(stores, discarded, q, p.targets());
            checkSec += (System.nanoTime() - c0) / 1e9;
            checks++;
        }
        return new Outcome(report, reason, done, discarded, checks, checkSec, sampling);
    }

    private static long minSteps(List<? extends Chain> chains) {
        long m = Long.MAX_VALUE;
        for (Chain c : chains) {
            m = Math.min(m, c.steps());
        }
        return m;
    }

    /** Advances every chain by {@code len} steps in parallel; returns the steps each did (the least). */
    private static long advance(ExecutorService pool, List<? extends Chain> chains, long len, BooleanSupplier stop,
                                MultiChainDiagnostics.Report latest, Listener l, long target) {
        long before = minSteps(chains);
        List<Future<?>> futures = new ArrayList<>();
        for (Chain ch : chains) {
            futures.add(pool.submit(() -> ch.advance(len, stop)));
        }
        for (Future<?> f : futures) {
            while (true) {
                try {
                    f.get(250, TimeUnit.MILLISECONDS);
                    break;
                } catch (TimeoutException e) {
                    if (l != null) {
                        long steps = 0;
                        for (Chain c : chains) {
                            steps += c.steps();
                        }
                        l.progress(steps, target * chains.size(), acceptance(chains), latest);
                    }
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                    throw new IllegalStateException("interrupted", e);
                } catch (ExecutionException e) {
                    if (e.getCause() instanceof RuntimeException re) {
                        throw re;
                    }
                    throw new IllegalStateException(e.getCause());
                }
            }
        }
        return minSteps(chains) - before;
    }

    static double acceptance(List<? extends Chain> chains) {
        long s = 0;
        long a = 0;
        for (Chain c : chains) {
            s += c.steps();
            a += c.acceptedSteps();
        }
        return s == 0 ? Double.NaN : (double) a / s;
    }
}
