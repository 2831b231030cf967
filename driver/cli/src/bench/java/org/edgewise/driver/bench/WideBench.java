package org.edgewise.driver.bench;

import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;
import org.edgewise.driver.average.partition.PartitionMcmc;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;

/**
 * {@code scripts/bench wide}: order MCMC run until converged on wide tables — random networks
 * ({@code RandomNetwork}, seed 42, ternary, 2,000 rows), each variable's candidates its K nearest
 * neighbours on each side in the generating order, d = 3. Per n: two seeds, time to convergence,
 * steps/s, bulk-ESS per second and max |Δ| over edges between the two seeds; and {@code mixing}:
 * fixed-length runs with and without the relocation move side by side (ESS per CPU-second).
 * Arguments: {@code wide K MAXSECONDS N...}, {@code mixing N K STEPS}, or {@code tempering N K MAXSECONDS
 * LADDER...} with LADDER {@code R[:BETAMIN[:RELOCATE]]} or {@code auto} (the default ladder; R = 1: untempered).
 */
public final class WideBench {
    private WideBench() {
    }

    public static void main(String[] args) {
        if (args[0].equals("sm")) {
            double maxSec = Double.parseDouble(args[2]);
            for (int a = 3; a < args.length; a++) {
                priors(Integer.parseInt(args[a]), Integer.parseInt(args[1]), maxSec);
            }
            return;
        }
        if (args[0].equals("tempering")) {
            tempering(Integer.parseInt(args[1]), Integer.parseInt(args[2]), Double.parseDouble(args[3]),
                    java.util.Arrays.copyOfRange(args, 4, args.length));
            return;
        }
        if (args[0].equals("mixing")) {
            mixing(Integer.parseInt(args[1]), Integer.parseInt(args[2]), Long.parseLong(args[3]));
            return;
        }
        int k = Integer.parseInt(args[1]);
        double maxSec = Double.parseDouble(args[2]);
        for (int a = 3; a < args.length; a++) {
            wide(Integer.parseInt(args[a]), k, maxSec);
        }
    }

    static void wide(int n, int k, double maxSec) {
        LocalScores ls = UnknownOrderBench.scores(n, 3, k);
        McmcResult[] r = new McmcResult[2];
        for (int s = 0; s < 2; s++) {
            McmcSettings st = McmcSettings.defaults(1 + s).withSteps(20_000, 0).untilConverged(Long.MAX_VALUE / 4, maxSec);
            long t0 = System.nanoTime();
            r[s] = OrderMcmc.run(ls, OrderConstraints.none(n), st, null);
            double wall = (System.nanoTime() - t0) / 1e9;
            var o = r[s].outcome();
            System.out.printf("wide n=%d candidates<=%d seed %d: %s after %.1f s wall (sampling %.1f s, %d checks %.1f s); "
                            + "%d steps/chain = %.0f steps/s per chain; max R-hat %.4f, min bulk ESS %.0f (%.1f ESS/s), min tail ESS %.0f, "
                            + "max MCSE %.4f (target %.3f, %d draws used per chain); "
                            + "%d settled, %d constant; worst: %s; %d rungs, swap acceptance %s, %.2f ESS per CPU-s, "
                            + "memory planned %s; load %.1f%n",
                    n, 2 * k, 1 + s, o.stop().label(), wall, o.samplingSeconds(), o.checks(), o.checkSeconds(), o.stepsPerChain(),
                    o.stepsPerChain() * 4 / o.samplingSeconds() / Math.min(4, Runtime.getRuntime().availableProcessors()),
                    r[s].maxRhat(), r[s].minEss(), r[s].minEss() / o.samplingSeconds(), r[s].report().minEssTail(),
                    r[s].report().maxMcse(), st.mcseTarget(), r[s].report().drawsPerChain(),
                    r[s].report().settled(), r[s].report().constant(),
                    r[s].report().worst().isEmpty() ? "-" : describe(r[s].report().worst().get(0)), r[s].memory().rungs(),
                    swaps(r[s].swapAcceptance()), r[s].minEss() / r[s].chainCpuSeconds(), r[s].memory().describe(),
                    UnknownOrderBench.load());
        }
        System.out.printf("wide n=%d: max |delta| over edges between seeds 1 and 2 = %.4f%n", n, OrderMcmcDiff.maxDiff(r[0], r[1], n));
    }

