package org.edgewise.driver.bench;

import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.store.ParentSets;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.exact.StructureSum;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;

/**
 * Benchmark of the unknown-order engines ({@code scripts/bench unknown-order}). Prints one line per
 * measurement. Arguments: {@code mcmc N D STEPS}, {@code exact N D}, {@code mcmc-cand N K D STEPS}
 * (candidates: each variable's K nearest predecessors and successors in the generating order,
 * standing in for a store tallied with {@code --candidates K}), {@code estimate N}.
 *
 * <p>Data: {@link RandomNetwork} with ternary variables, 2,000 rows, tallied by
 * {@link InMemoryTally} (BDeu, ESS 1).
 */
public final class UnknownOrderBench {
    private UnknownOrderBench() {
    }

    public static void main(String[] args) {
        String what = args[0];
        switch (what) {
            case "mcmc" -> mcmc(Integer.parseInt(args[1]), Integer.parseInt(args[2]), Long.parseLong(args[3]), -1);
            case "mcmc-cand" -> mcmc(Integer.parseInt(args[1]), Integer.parseInt(args[3]), Long.parseLong(args[4]),
                    Integer.parseInt(args[2]));
            case "exact" -> exact(Integer.parseInt(args[1]), Integer.parseInt(args[2]));
            case "structure" -> structure(Integer.parseInt(args[1]), Integer.parseInt(args[2]));
            case "zeta" -> zeta(Integer.parseInt(args[1]), Integer.parseInt(args[2]));
            case "estimate" -> System.out.println(ExactOrderSum.estimateHere(Integer.parseInt(args[1])));
            default -> throw new IllegalArgumentException("unknown benchmark " + what);
        }
    }

    /** CPU time of this process (all threads), seconds: the machine is shared, so wall time alone misleads. */
    static double cpu() {
        var os = java.lang.management.ManagementFactory.getOperatingSystemMXBean();
        if (os instanceof com.sun.management.OperatingSystemMXBean sun) {
            return sun.getProcessCpuTime() / 1e9;
        }
        return Double.NaN;
    }

    static double load() {
        return java.lang.management.ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage();
    }

    static LocalScores scores(int n, int d, int k) {
        long t0 = System.nanoTime();
        Network net = RandomNetwork.generate("v", n, 3, 2, 6, 1.5, 0, 42);
        int[][] rows = new ForwardSampler(net).sample(2000, 43);
        List<Variable> vars = RandomNetwork.variables(net);
        ScoreStore store = k < 0 ? InMemoryTally.tally(vars, rows, d, FamilyScore.withDefaults())
                : tallyWithCandidates(vars, rows, d, k);
        LocalScores ls = LocalScores.build(store, ScoringOptions.asStored());
        System.out.printf("  data: n=%d d=%d rows=2000 families=%d (tally %.1f s)%n", n, d, store.families().size(),
                (System.nanoTime() - t0) / 1e9);
        return ls;
    }

    /** Like {@link InMemoryTally#tally} but each child's parents drawn from a window of 2k neighbours. */
    static ScoreStore tallyWithCandidates(List<Variable> vars, int[][] rows, int d, int k) {
        int n = vars.size();
        List<FamilyCounts> fams = new java.util.ArrayList<>();
        List<Double> sc = new java.util.ArrayList<>();
        FamilyScore fs = FamilyScore.withDefaults();
        for (int c = 0; c < n; c++) {
            final int child = c;
            int lo = Math.max(0, child - k);
            int hi = Math.min(n - 1, child + k);
            int[] cand = java.util.stream.IntStream.rangeClosed(lo, hi).filter(v -> v != child).toArray();
            for (int size = 0; size <= Math.min(d, cand.length); size++) {
                for (int[] ps : ParentSets.subsets(cand, size)) {
                    FamilyCounts fc = InMemoryTally.count(vars, rows, child, ps);
                    fams.add(fc);
                    double q = Math.pow(3, ps.length);
                    sc.add(fs.logScore(fc.counts(), vars.get(child).arity(), q));
                }
            }
        }
        ScoreStore base = InMemoryTally.tally(vars.subList(0, 1), new int[][] {{0}}, 0, fs);
        Manifest m0 = base.manifest();
        Manifest m = Manifest.of(m0.program(), m0.programVersion(), m0.createdAt(), m0.input(),
                vars, d, null, List.of(), List.of(), List.of(), m0.score(), m0.ess());
        return new ScoreStore(m, fams, sc.stream().mapToDouble(Double::doubleValue).toArray());
    }

