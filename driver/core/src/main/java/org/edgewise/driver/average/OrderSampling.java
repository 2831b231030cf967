package org.edgewise.driver.average;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.ProgressListener;

/** Running order MCMC for a request with progress, and thinning the orders it kept. */
public final class OrderSampling {
    private OrderSampling() {
    }

    /**
     * Runs the chains of {@code s} under {@code oc}, reporting steps, acceptance and — after each
     * convergence check — the worst R̂ and the smallest bulk-ESS to {@code progress}.
     */
    public static OrderMcmc.Result runMcmc(LocalScores ls, OrderConstraints oc, UnknownOrderSettings s,
                                           boolean withFeatures, ProgressListener progress) {
        OrderMcmc.Settings ms = s.mcmc(withFeatures);
        int rungs = ms.rungsFor(ls.variableCount());
        progress.note("order MCMC: memory planned " + McmcMemory.plan(ls, ms, rungs).describe()
                + (rungs > 1 ? "; each of the " + ms.chains() + " chains a ladder of " + rungs
                + " tempered chains (beta 1 down to " + String.format(java.util.Locale.ROOT, "%.3g",
                ms.betaMinFor(ls.variableCount())) + ")" : ""));
        progress.start(ms.untilConverged() ? "order MCMC until converged" : "order MCMC",
                ms.untilConverged() ? -1 : (ms.burnIn() + ms.steps()) * ms.chains());
        try {
            long[] shown = {0};
            return OrderMcmc.run(ls, oc, ms, (done, planned, acc, report) -> {
                if (done > shown[0]) {
                    shown[0] = done;
                    progress.done(done);
                }
                progress.chainState(acc, report == null ? Double.NaN : report.maxRhat(),
                        report == null ? Double.NaN : report.minEssBulk());
            });
        } finally {
            progress.finish();
        }
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