    /**
     * Both DAG priors side by side at one n: order MCMC (order-modular) and partition MCMC
     * (structure-modular, Kuipers &amp; Moffa 2017), each until converged from two seeds.
     */
    static void priors(int n, int k, double maxSec) {
        LocalScores ls = UnknownOrderBench.scores(n, 3, k);
        for (String prior : new String[] {"order-modular", "structure-modular"}) {
            McmcResult[] r = new McmcResult[2];
            for (int s = 0; s < 2; s++) {
                McmcSettings st = McmcSettings.defaults(1 + s).withSteps(20_000, 0).untilConverged(Long.MAX_VALUE / 4, maxSec);
                long t0 = System.nanoTime();
                r[s] = prior.equals("order-modular") ? OrderMcmc.run(ls, OrderConstraints.none(n), st, null)
                        : PartitionMcmc.run(ls, OrderConstraints.none(n), st, null).chains();
                double wall = (System.nanoTime() - t0) / 1e9;
                var o = r[s].outcome();
                System.out.printf("%s n=%d candidates<=%d seed %d (%s): %s after %.1f s wall (sampling %.1f s); %d steps/chain, "
                                + "%.0f steps/CPU-s per chain, acceptance %.3f; max R-hat %.4f, min bulk ESS %.0f (%.1f ESS per CPU-s); "
                                + "worst: %s; load %.1f%n",
                        prior, n, 2 * k, 1 + s, prior.equals("order-modular") ? "order MCMC" : "partition MCMC", o.stop().label(), wall,
                        o.samplingSeconds(), o.stepsPerChain(), 4 * o.stepsPerChain() / r[s].chainCpuSeconds(), r[s].acceptance(),
                        r[s].maxRhat(), r[s].minEss(), r[s].minEss() / r[s].chainCpuSeconds(),
                        r[s].report().worst().isEmpty() ? "-" : describe(r[s].report().worst().get(0)), UnknownOrderBench.load());
            }
            System.out.printf("%s n=%d: max |delta| over edges between seeds 1 and 2 = %.4f%n", prior, n,
                    OrderMcmcDiff.maxDiff(r[0], r[1], n));
        }
    }

    static String swaps(double[] a) {
        StringBuilder sb = new StringBuilder("[");
        for (double x : a) {
            sb.append(sb.length() > 1 ? " " : "").append(String.format("%.2f", x));
        }
        return sb.append(']').toString();
    }

    static String describe(MultiChainDiagnostics.Worst w) {
        return String.format("%s (R-hat %.4f, ESS %.0f, MCSE %.4f, %s)", w.quantity(), w.rhat(), w.essBulk(), w.mcse(),
                w.state().label());
    }

    static void mixing(int n, int k, long steps) {
        LocalScores ls = UnknownOrderBench.scores(n, 3, k);
        OrderMcmc.run(ls, OrderConstraints.none(n), McmcSettings.defaults(9).withSteps(20_000, 1000).withChains(1, 1000), null);
        for (int rep = 0; rep < 2; rep++) {
            for (double reloc : new double[] {0.0, 0.1, 0.5}) {
                McmcSettings st = McmcSettings.defaults(1).withSteps(steps, steps / 4).withRelocate(reloc);
                McmcResult r = OrderMcmc.run(ls, OrderConstraints.none(n), st, null);
                System.out.printf("mixing n=%d candidates<=%d relocate %.1f: 4 chains x %d steps, %.1f s CPU (%.0f steps/CPU-s per chain); "
                                + "max R-hat %.4f, min bulk ESS %.0f = %.1f ESS per CPU-second, log-score ESS %.0f; worst %s; load %.1f%n",
                        n, 2 * k, reloc, steps + steps / 4, r.chainCpuSeconds(), 4 * (steps + steps / 4) / r.chainCpuSeconds(),
                        r.maxRhat(), r.minEss(), r.minEss() / r.chainCpuSeconds(), r.report().logScore().essBulk(),
                        r.report().worst().isEmpty() ? "-" : describe(r.report().worst().get(0)), UnknownOrderBench.load());
            }
        }
    }

