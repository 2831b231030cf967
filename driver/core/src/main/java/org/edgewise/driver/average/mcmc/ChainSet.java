package org.edgewise.driver.average.mcmc;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;

/**
 * What order and partition MCMC share: the zeta tables, one draw store and random stream per chain
 * (split from the seed), the runner (fixed length or until converged, diagnostics over the
 * candidate edges) and the summary of the draws ({@link #summarise}).
 */
public final class ChainSet {
    private ChainSet() {
    }

    /** cpos[i][j]: the index of j among i's candidates, −1 when j is none (n² ints, shared by all chains). */
    public static int[][] candidatePositions(LocalScores ls) {
        int n = ls.variableCount();
        int[][] cpos = new int[n][n];
        for (int i = 0; i < n; i++) {
            java.util.Arrays.fill(cpos[i], -1);
            int[] cand = ls.candidates(i);
            for (int k = 0; k < cand.length; k++) {
                cpos[i][cand[k]] = k;
            }
        }
        return cpos;
    }

    /** Per child i, where its candidate edges start in the flat edge arrays: offset[i+1] − offset[i] = |candidates(i)|. */
    public static int[] edgeOffsets(LocalScores ls) {
        int n = ls.variableCount();
        int[] offset = new int[n + 1];
        for (int i = 0; i < n; i++) {
            offset[i + 1] = offset[i] + ls.candidates(i).length;
        }
        return offset;
    }

    /** Makes one chain over the shared zeta tables, with its own random stream and draw store. */
    public interface ChainFactory<C extends ChainRunner.Chain> {
        C make(ChildTables tables, SplittableRandom rng, DrawStore store, DispersedStart start);
    }

    /** The chains as they ended, the runner's outcome and the summary of their draws. */
    public record Run<C extends ChainRunner.Chain>(List<C> chains, ChainRunner.Outcome outcome, McmcResult result) {
    }

    /**
     * What order and partition MCMC share: the zeta tables, one draw store and random stream per
     * chain (split from the seed), the runner (fixed length or until converged, diagnostics over the
     * candidate edges) and {@link #summarise}.
     */
    public static <C extends ChainRunner.Chain> Run<C> runChains(LocalScores ls, int[] offset, McmcSettings s,
                                                          ChainRunner.Listener listener, ChainFactory<C> factory) {
        return runChains(ls, offset, s, 1, 0, listener, factory);
    }

    /**
     * As above, each reported chain a ladder of {@code rungs} chains, each chain holding
     * {@code extraChainBytes} beyond an order chain's state (for the memory plan).
     */
    public static <C extends ChainRunner.Chain> Run<C> runChains(LocalScores ls, int[] offset, McmcSettings s, int rungs,
                                                          long extraChainBytes, ChainRunner.Listener listener,
                                                          ChainFactory<C> factory) {
        int n = ls.variableCount();
        int[] edgeFrom = new int[offset[n]];
        int[] edgeTo = new int[offset[n]];
        for (int i = 0; i < n; i++) {
            int[] cand = ls.candidates(i);
            for (int k = 0; k < cand.length; k++) {
                edgeFrom[offset[i] + k] = cand[k];
                edgeTo[offset[i] + k] = i;
            }
        }
        long t0 = System.nanoTime();
        McmcMemory memory = McmcMemory.plan(ls, s, rungs, extraChainBytes);
        memory.checkHere();
        ChildTables tables = new ChildTables(ls, s.tableBudget());
        SplittableRandom root = new SplittableRandom(s.seed());
        // a stream of its own (the seed with its bits mixed), so the chains' streams are the seed's whatever the starts
        DispersedStart[] starts = DispersedStart.plan(s.chains(), new SplittableRandom(~s.seed() * 0x9E3779B97F4A7C15L));
        List<C> chains = new ArrayList<>();
        for (int c = 0; c < s.chains(); c++) {
            DrawStore store = s.untilConverged() ? new DrawStore(offset[n], s.targets().drawsPerChain(s.draws(), s.chains()), 1, 0)
                    : new DrawStore(offset[n], s.draws(), Math.max(1, s.steps() / s.draws()), s.burnIn());
            chains.add(factory.make(tables, root.split(), store, starts[c]));
        }
        double setup = (System.nanoTime() - t0) / 1e9;
        List<String> names = new ArrayList<>();
        for (var v : ls.store().variables()) {
            names.add(v.name());
        }
        MultiChainDiagnostics.Quantities q = OrderQuantities.of(names, edgeFrom, edgeTo, s.features());
        ChainRunner.Outcome out = ChainRunner.run(chains, new ChainRunner.Plan(s.steps(), s.burnIn(), s.untilConverged(),
                Math.max(s.maxSteps(), s.steps()), s.maxSeconds(), s.targets()), q, listener);
        return new Run<>(chains, out, summarise(ls, chains, offset, s, out, setup, edgeFrom.length, memory));
    }

