package org.edgewise.driver.average;

import org.edgewise.driver.Checks;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import org.edgewise.driver.UserError;

/**
 * Order MCMC (Friedman &amp; Koller 2003, "Being Bayesian about network structure", Machine
 * Learning 50): several chains over variable orders ({@link OrderChain}), each from its own
 * random start on its own thread, with Rao-Blackwellised edge estimates — the exact
 * P(j → i | D, ≺) of each stored order, averaged over the draws of all chains — and, per edge,
 * split-R̂, effective sample size and Monte Carlo standard error across chains
 * ({@link ChainDiagnostics}).
 *
 * <p>The target is the order-modular posterior P(≺ | D) ∝ Σ_{G ⊆ ≺} Π_i ρ_i(U_i) P(D | G) under
 * the uniform prior over the allowed orders: the same posterior {@link ExactOrderSum} sums
 * exactly, so the two agree up to Monte Carlo error.
 *
 * <p>Reproducible: chain c draws from the c-th {@link SplittableRandom#split()} of
 * {@code new SplittableRandom(seed)}, made on the calling thread before any chain starts, and
 * chains only meet at round boundaries fixed by the settings — so a seed gives the same result
 * whatever the thread timing.
 *
 * <p>Memory: {@link ChildTables} (at most {@code tableBudget} bytes), plus per chain 8 bytes per
 * candidate edge per stored draw (1,000 draws × 2,000 candidate edges = 16 MB).
 */
public final class OrderMcmc {
    private OrderMcmc() {
    }

    /**
     * @param chains      number of chains (default 4)
     * @param steps       steps per chain after burn-in
     * @param burnIn      steps per chain discarded first
     * @param seed        seed of all randomness
     * @param draws       draws stored per chain over {@code steps} (thinning = steps / draws)
     * @param untilRhat   when &gt; 1, keep running in rounds of steps/4 until the largest split-R̂
     *                    is below it or {@code maxSteps} is reached; else NaN
     * @param maxSteps    cap on steps per chain after burn-in for {@code untilRhat}
     * @param features    also sample a DAG per draw for ancestor and Markov-blanket features
     * @param tableBudget bytes allowed for the per-child tables
     */
    public record Settings(int chains, long steps, long burnIn, long seed, int draws, double untilRhat,
                           long maxSteps, boolean features, long tableBudget) {
        public Settings {
            Checks.atLeast(chains, 1, "the number of chains");
            Checks.atLeast(steps, 1, "the steps per chain");
            Checks.notNegative(burnIn, "the burn-in");
            if (draws < 4) {
                throw new UserError("at least 4 stored draws per chain are needed for split-R̂, got " + draws);
            }
        }

        public static Settings defaults(long seed) {
            return new Settings(4, 200_000, 50_000, seed, 1000, Double.NaN, 0, false, 1L << 30);
        }

        public Settings withSteps(long s, long b) {
            return new Settings(chains, s, b, seed, draws, untilRhat, maxSteps, features, tableBudget);
        }

        public Settings withChains(int c) {
            return new Settings(c, steps, burnIn, seed, draws, untilRhat, maxSteps, features, tableBudget);
        }

        public Settings withFeatures(boolean f) {
            return new Settings(chains, steps, burnIn, seed, draws, untilRhat, maxSteps, f, tableBudget);
        }

        public Settings withUntilRhat(double r, long max) {
            return new Settings(chains, steps, burnIn, seed, draws, r, max, features, tableBudget);
        }

        public Settings withSeed(long sd) {
            return new Settings(chains, steps, burnIn, sd, draws, untilRhat, maxSteps, features, tableBudget);
        }

        public Settings withDraws(int d) {
            return new Settings(chains, steps, burnIn, seed, d, untilRhat, maxSteps, features, tableBudget);
        }
    }

    /** Receives progress between rounds and while chains run (on the calling thread). */
    public interface Listener {
        void progress(long stepsDone, long stepsPlanned, double acceptance, double maxRhat);

        /** Whether the current largest R̂ is shown (it costs a pass over all draws per round). */
        default boolean wantsRhat() {
            return true;
        }
    }

    /** One estimated quantity with its diagnostics. */
    public record Estimate(double mean, double mcse, double rhat, double ess) {
    }