    static void mcmc(int n, int d, long steps, int k) {
        LocalScores ls = scores(n, d, k);
        McmcSettings s = McmcSettings.defaults(1).withSteps(steps, steps / 4).withChains(1, 1000);
        OrderMcmc.run(ls, OrderConstraints.none(n), s.withSteps(Math.min(steps, 20_000), 1000), null); // warm-up
        long t0 = System.nanoTime();
        double c0 = cpu();
        McmcResult r1 = OrderMcmc.run(ls, OrderConstraints.none(n), s, null);
        double sec1 = (System.nanoTime() - t0) / 1e9;
        double cpu1 = cpu() - c0;
        long total = steps + steps / 4;
        System.out.printf("mcmc n=%d d=%d%s: 1 chain %d steps in %.2f s = %.0f steps/s per chain (acceptance %.3f; tables %.2f s before)%n",
                n, d, k < 0 ? "" : " candidates<=" + 2 * k, total, r1.samplingSeconds(), total / r1.samplingSeconds(),
                r1.acceptance(), r1.setupSeconds());
        t0 = System.nanoTime();
        c0 = cpu();
        McmcResult r4 = OrderMcmc.run(ls, OrderConstraints.none(n), s.withChains(4, s.draws()), null);
        double sec4 = (System.nanoTime() - t0) / 1e9;
        double cpu4 = cpu() - c0;
        System.out.printf("mcmc n=%d d=%d%s: 4 chains x %d steps in %.2f s = %.0f steps/s per chain; max R-hat %.4f, min ESS %.0f%n",
                n, d, k < 0 ? "" : " candidates<=" + 2 * k, total, r4.samplingSeconds(), total / r4.samplingSeconds(),
                r4.maxRhat(), r4.minEss());
        System.out.printf("  per CPU-second of a chain's own thread: 1 chain %.0f steps/s, 4 chains %.0f steps/s per chain%n",
                total / r1.chainCpuSeconds(), 4 * total / r4.chainCpuSeconds());
        System.out.printf("  (whole runs including tables and diagnostics: 1 chain %.2f s wall / %.2f s CPU, 4 chains %.2f s wall / %.2f s CPU;"
                + " %d processors, load average %.1f)%n", sec1, cpu1, sec4, cpu4, Runtime.getRuntime().availableProcessors(), load());
    }

    /** Full vs truncated superset transform on one child's array of 2^(n-1), side by side. */
    static void zeta(int n, int d) {
        double[] base = new double[1 << (n - 1)];
        java.util.SplittableRandom r = new java.util.SplittableRandom(5);
        for (int k = 0; k < base.length; k++) {
            base[k] = -1000 * r.nextDouble();
        }
        for (int rep = 0; rep < 2; rep++) {
            double[] a = base.clone();
            double c0 = cpu();
            org.edgewise.driver.average.exact.ZetaBench.full(a, n - 1);
            double full = cpu() - c0;
            a = base.clone();
            c0 = cpu();
            org.edgewise.driver.average.exact.ZetaBench.upTo(a, n - 1, d);
            double trunc = cpu() - c0;
            System.out.printf("superset transform over 2^%d entries: full %.2f s CPU, truncated to |U| <= %d %.2f s CPU (ratio %.2f)%n",
                    n - 1, full, d, trunc, full / trunc);
        }
    }

    static void exact(int n, int d) {
        System.out.println("  " + ExactOrderSum.estimateHere(n));
        LocalScores ls = scores(n, d, -1);
        Runtime rt = Runtime.getRuntime();
        long t0 = System.nanoTime();
        double c0 = cpu();
        ExactOrderSum.Result r = ExactOrderSum.run(ls, OrderConstraints.none(n));
        double sec = (System.nanoTime() - t0) / 1e9;
        double cpuSec = cpu() - c0;
        long used = rt.totalMemory() - rt.freeMemory();
        double maxEdge = Arrays.stream(r.edgePosterior()).flatMapToDouble(Arrays::stream).max().orElse(0);
        System.out.printf("exact n=%d d=%d: all %d edge posteriors in %.1f s wall, %.1f s CPU (~%.1f s on 2 idle cores), load average %.1f; DP arrays %.2f GiB (heap in use after %.2f GiB, max %.1f GiB); logEvidence %.3f, largest edge posterior %.3f%n",
                n, d, n * (n - 1), sec, cpuSec, cpuSec / 2, load(), ExactOrderSum.bytes(n) / (double) (1L << 30), used / (double) (1L << 30),
                rt.maxMemory() / (double) (1L << 30), r.logEvidence(), maxEdge);
    }

    /** Exact structure-modular sums (StructureSum) beside the order-modular DP on the same data. */
    static void structure(int n, int d) {
        System.out.println("  " + StructureSum.estimateHere(n));
        LocalScores ls = scores(n, d, -1);
        long t0 = System.nanoTime();
        double c0 = cpu();
        StructureSum.Result r = StructureSum.run(ls, OrderConstraints.none(n));
        double sec = (System.nanoTime() - t0) / 1e9;
        double cpuSec = cpu() - c0;
        double maxEdge = Arrays.stream(r.edgePosterior()).flatMapToDouble(Arrays::stream).max().orElse(0);
        System.out.printf("structure-modular exact n=%d d=%d: log Z, log Z_rho and all %d edge posteriors in %.1f s wall, %.1f s CPU,"
                + " load average %.1f; arrays %.2f GiB; logEvidence %.3f, largest edge posterior %.3f%n",
                n, d, n * (n - 1), sec, cpuSec, load(), StructureSum.bytes(n, Runtime.getRuntime().availableProcessors()) / (double) (1L << 30),
                r.logEvidence(), maxEdge);
    }
}