    public static McmcResult summarise(LocalScores ls, List<? extends ChainRunner.Chain> chains, int[] offset, McmcSettings s,
                            ChainRunner.Outcome out, double setup, int edgeCount, McmcMemory memory) {
        int n = ls.variableCount();
        MultiChainDiagnostics.Report rep = out.report();
        List<DrawStore> stores = new ArrayList<>();
        int[] from = new int[chains.size()];
        for (int c = 0; c < chains.size(); c++) {
            stores.add(chains.get(c).draws());
            from[c] = stores.get(c).firstAfter(out.discarded());
        }
        int draws = rep.drawsPerChain();
        Estimate[][] edges = new Estimate[n][n];
        for (int i = 0; i < n; i++) {
            int[] cand = ls.candidates(i);
            for (int k = 0; k < cand.length; k++) {
                int e = offset[i] + k;
                double sum = 0;
                for (int c = 0; c < stores.size(); c++) {
                    for (int t = 0; t < draws; t++) {
                        sum += stores.get(c).quantity(from[c] + t, e);
                    }
                }
                edges[cand[k]][i] = Estimate.of(sum / (draws * stores.size()), rep.quantities()[e]);
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
                    int qa = edgeCount + OrderQuantities.ancestorIndex(a, b, n);
                    anc[a][b] = Estimate.of(rep.quantities()[qa].mean(), rep.quantities()[qa]);
                    if (a < b) {
                        int qb = edgeCount + OrderQuantities.blanketIndex(a, b, n);
                        mb[a][b] = Estimate.of(rep.quantities()[qb].mean(), rep.quantities()[qb]);
                        mb[b][a] = mb[a][b];
                    }
                }
            }
        }
        List<double[]> traces = new ArrayList<>();
        List<int[]> orders = new ArrayList<>();
        long thin = stores.get(0).thin();
        for (int c = 0; c < stores.size(); c++) {
            double[] tr = new double[draws];
            for (int t = 0; t < draws; t++) {
                tr[t] = stores.get(c).logScore(from[c] + t);
                orders.add(((DrawStore.Drawn) stores.get(c).state(from[c] + t)).order());
            }
            traces.add(tr);
            thin = Math.min(thin, stores.get(c).thin());
        }
        double cpu = 0;
        double[] swaps = new double[0];
        for (ChainRunner.Chain c : chains) {
            cpu += c.cpuSeconds();
            double[] a = c.swapAcceptance();
            if (a.length > 0) {
                swaps = swaps.length == 0 ? new double[a.length] : swaps;
                for (int r = 0; r < a.length; r++) {
                    swaps[r] += a[r] / chains.size();
                }
            }
        }
        return new McmcResult(edges, anc, mb, rep, out, ChainRunner.acceptance(chains), thin, traces, orders, setup, cpu,
                swaps, s.betaMinFor(n), memory);
    }
}