    /**
     * @param edges       {@code [from][to]}; null for pairs where {@code from} is no candidate of {@code to} (posterior 0)
     * @param ancestors   {@code [a][b]} for a ⇝ b when features were asked, else null
     * @param blanket     {@code [a][b]} (a &lt; b filled, symmetric) when features were asked, else null
     * @param maxRhat     largest split-R̂ over edges (and features)
     * @param minEss      smallest ESS over quantities that vary
     * @param traces      per chain, the log evidence of the stored draws
     * @param orders      all stored orders (chain by chain), for averaging predictions
     * @param chainCpuSeconds CPU time of the chains' steps (incl. stored draws), summed over chains
     */
    public record Result(Estimate[][] edges, Estimate[][] ancestors, Estimate[][] blanket, double maxRhat,
                         double minEss, double acceptance, long stepsPerChain, long burnIn, long thin,
                         List<double[]> traces, List<int[]> orders, boolean converged, double rhatThreshold,
                         double setupSeconds, double samplingSeconds, double chainCpuSeconds) {
    }

    /** Runs the chains. {@code listener} may be null. */
    public static Result run(LocalScores ls, OrderConstraints oc, Settings s, Listener listener) {
        int n = ls.variableCount();
        int[][] cpos = new int[n][n];
        int[] offset = new int[n + 1];
        for (int i = 0; i < n; i++) {
            java.util.Arrays.fill(cpos[i], -1);
            int[] cand = ls.candidates(i);
            for (int k = 0; k < cand.length; k++) {
                cpos[i][cand[k]] = k;
            }
            offset[i + 1] = offset[i] + cand.length;
        }
        long t0 = System.nanoTime();
        ChildTables tables = new ChildTables(ls, s.tableBudget());
        SplittableRandom root = new SplittableRandom(s.seed());
        List<OrderChain> chains = new ArrayList<>();
        for (int c = 0; c < s.chains(); c++) {
            chains.add(new OrderChain(ls, tables, oc, cpos, offset, s.features(), root.split()));
        }
        long thin = Math.max(1, s.steps() / s.draws());
        long planned = s.burnIn() + s.steps();
        double threshold = s.untilRhat() > 1 ? s.untilRhat() : 1.01;
        long cap = s.untilRhat() > 1 ? Math.max(s.maxSteps(), s.steps()) + s.burnIn() : planned;
        int threads = Math.min(s.chains(), Runtime.getRuntime().availableProcessors());
        ExecutorService pool = Executors.newFixedThreadPool(threads, r -> {
            Thread t = new Thread(r, "order-mcmc");
            t.setDaemon(true);
            return t;
        });
        double rhat = Double.NaN;
        long done = 0;
        long t1 = System.nanoTime();
        try {
            long round = Math.max(1, planned / 20);
            long target = planned;
            while (true) {
                if (done >= target) {
                    if (s.untilRhat() > 1 && !(rhat < threshold) && target < cap) {
                        target = Math.min(cap, target + Math.max(1, s.steps() / 4));
                    } else {
                        break;
                    }
                }
                long len = Math.min(round, target - done);
                List<Future<?>> futures = new ArrayList<>();
                for (OrderChain ch : chains) {
                    futures.add(pool.submit(() -> ch.advance(len, s.burnIn(), thin)));
                }
                waitFor(futures, chains, rhat, listener, target);
                done += len;
                if (s.untilRhat() > 1 || (listener != null && listener.wantsRhat())) {
                    rhat = maxRhat(chains, offset[n]);
                }
                if (listener != null) {
                    listener.progress(done * chains.size(), target * chains.size(), acceptance(chains), rhat);
                }
            }
        } finally {
            pool.shutdownNow();
        }
        long t2 = System.nanoTime();
        return summarise(ls, chains, offset, cpos, s, done, thin, threshold, (t1 - t0) / 1e9, (t2 - t1) / 1e9);
    }

