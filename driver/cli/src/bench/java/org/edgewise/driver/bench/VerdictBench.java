package org.edgewise.driver.bench;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.TestStores;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.exact.ExactOrderSum;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;

/**
 * The verdict against exact enumeration (issue 20, point 2), order-modular, on tables made here:
 * <ul>
 *   <li>{@code trap [ROWS] [SECONDS]}: a 12-variable binary random network's sample of ROWS rows
 *       (default 200), each row repeated 10 times, d = 2, seeds 1–10, order MCMC until converged
 *       (time budget SECONDS, default 60): per seed the verdict, the rule counts, the largest
 *       |estimate − exact| ({@link ExactOrderSum}), the smallest bulk ESS per chain-CPU-second;
 *       a converged run with an edge further than 0.05 from exact is a failure of the verdict;</li>
 *   <li>{@code mcse [ROWS] [STEPS]}: a 10-variable binary network's sample (default 300 rows, d = 3),
 *       seeds 1–10, a fixed run of STEPS steps per chain (default 100,000 after 20,000 warm-up): per
 *       band of the exact posterior (mid-range 0.05–0.95, rare 1e-5–1e-3) the RMS of
 *       |estimate − exact| / MCSE over every edge and seed (calibrated: about 1; the target ≤ 1.3),
 *       and the share of edges with an error above 3 MCSE.</li>
 * </ul>
 */
public final class VerdictBench {
    private VerdictBench() {
    }

    public static void main(String[] args) {
        String mode = args.length > 0 ? args[0] : "trap";
        if (mode.equals("mcse")) {
            mcse(args.length > 1 ? Integer.parseInt(args[1]) : 300, args.length > 2 ? Long.parseLong(args[2]) : 100_000);
        } else {
            trap(args.length > 1 ? Integer.parseInt(args[1]) : 200, args.length > 2 ? Double.parseDouble(args[2]) : 60);
        }
    }

    static double maxDiff(McmcResult mc, double[][] exact) {
        double worst = 0;
        for (int a = 0; a < exact.length; a++) {
            for (int b = 0; b < exact.length; b++) {
                double p = mc.edges()[a][b] == null ? 0 : mc.edges()[a][b].mean();
                worst = Math.max(worst, Math.abs(p - exact[a][b]));
            }
        }
        return worst;
    }

    static void trap(int rows, double seconds) {
        System.out.printf(Locale.ROOT, "12 variables x %d rows x 10 repeats, d = 2, order MCMC until converged (budget %.0f s)%n",
                rows, seconds);
        System.out.println("seed  converged  max|d|  settled negligible traps stuck  maxRhat  minESS  ESS/cpu-s  wall-s");
        int wrong = 0;
        for (long seed = 1; seed <= 10; seed++) {
            LocalScores ls = TestStores.scores(TestStores.repeated(12, 2, 2, rows, 10, seed));
            double[][] exact = ExactOrderSum.run(ls, OrderConstraints.none(12)).edgePosterior();
            long t0 = System.nanoTime();
            McmcResult mc = OrderMcmc.run(ls, OrderConstraints.none(12),
                    McmcSettings.defaults(seed).withSteps(20_000, 0).untilConverged(Long.MAX_VALUE / 4, seconds), null);
            double wall = (System.nanoTime() - t0) / 1e9;
            double d = maxDiff(mc, exact);
            wrong += mc.converged() && d > 0.05 ? 1 : 0;
            var r = mc.report();
            System.out.printf(Locale.ROOT, "%4d  %-9s  %6.4f  %7d %10s %5s %5d  %7.4f  %6.0f  %9.1f  %6.1f%n", seed, mc.converged(), d,
                    r.settled(), rule(r, true), rule(r, false), r.stuck(), mc.maxRhat(), mc.minEss(),
                    mc.minEss() / mc.chainCpuSeconds(), wall);
        }
        System.out.println("converged with an edge > 0.05 from exact: " + wrong + " of 10");
    }

    /** The negligible or trap count, "-" when run against a build that predates the rules (for before/after runs). */
    private static String rule(org.edgewise.driver.average.convergence.MultiChainDiagnostics.Report r, boolean negligible) {
        try {
            return Integer.toString(negligible ? r.negligible() : r.traps());
        } catch (NoSuchMethodError e) {
            return "-";
        }
    }

    static void mcse(int rows, long steps) {
        System.out.printf(Locale.ROOT, "10 variables x %d rows, d = 3, order MCMC %d steps per chain after 20,000 warm-up%n", rows, steps);
        List<double[]> mid = new ArrayList<>();
        List<double[]> rare = new ArrayList<>();
        for (long seed = 1; seed <= 10; seed++) {
            LocalScores ls = TestStores.scores(TestStores.random(10, 2, 3, rows, seed));
            double[][] exact = ExactOrderSum.run(ls, OrderConstraints.none(10)).edgePosterior();
            McmcResult mc = OrderMcmc.run(ls, OrderConstraints.none(10), McmcSettings.defaults(seed).withSteps(steps, 20_000), null);
            for (int a = 0; a < 10; a++) {
                for (int b = 0; b < 10; b++) {
                    Estimate e = mc.edges()[a][b];
                    if (e == null) {
                        continue;
                    }
                    double[] z = {Math.abs(e.mean() - exact[a][b]) / e.mcse(), exact[a][b]};
                    if (exact[a][b] >= 0.05 && exact[a][b] <= 0.95) {
                        mid.add(z);
                    } else if (exact[a][b] >= 1e-5 && exact[a][b] <= 1e-3) {
                        rare.add(z);
                    }
                }
            }
        }
        report("mid-range 0.05-0.95", mid);
        report("rare 1e-5-1e-3", rare);
    }

    private static void report(String band, List<double[]> z) {
        double ss = 0;
        int over = 0;
        for (double[] v : z) {
            ss += v[0] * v[0];
            over += v[0] > 3 ? 1 : 0;
        }
        System.out.printf(Locale.ROOT, "%-22s edges %4d  RMS |error|/MCSE %.3f  error > 3 MCSE: %.1f %%%n", band, z.size(),
                Math.sqrt(ss / Math.max(1, z.size())), 100.0 * over / Math.max(1, z.size()));
    }
}
