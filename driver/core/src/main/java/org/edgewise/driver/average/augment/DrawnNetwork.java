package org.edgewise.driver.average.augment;

import java.io.Serializable;
import java.util.Arrays;
import java.util.SplittableRandom;
import org.edgewise.driver.average.DirichletDraw;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;

/**
 * One DAG with one draw of its parameters: what a round of data augmentation (Tanner &amp; Wong 1987)
 * redraws the missing cells under. The parameters of each family are drawn from their posterior
 * given the completed table, Dirichlet(N_ijk + α_ijk) with the store's pseudo-counts (BDeu:
 * α_ijk = ESS/(q_i r_i); Heckerman, Geiger &amp; Chickering 1995), for every parent configuration,
 * observed or not (an unobserved one gets a draw from its prior).
 *
 * <p>{@link #complete} draws the missing cells of one row from their exact joint conditional given
 * the row's observed cells: P(x_M | x_O) ∝ Π_i θ_i(x_i | x_{U_i}) over the families that hold a
 * missing variable (the others do not depend on x_M), enumerated over every joint value of the
 * missing cells — at most {@link #MAX_JOINT} of them.
 *
 * <p>Memory: per variable q_i·r_i doubles (log θ), at most {@link #MAX_CELLS} in all. Immutable;
 * shared by the tasks of one round.
 */
public final class DrawnNetwork implements Serializable {
    private static final long serialVersionUID = 1L;
    /** Most joint values of one row's missing cells enumerated exactly. */
    public static final long MAX_JOINT = 1L << 16;
    /** Most parameter cells (Σ_i q_i r_i) of one drawn network. */
    public static final long MAX_CELLS = 1L << 26;

    private final int[] arity;
    private final int[][] parents;
    /** For each variable, the variables whose family holds it as a parent. */
    private final int[][] children;
    /** log θ_i(k | j) at [i][j·r_i + k], j in mixed radix over the sorted parents, the first most significant. */
    private final double[][] logTheta;

    private DrawnNetwork(int[] arity, int[][] parents, double[][] logTheta) {
        this.arity = arity.clone();
        this.parents = new int[parents.length][];
        int n = arity.length;
        int[] childCount = new int[n];
        for (int v = 0; v < n; v++) {
            this.parents[v] = parents[v].clone();
            Arrays.sort(this.parents[v]);
            for (int p : parents[v]) {
                childCount[p]++;
            }
        }
        this.children = new int[n][];
        for (int v = 0; v < n; v++) {
            children[v] = new int[childCount[v]];
            childCount[v] = 0;
        }
        for (int v = 0; v < n; v++) {
            for (int p : this.parents[v]) {
                children[p][childCount[p]++] = v;
            }
        }
        this.logTheta = logTheta;
    }

    /**
     * The network without edges whose θ_i are the posterior means of the observed cells' marginal
     * counts, (n_ik + ESS/r_i)/(n_i + ESS): the simple completion a chain starts from (every missing
     * cell drawn from its variable's observed marginal).
     *
     * @param observed per variable, the count of each state among its observed cells
     */
    public static DrawnNetwork marginals(int[] arity, long[][] observed, double ess) {
        int n = arity.length;
        double[][] lt = new double[n][];
        int[][] none = new int[n][0];
        for (int v = 0; v < n; v++) {
            int r = arity[v];
            long total = 0;
            for (int k = 0; k < r; k++) {
                total += observed[v][k];
            }
            lt[v] = new double[r];
            for (int k = 0; k < r; k++) {
                lt[v][k] = Math.log((observed[v][k] + ess / r) / (total + ess));
            }
        }
        return new DrawnNetwork(arity, none, lt);
    }