    private static void waitFor(List<Future<?>> futures, List<OrderChain> chains, double rhat,
                                Listener listener, long total) {
        for (Future<?> f : futures) {
            while (true) {
                try {
                    f.get(250, TimeUnit.MILLISECONDS);
                    break;
                } catch (TimeoutException e) {
                    if (listener != null) {
                        long steps = 0;
                        for (OrderChain c : chains) {
                            steps += c.steps();
                        }
                        listener.progress(steps, total * chains.size(), acceptance(chains), rhat);
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
    }

    private static double acceptance(List<OrderChain> chains) {
        long s = 0;
        long a = 0;
        for (OrderChain c : chains) {
            s += c.steps();
            a += c.acceptedSteps();
        }
        return s == 0 ? Double.NaN : (double) a / s;
    }

    /** Largest split-R̂ over the candidate edges (NaN before 4 draws per chain). */
    private static double maxRhat(List<OrderChain> chains, int edges) {
        int draws = chains.get(0).edgeDraws.size();
        if (draws < 4) {
            return Double.NaN;
        }
        double max = 1.0;
        double[][] x = new double[chains.size()][draws];
        for (int e = 0; e < edges; e++) {
            for (int c = 0; c < chains.size(); c++) {
                List<double[]> d = chains.get(c).edgeDraws;
                for (int t = 0; t < draws; t++) {
                    x[c][t] = d.get(t)[e];
                }
            }
            double r = ChainDiagnostics.splitRhat(x);
            if (r > max || Double.isNaN(max)) {
                max = r;
            }
        }
        return max;
    }

    private static Result summarise(LocalScores ls, List<OrderChain> chains, int[] offset, int[][] cpos,
                                    Settings s, long done, long thin, double threshold, double setup, double sampling) {
        int n = ls.variableCount();
        int m = chains.size();
        int draws = chains.get(0).edgeDraws.size();
        if (draws < 4) {
            throw new UserError("only " + draws + " draws per chain were stored; run more steps (at least "
                    + 4 * thin + ") or lower the thinning");
        }
        double[][] x = new double[m][draws];
        Estimate[][] edges = new Estimate[n][n];
        double[] worst = {1.0, Double.POSITIVE_INFINITY};
        for (int i = 0; i < n; i++) {
            int[] cand = ls.candidates(i);
            for (int k = 0; k < cand.length; k++) {
                int e = offset[i] + k;
                for (int c = 0; c < m; c++) {
                    List<double[]> d = chains.get(c).edgeDraws;
                    for (int t = 0; t < draws; t++) {
                        x[c][t] = d.get(t)[e];
                    }
                }
                edges[cand[k]][i] = estimate(x, worst);
            }
        }
        Estimate[][] anc = null;
        Estimate[][] mb = null;
        if (s.features()) {
            anc = new Estimate[n][n];
            mb = new Estimate[n][n];
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (a == b) {
                        continue;
                    }
                    fill(x, chains, DagFeatures.ancestorBit(a, b, n), draws);
                    anc[a][b] = estimate(x, worst);
                    if (a < b) {
                        fill(x, chains, DagFeatures.blanketBit(a, b, n), draws);
                        mb[a][b] = estimate(x, worst);
                        mb[b][a] = mb[a][b];
                    }
                }
            }
        }
        List<double[]> traces = new ArrayList<>();
        List<int[]> orders = new ArrayList<>();
        for (OrderChain c : chains) {
            traces.add(c.trace.stream().mapToDouble(Double::doubleValue).toArray());
            orders.addAll(c.orderDraws);
        }
        double maxRhat = worst[0];
        double minEss = worst[1] == Double.POSITIVE_INFINITY ? Double.NaN : worst[1];
        double cpu = 0;
        for (OrderChain c : chains) {
            cpu += c.cpuSeconds();
        }
        return new Result(edges, anc, mb, maxRhat, minEss, acceptance(chains), done - s.burnIn(), s.burnIn(), thin,
                traces, orders, maxRhat < threshold, threshold, setup, sampling, cpu);
    }

    private static void fill(double[][] x, List<OrderChain> chains, int bit, int draws) {
        for (int c = 0; c < chains.size(); c++) {
            List<long[]> d = chains.get(c).featureDraws;
            for (int t = 0; t < draws; t++) {
                x[c][t] = DagFeatures.get(d.get(t), bit) ? 1.0 : 0.0;
            }
        }
    }

    private static Estimate estimate(double[][] x, double[] worst) {
        ChainDiagnostics.Summary sm = ChainDiagnostics.summary(x);
        if (sm.rhat() > worst[0]) {
            worst[0] = sm.rhat();
        }
        if (sm.ess() < worst[1]) {
            worst[1] = sm.ess();
        }
        return new Estimate(sm.mean(), sm.mcse(), sm.rhat(), sm.ess());
    }
}
