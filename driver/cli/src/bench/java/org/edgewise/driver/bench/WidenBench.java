package org.edgewise.driver.bench;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.analysis.EdgeAnalysis;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;

/**
 * Candidate pruning against the unpruned posterior (issue 20, point 3), side by side in one run: a
 * random network of our own (ternary variables, up to 3 parents among the {@code window} before each, CPT
 * rows skewed by {@code sharpness}: {@link RandomNetwork}), its rows
 * drawn by the one forward sampler, tallied three ways in memory — every parent set of at most d, the K
 * best single parents per child (as {@code tally --candidates K}), and the same with a reserve of M more
 * (as {@code tally --candidates K --reserve M}, widened where the posterior asks) — and averaged by
 * {@code edges --method mcmc} (structure-modular, partition MCMC, until converged or the time budget).
 * The target: no edge above 0.5 in a pruned result that the unpruned one puts below 0.1.
 *
 * <p>Arguments: [n 20] [rows 50000] [K 10] [M 5] [seconds per run 120] [d 3] [network seed 1] [window 4]
 * [sharpness 4]. The defaults are a table where the K best single parents leave two true parents out
 * ({@code probe} finds such tables; at window 19 and sharpness 1.5 none of five seeds lost one).
 */
public final class WidenBench {
    private WidenBench() {
    }

    public static void main(String[] args) {
        if (args.length > 0 && args[0].equals("probe")) {
            probe(args);
            return;
        }
        int n = arg(args, 0, 20);
        int rows = arg(args, 1, 50_000);
        int k = arg(args, 2, 10);
        int m = arg(args, 3, 5);
        double seconds = arg(args, 4, 120);
        int d = arg(args, 5, 3);
        long seed = arg(args, 6, 1);
        int window = arg(args, 7, 4);
        double sharpness = args.length > 8 ? Double.parseDouble(args[8]) : 4;
        Network net = RandomNetwork.generate("v", n, 3, 3, window, sharpness, 0, seed);
        int[][] data = new ForwardSampler(net).sample(rows, seed + 1);
        List<Variable> vars = RandomNetwork.variables(net);
        System.out.printf("# widen benchmark: n=%d rows=%d d=%d K=%d M=%d, network seed %d window %d sharpness %.1f, %d true edges, "
                + "%d cores, load %.1f%n", n, rows, d, k, m, seed, window, sharpness, net.edges().size(),
                Runtime.getRuntime().availableProcessors(), UnknownOrderBench.load());
        FamilyScore fs = FamilyScore.withDefaults();
        long t0 = System.nanoTime();
        ScoreStore full = InMemoryTally.tally(vars, data, d, fs);
        System.out.printf("unpruned store: %d families (%.1f s)%n", full.families().size(), (System.nanoTime() - t0) / 1e9);
        ScoreStore pruned = InMemoryTally.pruned(vars, data, d, fs, k, -1);
        ScoreStore reserve = InMemoryTally.pruned(vars, data, d, fs, k, m);
        System.out.printf("pruned store: %d families; with reserve: %d families%n", pruned.families().size(),
                reserve.families().size());
        int lost = 0;
        List<String> lostNames = new ArrayList<>();
        for (int c = 0; c < n; c++) {
            List<String> cand = pruned.manifest().candidates().get(vars.get(c).name());
            for (int p : net.parents()[c]) {
                if (!cand.contains(vars.get(p).name())) {
                    lost++;
                    lostNames.add(vars.get(p).name() + "->" + vars.get(c).name());
                }
            }
        }
        System.out.printf("true parents outside the K=%d candidates: %d %s%n", k, lost, lostNames);
        EdgeResult ref = run("unpruned", full, seconds, null);
        run("candidates " + k, pruned, seconds, ref);
        run("candidates " + k + " + reserve " + m, reserve, seconds, ref);
    }

