package org.edgewise.driver.average.mcmc;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.convergence.ConvergenceTargets;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;
import org.edgewise.driver.average.partition.PartitionChain;
import org.edgewise.driver.average.partition.PartitionMcmc;

/** Running order MCMC for a request with progress, and thinning the orders it kept. */
public final class OrderSampling {
    private OrderSampling() {
    }

    /**
     * Runs the order chains of {@code s} under {@code oc}, reporting steps, acceptance and — after
     * each convergence check — the worst R̂, the smallest bulk-ESS and the largest MCSE, with their
     * targets, to {@code progress}.
     */
    public static McmcResult runMcmc(LocalScores ls, OrderConstraints oc, UnknownOrderSettings s,
                                           boolean withFeatures, ProgressListener progress) {
        McmcSettings ms = s.mcmc(withFeatures);
        int rungs = ms.rungsFor(ls.variableCount());
        progress.note("order MCMC: memory planned " + McmcMemory.plan(ls, ms, rungs).describe()
                + (rungs > 1 ? "; each of the " + ms.chains() + " chains a ladder of " + rungs
                + " tempered chains (beta 1 down to " + String.format(java.util.Locale.ROOT, "%.3g",
                ms.betaMinFor(ls.variableCount())) + ")" : ""));
        return run("order MCMC", ms, progress, (m, l) -> OrderMcmc.run(ls, oc, m, l));
    }

    /** The same for partition MCMC (the structure-modular prior, {@link PartitionMcmc}). */
    public static PartitionMcmc.Result runPartitionMcmc(LocalScores ls, OrderConstraints oc, UnknownOrderSettings s,
                                                        boolean withFeatures, ProgressListener progress) {
        McmcSettings ms = s.mcmc(withFeatures);
        progress.note("partition MCMC: memory planned " + McmcMemory.plan(ls, ms, 1, PartitionChain.extraBytes(ls)).describe());
        return run("partition MCMC", ms, progress, (m, l) -> PartitionMcmc.run(ls, oc, m, l));
    }

    private static <R> R run(String what, McmcSettings ms, ProgressListener progress,
                             java.util.function.BiFunction<McmcSettings, ChainRunner.Listener, R> sampler) {
        start(progress, what, ms);
        try {
            return sampler.apply(ms, listener(progress, ms));
        } finally {
            progress.finish();
        }
    }

    private static void start(ProgressListener progress, String what, McmcSettings ms) {
        progress.start(ms.untilConverged() ? what + " until converged" : what,
                ms.untilConverged() ? -1 : (ms.burnIn() + ms.steps()) * ms.chains());
    }

    private static ChainRunner.Listener listener(ProgressListener progress, McmcSettings ms) {
        long[] shown = {0};
        ConvergenceTargets t = ms.targets();
        return (done, planned, acc, report) -> {
            if (done > shown[0]) {
                shown[0] = done;
                progress.done(done);
            }
            progress.chainState(new ProgressListener.ChainState(acc, report == null ? Double.NaN : report.maxRhat(),
                    report == null ? Double.NaN : report.minEssBulk(), report == null ? Double.NaN : report.maxMcse(),
                    t.rhat(), t.ess(), t.mcse()));
        };
    }

    /** At most about {@code max} elements of {@code all}, evenly spaced, first included. */
    public static List<int[]> evenlySpaced(List<int[]> all, int max) {
        List<int[]> few = new ArrayList<>();
        int every = Math.max(1, all.size() / max);
        for (int k = 0; k < all.size(); k += every) {
            few.add(all.get(k));
        }
        return few;
    }
}