    /**
     * Tempering side by side: for each ladder spec {@code R:BETAMIN} (R = 1: no tempering; {@code auto}
     * the default for n), a run of 4
     * chains until converged or {@code maxSec}, same seed; ESS per CPU-second of all rungs, swap
     * acceptance per adjacent pair, and per chain the mean log score and the position gap of the
     * worst quantity's two variables (what is stuck).
     */
    static void tempering(int n, int k, double maxSec, String[] ladders) {
        LocalScores ls = UnknownOrderBench.scores(n, 3, k);
        for (String spec : ladders) {
            String[] p = spec.split(":");
            double reloc = p.length > 2 ? Double.parseDouble(p[2]) : McmcSettings.DEFAULT_RELOCATE;
            McmcSettings st = McmcSettings.defaults(1).withSteps(20_000, 0)
                    .untilConverged(Long.MAX_VALUE / 4, maxSec).withRelocate(reloc);
            if (!p[0].equals("auto")) {
                st = st.withTempering(Integer.parseInt(p[0]), p.length > 1 ? Double.parseDouble(p[1]) : McmcSettings.DEFAULT_BETA_MIN);
            }
            int rungs = st.rungsFor(n);
            double bmin = st.betaMinFor(n);
            long t0 = System.nanoTime();
            McmcResult r = OrderMcmc.run(ls, OrderConstraints.none(n), st, null);
            double wall = (System.nanoTime() - t0) / 1e9;
            var o = r.outcome();
            StringBuilder chains = new StringBuilder();
            int per = r.orders().size() / r.traces().size();
            for (int c = 0; c < r.traces().size(); c++) {
                double m = 0;
                for (double x : r.traces().get(c)) {
                    m += x;
                }
                chains.append(String.format(" %.1f", m / r.traces().get(c).length));
            }
            System.out.printf("tempering n=%d K<=%d rungs %d beta_min %.2f relocate %.2f: %s after %.1f s wall (sampling %.1f s), "
                            + "%d steps/chain, %.0f steps/CPU-s per chain, acceptance %.3f, swap acceptance %s; max R-hat %.4f, "
                            + "min bulk ESS %.0f = %.2f ESS per CPU-s; %d stuck; worst %s; chain mean log scores%s; load %.1f%n",
                    n, 2 * k, rungs, bmin, reloc, o.stop().label(), wall, o.samplingSeconds(), o.stepsPerChain(),
                    4 * o.stepsPerChain() / r.chainCpuSeconds(), r.acceptance(), swaps(r.swapAcceptance()),
                    r.maxRhat(), r.minEss(), r.minEss() / r.chainCpuSeconds(), r.report().stuck(),
                    r.report().worst().isEmpty() ? "-" : describe(r.report().worst().get(0)), chains, UnknownOrderBench.load());
        }
    }

    /** Largest |P₁(a→b) − P₂(a→b)| over all pairs. */
    static final class OrderMcmcDiff {
        static double maxDiff(McmcResult a, McmcResult b, int n) {
            double worst = 0;
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    double p = a.edges()[i][j] == null ? 0 : a.edges()[i][j].mean();
                    double q = b.edges()[i][j] == null ? 0 : b.edges()[i][j].mean();
                    worst = Math.max(worst, Math.abs(p - q));
                }
            }
            return worst;
        }
    }
}
