package org.edgewise.driver.bench;

import java.io.IOException;
import java.nio.file.Path;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;
import org.edgewise.driver.average.partition.PartitionMcmc;
import org.edgewise.driver.store.StoreReader;

/**
 * {@code scripts/bench converge}'s sampler comparison: {@code ess STORE STEPS [CHAINS]} runs partition
 * MCMC (the structure-modular default sampler) for a fixed number of steps per chain on a store, once
 * on every parent set and once leaving out the sets dominated by a subset at 40 nats
 * ({@code DominatedSets}), side by side in one JVM: steps per CPU-second, smallest bulk ESS over the
 * edges, ESS per CPU-second of the chains, largest MCSE and the number of edges above MCSE 0.01, and
 * the largest |Δ| of the edge posteriors between the two runs against their MCSEs.
 */
public final class ConvergeBench {
    private ConvergeBench() {
    }

    public static void main(String[] args) throws IOException {
        if (!args[0].equals("ess")) {
            throw new IllegalArgumentException("usage: ess STORE STEPS [CHAINS]");
        }
        LocalScores ls = LocalScores.build(StoreReader.read(Path.of(args[1])), ScoringOptions.asStored());
        long steps = Long.parseLong(args[2]);
        int chains = args.length > 3 ? Integer.parseInt(args[3]) : 4;
        int n = ls.variableCount();
        long sets = 0;
        for (int i = 0; i < n; i++) {
            sets += ls.setCount(i);
        }
        System.out.printf("# ess: n=%d, %d parent sets, %d chains x %d steps (+%d warm-up), load %.1f%n", n, sets, chains, steps,
                steps / 4, UnknownOrderBench.load());
        McmcResult[] r = new McmcResult[2];
        double[] margins = {Double.POSITIVE_INFINITY, 40};
        String[] names = {"every parent set", "dominated sets left out (margin 40)"};
        for (int k = 0; k < 2; k++) {
            McmcSettings s = McmcSettings.defaults(1).withSteps(steps, steps / 4).withChains(chains, 1000);
            long t0 = System.nanoTime();
            r[k] = PartitionMcmc.run(ls, OrderConstraints.none(n), s, null, margins[k]).chains();
            double wall = (System.nanoTime() - t0) / 1e9;
            int over = 0;
            for (Estimate[] row : r[k].edges()) {
                for (Estimate e : row) {
                    over += e != null && e.mcse() > 0.01 ? 1 : 0;
                }
            }
            double cpu = r[k].chainCpuSeconds();
            System.out.printf("  %-38s %.1f s wall, %.1f chain CPU-s, %.0f steps per CPU-s; min bulk ESS %.0f = %.1f ESS per CPU-s; "
                            + "max R-hat %.4f, max MCSE %.4f, %d edges with MCSE > 0.01; acceptance %.3f; load %.1f%n",
                    names[k], wall, cpu, chains * (steps + steps / 4) / cpu, r[k].minEss(), r[k].minEss() / cpu,
                    r[k].maxRhat(), r[k].report().maxMcse(), over, r[k].acceptance(), UnknownOrderBench.load());
        }
        double max = 0;
        double z = 0;
        for (int i = 0; i < r[0].edges().length; i++) {
            for (int j = 0; j < r[0].edges()[i].length; j++) {
                Estimate a = r[0].edges()[i][j];
                Estimate b = r[1].edges()[i][j];
                if (a == null || b == null) {
                    continue;
                }
                double d = Math.abs(a.mean() - b.mean());
                max = Math.max(max, d);
                double m = Math.hypot(a.mcse(), b.mcse());
                if (m > 0) {
                    z = Math.max(z, d / m);
                }
            }
        }
        System.out.printf("  max |delta| of edge posteriors between the two: %.4f (largest |delta| / combined MCSE %.2f)%n", max, z);
        System.out.printf("  ESS per CPU-s ratio (left out / every set): %.1f%n",
                (r[1].minEss() / r[1].chainCpuSeconds()) / (r[0].minEss() / r[0].chainCpuSeconds()));
    }
}