    /**
     * How many true parents the K best single parents leave out, per network seed (single-parent
     * families only, so cheap): {@code probe n rows K window sharpness seed...}, to pick a table where
     * pruning bites.
     */
    static void probe(String[] args) {
        int n = Integer.parseInt(args[1]);
        int rows = Integer.parseInt(args[2]);
        int k = Integer.parseInt(args[3]);
        int window = Integer.parseInt(args[4]);
        double sharp = Double.parseDouble(args[5]);
        for (int a = 6; a < args.length; a++) {
            long seed = Long.parseLong(args[a]);
            Network net = RandomNetwork.generate("v", n, 3, 3, window, sharp, 0, seed);
            int[][] data = new ForwardSampler(net).sample(rows, seed + 1);
            List<Variable> vars = RandomNetwork.variables(net);
            ScoreStore pruned = InMemoryTally.pruned(vars, data, 0, FamilyScore.withDefaults(), k, -1);
            List<String> lost = new ArrayList<>();
            for (int c = 0; c < n; c++) {
                List<String> cand = pruned.manifest().candidates().get(vars.get(c).name());
                for (int p : net.parents()[c]) {
                    if (!cand.contains(vars.get(p).name())) {
                        lost.add(vars.get(p).name() + "->" + vars.get(c).name());
                    }
                }
            }
            System.out.printf("probe n=%d rows=%d K=%d window=%d sharpness=%.1f seed %d: %d true edges, %d parents pruned %s%n", n,
                    rows, k, window, sharp, seed, net.edges().size(), lost.size(), lost);
        }
    }

    static EdgeResult run(String label, ScoreStore store, double seconds, EdgeResult ref) {
        UnknownOrderSettings s = new UnknownOrderSettings(UnknownOrderSettings.Method.MCMC, null, 1L, 4, null, null, 100, null,
                null, seconds, false, false, 1, 0, null, false);
        long t0 = System.nanoTime();
        double cpu0 = UnknownOrderBench.cpu();
        ProgressListener notes = new ProgressListener() {
            @Override
            public void done(long done) {
            }

            @Override
            public void note(String line) {
                if (line.startsWith("candidates:")) {
                    System.out.println("  " + line);
                }
            }
        };
        EdgeResult r = EdgeAnalysis.run(store, null, List.of(ScoringOptions.asStored()), null, s, 0, notes, x -> { });
        double wall = (System.nanoTime() - t0) / 1e9;
        EdgeResult.Diagnostics dg = r.diagnostics();
        System.out.printf("%s: %.1f s wall, %.1f CPU-s; last run %s (R-hat %.4f, ESS %.0f, %s)%n", label, wall,
                UnknownOrderBench.cpu() - cpu0, dg.converged() ? "converged" : "NOT converged", dg.rhat(),
                dg.bulkEffectiveSampleSize(), dg.stopReason());
        if (r.candidateSearch() != null) {
            EdgeResult.CandidateSearch c = r.candidateSearch();
            System.out.printf("  widened %d children (%s); still at the boundary: %s; unchecked: %d children%n",
                    c.widened().size(), c.widened().stream().map(w -> w.child() + "+" + w.added().size() + " r" + w.round()
                            + " " + w.rule()).toList(), r.candidateBoundary(), c.unchecked().size());
        }
        if (ref != null) {
            compare(r, ref);
        }
        return r;
    }

    /** Edges confident here (≥ 0.5) that the reference puts below 0.1, the reverse, and the largest difference. */
    static void compare(EdgeResult r, EdgeResult ref) {
        double max = 0;
        List<String> falseEdges = new ArrayList<>();
        List<String> missed = new ArrayList<>();
        for (int e = 0; e < r.edges().size(); e++) {
            EdgeResult.Edge a = r.edges().get(e);
            EdgeResult.Edge b = ref.edges().get(e);
            if (!a.from().equals(b.from()) || !a.to().equals(b.to())) {
                throw new IllegalStateException("edge lists differ at " + e);
            }
            max = Math.max(max, Math.abs(a.posterior() - b.posterior()));
            if (a.posterior() >= 0.5 && b.posterior() < 0.1) {
                falseEdges.add(String.format("%s->%s %.3f (unpruned %.3f)", a.from(), a.to(), a.posterior(), b.posterior()));
            }
            if (b.posterior() >= 0.5 && a.posterior() < 0.1) {
                missed.add(String.format("%s->%s %.3f (unpruned %.3f)", a.from(), a.to(), a.posterior(), b.posterior()));
            }
        }
        System.out.printf("  against unpruned: %d edges >= 0.5 that it puts < 0.1 %s; %d it puts >= 0.5 here < 0.1 %s; "
                + "max |delta| %.3f%n", falseEdges.size(), falseEdges, missed.size(), missed, max);
    }

    private static int arg(String[] args, int i, int dflt) {
        return args.length > i ? Integer.parseInt(args[i]) : dflt;
    }
}
