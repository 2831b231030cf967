package org.edgewise.driver.average.partition;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.DominatedSets;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.average.mcmc.ChainRunner;
import org.edgewise.driver.average.mcmc.ChainSet;
import org.edgewise.driver.average.mcmc.DrawStore;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;

/**
 * Partition MCMC (Kuipers &amp; Moffa 2017) for the structure-modular DAG prior: several
 * {@link PartitionChain}s, each on its own thread from dispersed starts (DAGs drawn given an order —
 * hill-climbed under the order posterior for the first pair, random for the others — and its mirror, {@link org.edgewise.driver.average.mcmc.DispersedStart}), run and diagnosed
 * exactly as order MCMC is ({@link ChainRunner}, {@link MultiChainDiagnostics}: rank-normalised
 * split-R̂, bulk- and tail-ESS and MCSE of every edge, feature and of the log score trace), with
 * Rao-Blackwellised edge estimates — P(j → i | Λ, D) of each stored partition Λ averaged over the
 * draws of all chains — and one DAG drawn per stored partition.
 *
 * <p>The target is P(Λ | D) ∝ Σ_{G with partition Λ} Π_i ρ_i(U_i) P(D | U_i), so P(G | D) under the
 * structure-modular prior (every DAG weighted by Π_i ρ_i(U_i) alone) is the chain's DAG marginal:
 * no re-weighting, hence no limit on n from counting linear extensions.
 *
 * <p>Reproducible as {@link OrderMcmc} is: chain c draws from the c-th split of
 * {@code new SplittableRandom(seed)}; the settings' relocation share does not apply (partition
 * moves have their own mix, {@link PartitionChain}).
 *
 * <p>Memory: {@link ChildTables} (at most {@code tableBudget} bytes) plus per chain at most 2·draws
 * stored draws (4 bytes per candidate edge, 12n bytes of state).
 */
public final class PartitionMcmc {
    /** Stored draws used for the parent-set posteriors (evenly spaced). */
    static final int SET_DRAWS = 1000;

    private PartitionMcmc() {
    }

    /**
     * @param chains       the edge estimates and diagnostics (as order MCMC reports them); its
     *                     {@code orders} are linear extensions of the stored partitions
     * @param dags         per chain, per stored draw used, the drawn DAG: the index of each child's
     *                     parent set in {@link LocalScores#masks(int)}
     * @param setPosterior per child and allowed set, the Rao-Blackwellised P(U_i = U | D) (mean over
     *                     at most {@value #SET_DRAWS} evenly spaced stored partitions)
     * @param partitions   the stored partitions used, chain after chain: each variable's element
     */
    public record Result(McmcResult chains, List<List<int[]>> dags, double[][] setPosterior, List<int[]> partitions) {
    }

    /**
     * Runs the chains on the parent sets that {@link DominatedSets} keeps at its margin (every edge,
     * feature and parent-set posterior within 1.7·10⁻¹² of the full sampler's target on a 40-variable,
     * d = 3 table; the bound is stated there). {@code listener} may be null.
     */
    public static Result run(LocalScores ls, OrderConstraints oc, McmcSettings s, ChainRunner.Listener listener) {
        return run(ls, oc, s, listener, DominatedSets.MARGIN);
    }

    /**
     * As {@link #run(LocalScores, OrderConstraints, McmcSettings, ChainRunner.Listener)} with the sets
     * dominated at {@code margin} nats left out ({@link DominatedSets}; {@code Double.POSITIVE_INFINITY}
     * keeps every set: the full sampler, for benchmarks side by side). The results are indexed by
     * {@code ls}'s sets whatever was left out.
     */
    public static Result run(LocalScores ls, OrderConstraints oc, McmcSettings s, ChainRunner.Listener listener, double margin) {
        return run(ls, oc, s, listener, margin, Tuning.DEFAULT);
    }

    /**
     * How the chains step, for benchmarks side by side: the former step ({@link PartitionChain#former}:
     * full relayering after a DAG move, the block draw's exps taken twice; the same draws) and the share of block moves on a child's strongest candidates.
     */
    record Tuning(boolean former, double strongShare) {
        static final Tuning DEFAULT = new Tuning(false, DagMoves.STRONG_SHARE);
    }

    static Result run(LocalScores ls, OrderConstraints oc, McmcSettings s, ChainRunner.Listener listener, double margin,
                      Tuning tuning) {
        checkTiers(ls, oc);
        int[][] keep = DominatedSets.keep(ls, margin);
        LocalScores kept = ls.restrictedTo(keep);
        Result r = runOn(kept, oc, s, listener, tuning);
        return kept == ls ? r : widen(ls, keep, r);
    }

