package org.edgewise.driver.posterior;

import java.util.List;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.effect.WeightedDags;
import org.edgewise.driver.average.dag.ParentListDraws;

/**
 * DAGs drawn from a structure posterior, chain by chain in draw order, each DAG the sorted parent
 * list of every variable (no bound on the number of variables), with self-normalisable weights when
 * the draws are weighted (e.g. 1/ext(G) of Ellis &amp; Wong 2008). Independent exact draws are one
 * chain. Every chain holds the same number of DAGs. Memory: per DAG n arrays of |U_i| ints (≈ 16 + 4|U_i|
 * bytes each on the heap).
 *
 * @param variables n
 * @param dags      {@code dags[c][k][v]}: the parents of variable v in DAG k of chain c, ascending
 * @param weights   {@code weights[c][k]}, or null when every DAG weighs alike
 */
public record DagSample(int variables, int[][][][] dags, double[][] weights) {
    public int chains() {
        return dags.length;
    }

    public int perChain() {
        return dags.length == 0 ? 0 : dags[0].length;
    }

    public long total() {
        return (long) chains() * perChain();
    }

    public boolean weighted() {
        return weights != null;
    }

    /** Every DAG in one list, chain after chain in draw order (shared, not copied). */
    public int[][][] flatDags() {
        int k = (int) total();
        int[][][] out = new int[k][][];
        for (int g = 0; g < k; g++) {
            out[g] = dags[g / perChain()][g % perChain()];
        }
        return out;
    }

    /** The weights in {@link #flatDags()}'s order, or null when every DAG weighs the same. */
    public double[] flatWeights() {
        if (weights == null) {
            return null;
        }
        int k = (int) total();
        double[] out = new double[k];
        for (int g = 0; g < k; g++) {
            out[g] = weights[g / perChain()][g % perChain()];
        }
        return out;
    }

    /**
     * The DAGs as the effect engine averages over them: weights as drawn, chains kept apart (one chain
     * of independent draws counts as independent: MCSE from their spread).
     */
    public WeightedDags forEffects() {
        return new WeightedDags() {
            @Override
            public int size() {
                return (int) total();
            }

            @Override
            public int[][] parents(int g) {
                return dags[g / perChain()][g % perChain()];
            }

            @Override
            public double weight(int g) {
                return weighted() ? weights[g / perChain()][g % perChain()] : 1.0;
            }

            @Override
            public boolean sampled() {
                return true;
            }

            @Override
            public int chains() {
                return DagSample.this.chains() == 1 ? 0 : DagSample.this.chains();
            }
        };
    }

    /** The DAGs given as parent-set indices of {@code ls} per child, chain by chain. */
    static DagSample fromSets(LocalScores ls, List<List<int[]>> chains) {
        int n = ls.variableCount();
        int[][][][] out = new int[chains.size()][][][];
        for (int c = 0; c < out.length; c++) {
            List<int[]> chain = chains.get(c);
            out[c] = new int[chain.size()][][];
            for (int k = 0; k < chain.size(); k++) {
                int[] sets = chain.get(k);
                int[][] pa = new int[n][];
                for (int v = 0; v < n; v++) {
                    pa[v] = ls.parents(v, sets[v]).clone();
                    java.util.Arrays.sort(pa[v]);
                }
                out[c][k] = pa;
            }
        }
        return new DagSample(n, out, null);
    }

    /** The DAGs given as parent bitmasks (n ≤ 31), one chain, with optional weights. */
    static DagSample fromMasks(int n, List<int[]> masks, double[] weights) {
        int[][][] chain = new int[masks.size()][][];
        for (int k = 0; k < chain.length; k++) {
            chain[k] = ParentListDraws.parentLists(masks.get(k));
        }
        return new DagSample(n, new int[][][][] {chain}, weights == null ? null : new double[][] {weights});
    }

    /** A DAG as parent bitmasks (n ≤ 31). */
    static int[] masks(int[][] parents) {
        int[] m = new int[parents.length];
        for (int v = 0; v < parents.length; v++) {
            for (int p : parents[v]) {
                m[v] |= 1 << p;
            }
        }
        return m;
    }
}
