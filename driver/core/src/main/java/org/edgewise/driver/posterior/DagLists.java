package org.edgewise.driver.posterior;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.dag.DagDraws;
import org.edgewise.driver.average.dag.DrawnDags;
import org.edgewise.driver.average.dag.DagFeatures;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.average.convergence.McseBound;
import org.edgewise.driver.average.givenorder.OrderSum;
import org.edgewise.driver.average.partition.PartitionMcmc;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.mcmc.McmcResult;

/**
 * DAG lists from chains (as parent bitmasks, n ≤ {@value #MAX_DRAW_VARIABLES}) and the ancestor and
 * Markov-blanket features estimated over them. Memory: n ints per DAG.
 */
final class DagLists {
    /** Largest n for DAG draws (parent bitmasks in an int). */
    static final int MAX_DRAW_VARIABLES = 31;

    private DagLists() {
    }

    /** DAGs drawn over MCMC's stored orders, {@code group} per order (order-modular DAG draws). */
    static DagDraws fromChains(LocalScores ls, McmcResult r, int chains, int samples, long seed) {
        int n = ls.variableCount();
        checkDrawable(ls);
        int perChain = r.orders().size() / chains;
        int group = Math.max(1, (samples + r.orders().size() - 1) / r.orders().size());
        SplittableRandom rng = new SplittableRandom(seed);
        List<List<int[]>> dags = new ArrayList<>();
        long[] mask = new long[n];
        double[] z = new double[n];
        for (int c = 0; c < chains; c++) {
            List<int[]> chain = new ArrayList<>();
            for (int t = 0; t < perChain; t++) {
                int[] order = r.orders().get(c * perChain + t);
                int[] pos = OrderSum.positions(order, n);
                for (int i = 0; i < n; i++) {
                    mask[i] = ls.predecessorMask(i, pos);
                    z[i] = OrderSum.childLogSum(ls, i, mask[i]);
                }
                for (int g = 0; g < group; g++) {
                    chain.add(parentMasks(ls, DagFeatures.sampleDag(ls, mask, z, rng)));
                }
            }
            dags.add(chain);
        }
        return new DagDraws(n, dags, group, null);
    }

    /** The DAGs partition MCMC drew (one per stored partition), as parent bitmasks. */
    static DagDraws fromPartitions(LocalScores ls, PartitionMcmc.Result r) {
        checkDrawable(ls);
        List<List<int[]>> dags = new ArrayList<>();
        for (List<int[]> chain : r.dags()) {
            List<int[]> out = new ArrayList<>();
            for (int[] sets : chain) {
                out.add(parentMasks(ls, sets));
            }
            dags.add(out);
        }
        return new DagDraws(ls.variableCount(), dags, 1, null);
    }

    /**
     * The background knowledge the draws obey, as {@link DagDraws#knowing(int[])} takes it: per
     * node v, the nodes u whose edge with v, when present, must be u → v — u must precede v
     * ({@code oc}: tiers, required edges and their transitive closure), or v → u is forbidden (by
     * the query or at tally time).
     */
    static int[] fixedDirections(LocalScores ls, OrderConstraints oc) {
        int n = ls.variableCount();
        checkDrawable(ls);
        int[] fixed = oc.predecessorMasks();
        Manifest m = ls.store().manifest();
        List<EdgeRule> forbidden = new ArrayList<>(ls.options().forbid());
        if (m.forbidden() != null) {
            forbidden.addAll(m.forbidden());
        }
        for (EdgeRule e : forbidden) {
            int from = m.variableIndex(e.from());
            int to = m.variableIndex(e.to());
            if (from >= 0 && to >= 0 && from < n && to < n) {
                fixed[from] |= 1 << to; // from -> to forbidden: an edge between them is to -> from
            }
        }
        return fixed;
    }

    /** The draws' essential graphs under the knowledge of {@link #fixedDirections}. */
    static DagDraws knowing(DagDraws d, LocalScores ls, OrderConstraints oc) {
        return d == null ? null : d.knowing(fixedDirections(ls, oc));
    }

    /** Refuses DAG draws beyond {@value #MAX_DRAW_VARIABLES} variables, in the caller's words. */
    static void checkDrawable(LocalScores ls) {
        int n = ls.variableCount();
        if (n > MAX_DRAW_VARIABLES) {
            throw new UserError(ls.options().names().drawFeatures() + " from DAG draws handle at most "
                    + MAX_DRAW_VARIABLES + " variables, this store has " + n);
        }
    }

    /** Parent bitmasks of the DAG with parent-set index {@code sets[i]} per child. */
    static int[] parentMasks(LocalScores ls, int[] sets) {
        int[] pa = new int[sets.length];
        for (int i = 0; i < sets.length; i++) {
            for (int p : ls.parents(i, sets[i])) {
                pa[i] |= 1 << p;
            }
        }
        return pa;
    }

    /** The features {@code s} asks for, estimated over the DAGs of {@code d} (their errors as {@link DagDraws} reports them). */
    static StructurePosterior.Features features(UnknownOrderSettings s, DrawnDags d) {
        int n = d.variableCount();
        double[][][] f = new double[4][n][n];
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a != b && s.ancestors()) {
                    Estimate e = d.estimate(d.ancestor(a, b));
                    f[0][a][b] = e.mean();
                    f[1][a][b] = e.mcse();
                }
                if (a < b && s.markovBlanket()) {
                    Estimate e = d.estimate(d.blanket(a, b));
                    f[2][a][b] = e.mean();
                    f[3][a][b] = e.mcse();
                }
            }
        }
        return new StructurePosterior.Features(f[0], f[1], f[2], f[3]);
    }

    /**
     * Features from per-pair means and standard errors over {@code draws} draws, an estimate of
     * exactly 0 or 1 reporting the rule-of-three bound ({@link McseBound}).
     */
    static StructurePosterior.Features bounded(double[][] anc, double[][] ancSe, double[][] mb, double[][] mbSe, long draws) {
        int n = anc.length;
        double[][] ancOut = new double[n][n];
        double[][] mbOut = new double[n][n];
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a != b) {
                    ancOut[a][b] = McseBound.reported(clamp(anc[a][b]), ancSe[a][b], draws);
                    mbOut[a][b] = McseBound.reported(clamp(mb[a][b]), mbSe[a][b], draws);
                }
            }
        }
        return new StructurePosterior.Features(anc, ancOut, mb, mbOut);
    }

    static double clamp(double p) {
        return p < 0 ? 0 : Math.min(p, 1.0);
    }
}