    /** A result on the kept sets, its set indices mapped back to {@code ls}'s (left-out sets: posterior 0). */
    private static Result widen(LocalScores ls, int[][] keep, Result r) {
        int n = ls.variableCount();
        List<List<int[]>> dags = new ArrayList<>();
        for (List<int[]> chain : r.dags()) {
            List<int[]> out = new ArrayList<>(chain.size());
            for (int[] sets : chain) {
                int[] full = new int[n];
                for (int i = 0; i < n; i++) {
                    full[i] = keep[i] == null ? sets[i] : keep[i][sets[i]];
                }
                out.add(full);
            }
            dags.add(out);
        }
        double[][] post = new double[n][];
        for (int i = 0; i < n; i++) {
            if (keep[i] == null) {
                post[i] = r.setPosterior()[i];
            } else {
                post[i] = new double[ls.setCount(i)];
                for (int j = 0; j < keep[i].length; j++) {
                    post[i][keep[i][j]] = r.setPosterior()[i][j];
                }
            }
        }
        return new Result(r.chains(), dags, post, r.partitions());
    }

    private static Result runOn(LocalScores ls, OrderConstraints oc, McmcSettings s, ChainRunner.Listener listener, Tuning tuning) {
        int[] offset = ChainSet.edgeOffsets(ls);
        int[][] cpos = ChainSet.candidatePositions(ls);
        ChainSet.Run<PartitionChain> run = ChainSet.runChains(ls, offset, s, 1, PartitionChain.extraBytes(ls), listener, (tables, rng, store, start) -> {
            PartitionChain c = new PartitionChain(ls, tables, oc, offset, s.features(), rng, store, PartitionChain.Mix.DEFAULT,
                    start.order(oc, OrderMcmc.climb(ls, tables, oc, cpos, offset)));
            if (tuning.former()) {
                c.former();
            }
            c.strongBlockShare(tuning.strongShare());
            return c;
        });
        List<PartitionChain> chains = run.chains();
        ChainRunner.Outcome out = run.outcome();
        McmcResult r = run.result();
        int draws = r.report().drawsPerChain();
        List<List<int[]>> dags = new ArrayList<>();
        List<PartitionChain.State> used = new ArrayList<>();
        for (PartitionChain c : chains) {
            DrawStore st = c.draws();
            int from = st.firstAfter(out.discarded());
            List<int[]> chain = new ArrayList<>();
            for (int t = 0; t < draws; t++) {
                PartitionChain.State x = (PartitionChain.State) st.state(from + t);
                chain.add(x.sets());
                used.add(x);
            }
            dags.add(chain);
        }
        List<int[]> partitions = new ArrayList<>();
        for (PartitionChain.State x : used) {
            partitions.add(x.element());
        }
        return new Result(r, dags, setPosterior(ls, oc, used), partitions);
    }

    /**
     * Tiers are honoured exactly only when every variable is in a tier: then a DAG has a
     * tier-respecting order iff none of its edges points to an earlier tier, which the chains
     * enforce edge by edge. With unlisted variables a path through them may run against the tiers
     * with no single edge doing so: refused.
     */
    static void checkTiers(LocalScores ls, OrderConstraints oc) {
        if (oc.tierNames().isEmpty()) {
            return;
        }
        List<String> unlisted = new ArrayList<>();
        for (int v = 0; v < ls.variableCount(); v++) {
            if (oc.tier(v) < 0) {
                unlisted.add(ls.store().variables().get(v).name());
            }
        }
        if (!unlisted.isEmpty()) {
            org.edgewise.driver.InputNames names = ls.options().names();
            throw new org.edgewise.driver.UserError(names.tiers() + " with partition MCMC (" + names.structureModular()
                    + ") needs every variable in a tier; not listed: "
                    + String.join(", ", unlisted.subList(0, Math.min(5, unlisted.size())))
                    + (unlisted.size() > 5 ? " and " + (unlisted.size() - 5) + " more" : "")
                    + "; list them, or use " + names.orderModular());
        }
    }

    /** Mean over evenly spaced stored partitions of each allowed set's weight share ({@link OrderPosterior#ofPartition}). */
    private static double[][] setPosterior(LocalScores ls, OrderConstraints oc, List<PartitionChain.State> used) {
        int n = ls.variableCount();
        double[][] out = new double[n][];
        for (int i = 0; i < n; i++) {
            out[i] = new double[ls.setCount(i)];
        }
        int every = Math.max(1, used.size() / SET_DRAWS);
        int k = 0;
        for (int d = 0; d < used.size(); d += every) {
            double[][] p = OrderPosterior.ofPartition(ls, used.get(d).element(), oc).setPosteriors();
            k++;
            for (int i = 0; i < n; i++) {
                for (int s = 0; s < p[i].length; s++) {
                    out[i][s] += p[i][s];
                }
            }
        }
        for (double[] row : out) {
            for (int s = 0; s < row.length; s++) {
                row[s] /= k;
            }
        }
        return out;
    }
}
