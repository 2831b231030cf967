package org.edgewise.driver.average.partition;

import java.lang.management.ManagementFactory;
import java.nio.file.Path;
import java.util.SplittableRandom;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.DominatedSets;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.mcmc.ChainSet;
import org.edgewise.driver.average.mcmc.DrawStore;
import org.edgewise.driver.store.StoreReader;

/**
 * {@code scripts/bench converge}'s step-cost comparison: {@code STORE STEPS} runs two partition chains
 * of the default mix from the same seed on the store's non-dominated sets ({@link DominatedSets}, as
 * {@code edges --method mcmc} does) — the former step (each DAG move followed by relayering and
 * rescoring all n nodes, the block draw's exps taken twice) and the new one (only what moved, each
 * exp once) — in alternating rounds of 20,000 steps in
 * one JVM, and prints steps per CPU-second of each, and whether their DAGs agree after every round
 * (the same draws: their ESS per step is the same, so the ratio of steps per CPU-second is the ratio
 * of ESS per CPU-second). Then, per move alone (incremental follow), steps per CPU-second.
 */
public final class PartitionStepBench {
    private PartitionStepBench() {
    }

    public static void main(String[] args) throws Exception {
        if (args[0].equals("ess")) {
            ess(args);
            return;
        }
        LocalScores all = LocalScores.build(StoreReader.read(Path.of(args[0])), ScoringOptions.asStored());
        long steps = Long.parseLong(args[1]);
        LocalScores ls = all.restrictedTo(DominatedSets.keep(all, DominatedSets.MARGIN));
        int n = ls.variableCount();
        long sets = 0;
        for (int i = 0; i < n; i++) {
            sets += ls.setCount(i);
        }
        ChildTables tables = new ChildTables(ls, 1L << 30);
        int[] offset = ChainSet.edgeOffsets(ls);
        System.out.printf("# partition step cost: n=%d, %d non-dominated parent sets, %d steps per chain, load %.1f%n",
                n, sets, steps, load());
        PartitionChain full = chain(ls, tables, offset, PartitionChain.Mix.DEFAULT, 3);
        full.former();
        PartitionChain fast = chain(ls, tables, offset, PartitionChain.Mix.DEFAULT, 3);
        full.strongBlockShare(0);
        fast.strongBlockShare(0);
        var mx = ManagementFactory.getThreadMXBean();
        long cpuFull = 0;
        long cpuFast = 0;
        boolean same = true;
        for (long done = 0; done < steps; done += 20_000) {
            long t0 = mx.getCurrentThreadCpuTime();
            for (int k = 0; k < 20_000; k++) {
                full.step();
            }
            long t1 = mx.getCurrentThreadCpuTime();
            for (int k = 0; k < 20_000; k++) {
                fast.step();
            }
            long t2 = mx.getCurrentThreadCpuTime();
            cpuFull += t1 - t0;
            cpuFast += t2 - t1;
            same &= java.util.Arrays.equals(full.dagSets(), fast.dagSets());
        }
        long done = (steps + 19_999) / 20_000 * 20_000;
        System.out.printf("  former step:     %.0f steps per CPU-s%n", done / (cpuFull / 1e9));
        System.out.printf("  new step:        %.0f steps per CPU-s; ratio %.2f; same DAG after every round: %b; load %.1f%n",
                done / (cpuFast / 1e9), (double) cpuFull / cpuFast, same, load());
        String[] names = {"edge", "parents", "reversal", "block", "split/join", "swap"};
        PartitionChain.Mix[] alone = {new PartitionChain.Mix(1, 0, 0, 0, 0), new PartitionChain.Mix(0, 1, 0, 0, 0),
            new PartitionChain.Mix(0, 0, 1, 0, 0), new PartitionChain.Mix(0, 0, 0, 1, 0), new PartitionChain.Mix(0, 0, 0, 0, 1),
            new PartitionChain.Mix(0, 0, 0, 0, 0)};
        for (int m = 0; m < alone.length; m++) {
            PartitionChain c = chain(ls, tables, offset, alone[m], 5);
            long s = Math.max(2_000, steps / 10);
            long t0 = mx.getCurrentThreadCpuTime();
            for (long k = 0; k < s; k++) {
                c.step();
            }
            double cpu = (mx.getCurrentThreadCpuTime() - t0) / 1e9;
            System.out.printf("  %-10s alone: %.0f steps per CPU-s%n", names[m], s / cpu);
        }
    }

    /**
     * {@code ess STORE STEPS CHAINS VARIANT…}, VARIANT = former|new:STRONG_SHARE: {@code edges --method mcmc}'s
     * sampler (non-dominated sets, dispersed hill-climbed starts) for a fixed number of steps per chain
     * under each variant in one JVM: chain CPU-seconds, smallest bulk ESS over the edges, ESS per
     * CPU-second, largest R-hat and MCSE.
     */
    private static void ess(String[] args) throws Exception {
        LocalScores ls = LocalScores.build(StoreReader.read(Path.of(args[1])), ScoringOptions.asStored());
        long steps = Long.parseLong(args[2]);
        int chains = Integer.parseInt(args[3]);
        int n = ls.variableCount();
        System.out.printf("# partition ESS per CPU-s: n=%d, %d chains x %d steps (+%d warm-up), load %.1f%n", n, chains, steps,
                steps / 4, load());
        for (int k = 4; k < args.length; k++) {
            String[] v = args[k].split(":");
            PartitionMcmc.Tuning t = new PartitionMcmc.Tuning(v[0].equals("former"), v.length > 1 ? Double.parseDouble(v[1]) : 0);
            org.edgewise.driver.average.mcmc.McmcSettings s = org.edgewise.driver.average.mcmc.McmcSettings.defaults(1)
                    .withSteps(steps, steps / 4).withChains(chains, 1000);
            long t0 = System.nanoTime();
            org.edgewise.driver.average.mcmc.McmcResult r = PartitionMcmc.run(ls, OrderConstraints.none(n), s, null,
                    DominatedSets.MARGIN, t).chains();
            double wall = (System.nanoTime() - t0) / 1e9;
            double cpu = r.chainCpuSeconds();
            System.out.printf("  %-14s %.1f s wall, %.1f chain CPU-s, %.0f steps per CPU-s; min bulk ESS %.0f = %.2f ESS per CPU-s; "
                            + "max R-hat %.4f, max MCSE %.4f; acceptance %.3f; load %.1f%n",
                    args[k], wall, cpu, chains * (steps + steps / 4) / cpu, r.minEss(), r.minEss() / cpu, r.maxRhat(),
                    r.report().maxMcse(), r.acceptance(), load());
        }
    }

    private static double load() {
        return ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage();
    }

    private static PartitionChain chain(LocalScores ls, ChildTables tables, int[] offset, PartitionChain.Mix mix, long seed) {
        int n = ls.variableCount();
        return new PartitionChain(ls, tables, OrderConstraints.none(n), offset, false, new SplittableRandom(seed),
                new DrawStore(offset[n], 10, Long.MAX_VALUE / 4, 0), mix);
    }
}