    /**
     * The DAG {@code parents} (per variable, its parents) with parameters drawn from their posterior
     * given the completed table {@code store} (which must hold each of the DAG's families).
     */
    public static DrawnNetwork draw(ScoreStore store, FamilyScore score, int[][] parents, SplittableRandom rng) {
        int n = store.variableCount();
        int[] arity = new int[n];
        for (int v = 0; v < n; v++) {
            arity[v] = store.arity(v);
        }
        long cells = 0;
        double[][] lt = new double[n][];
        for (int v = 0; v < n; v++) {
            int[] pa = parents[v].clone();
            Arrays.sort(pa);
            FamilyCounts fc = family(store, v, pa);
            int r = arity[v];
            double q = store.configurations(pa);
            cells += (long) (q * r);
            if (q * r > MAX_CELLS || cells > MAX_CELLS) {
                throw new IllegalArgumentException("a drawn network would hold more than " + MAX_CELLS + " parameters");
            }
            double a = score.cellAlpha(r, q);
            lt[v] = new double[(int) q * r];
            int row = 0;
            for (int j = 0; j < (int) q; j++) {
                boolean seen = row < fc.configs().length && fc.configs()[row] == j;
                DirichletDraw.logDraw(a, seen ? fc.counts() : null, row * r, r, rng, lt[v], j * r);
                if (seen) {
                    row++;
                }
            }
        }
        return new DrawnNetwork(arity, parents, lt);
    }

    private static FamilyCounts family(ScoreStore store, int child, int[] parents) {
        for (int f = store.firstFamilyOf(child); f < store.endFamilyOf(child); f++) {
            if (Arrays.equals(store.family(f).parents(), parents)) {
                return store.family(f);
            }
        }
        throw new IllegalArgumentException("the store holds no family " + child + " <- " + Arrays.toString(parents));
    }

    /** Number of joint values of the cells {@code missing} (saturating at Long.MAX_VALUE). */
    public static long jointSize(int[] arity, int[] missing) {
        long size = 1;
        for (int v : missing) {
            size = Math.multiplyHigh(size, arity[v]) != 0 ? Long.MAX_VALUE : size * arity[v];
        }
        return size;
    }

    /** The parents of every variable, ascending (shared: do not modify). */
    public int[][] parents() {
        return parents;
    }

    /** log θ_v(k | j) (for tests). */
    public double logTheta(int v, int j, int k) {
        return logTheta[v][j * arity[v] + k];
    }

    /**
     * Redraws the cells {@code missing} of the row {@code x} (state indices; the values at the missing
     * positions are overwritten) from their exact joint conditional given the row's other cells.
     */
    public void complete(int[] x, int[] missing, SplittableRandom rng) {
        long size = jointSize(arity, missing);
        if (size > MAX_JOINT) {
            throw new IllegalArgumentException(size + " joint values of " + missing.length + " missing cells");
        }
        int n = arity.length;
        // the families that hold a missing variable, as the child or a parent
        boolean[] touched = new boolean[n];
        for (int m : missing) {
            touched[m] = true;
            for (int c : children[m]) {
                touched[c] = true;
            }
        }
        int count = 0;
        int[] fam = new int[n];
        for (int v = 0; v < n; v++) {
            if (touched[v]) {
                fam[count++] = v;
            }
        }
        int joint = (int) size;
        double[] lw = new double[joint];
        double max = Double.NEGATIVE_INFINITY;
        for (int c = 0; c < joint; c++) {
            set(x, missing, c);
            double s = 0;
            for (int i = 0; i < count; i++) {
                s += logFactor(fam[i], x);
            }
            lw[c] = s;
            max = Math.max(max, s);
        }
        // inverse-CDF draw over exp(lw − max)
        double total = 0;
        for (int c = 0; c < joint; c++) {
            lw[c] = Math.exp(lw[c] - max);
            total += lw[c];
        }
        double u = rng.nextDouble() * total;
        int pick = joint - 1;
        for (int c = 0; c < joint; c++) {
            u -= lw[c];
            if (u < 0) {
                pick = c;
                break;
            }
        }
        set(x, missing, pick);
    }

    /** log θ_v(x_v | x_{U_v}). */
    private double logFactor(int v, int[] x) {
        int j = 0;
        for (int p : parents[v]) {
            j = j * arity[p] + x[p];
        }
        return logTheta[v][j * arity[v] + x[v]];
    }

    /** Writes joint value c (mixed radix over {@code missing}, the last fastest) into x. */
    private void set(int[] x, int[] missing, int c) {
        for (int i = missing.length - 1; i >= 0; i--) {
            int r = arity[missing[i]];
            x[missing[i]] = c % r;
            c /= r;
        }
    }
}
