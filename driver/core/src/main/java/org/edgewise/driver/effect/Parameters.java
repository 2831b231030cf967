package org.edgewise.driver.effect;

import java.util.Arrays;
import java.util.HashMap;
import java.util.Map;
import java.util.SplittableRandom;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.DirichletDraw;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;

/**
 * The parameters θ_ijk = P(X_i = k | parents in configuration j) of the families a DAG uses,
 * from the stored counts: either the posterior mean θ̄_ijk = (N_ijk + α_ijk)/(N_ij + α_ij)
 * (Heckerman, Geiger &amp; Chickering 1995, eq. 23), or one draw from the posterior
 * Dirichlet(N_ij1 + α_ij1, …, N_ijr + α_ijr), made by normalising independent Gamma(N_ijk + α_ijk)
 * draws (Marsaglia &amp; Tsang 2000, "A simple method for generating gamma variables", ACM TOMS
 * 26(3); shapes below 1 boosted by U^{1/a}, in log space because BDeu's α_ijk can be 10⁻³).
 * Draws are made lazily per (family, configuration) and kept for one DAG draw ({@link #fresh}).
 *
 * <p>Memory: per family touched, one reference per parent configuration (q), and r doubles per
 * configuration visited. Not thread-safe.
 */
final class Parameters {
    private final ScoreStore store;
    private final FamilyScore score;
    /** Per child, its store families ordered by parent list (lexicographically): found by binary search, any width. */
    private final int[][] familyOf;
    private final SplittableRandom rng;
    private final Map<Integer, double[][]> drawn = new HashMap<>();

    private Parameters(LocalScores ls, SplittableRandom rng) {
        this.store = ls.store();
        this.score = ls.familyScore();
        this.rng = rng;
        int n = ls.variableCount();
        familyOf = new int[n][];
        for (int c = 0; c < n; c++) {
            int from = store.firstFamilyOf(c);
            int to = store.endFamilyOf(c);
            familyOf[c] = java.util.stream.IntStream.range(from, to).toArray();
            boolean ordered = true;
            for (int f = from + 1; f < to && ordered; f++) {
                ordered = Arrays.compare(sorted(store.family(f - 1).parents()), sorted(store.family(f).parents())) < 0;
            }
            if (!ordered) {
                familyOf[c] = java.util.stream.IntStream.range(from, to).boxed()
                        .sorted((a, b) -> Arrays.compare(sorted(store.family(a).parents()), sorted(store.family(b).parents())))
                        .mapToInt(Integer::intValue).toArray();
            }
        }
    }

    /** Posterior means (no randomness). */
    static Parameters mean(LocalScores ls) {
        return new Parameters(ls, null);
    }

    /** Posterior draws from {@code rng}. */
    static Parameters draws(LocalScores ls, SplittableRandom rng) {
        return new Parameters(ls, rng);
    }

    /** Forgets the drawn parameters: the next DAG draw gets its own. */
    void fresh() {
        drawn.clear();
    }

    /** The store family of {@code child} with exactly these parents (an IllegalArgumentException when the store has none). */
    int family(int child, int[] parents) {
        int[] want = sorted(parents);
        int[] fams = familyOf[child];
        int lo = 0;
        int hi = fams.length - 1;
        while (lo <= hi) {
            int mid = (lo + hi) >>> 1;
            int cmp = Arrays.compare(sorted(store.family(fams[mid]).parents()), want);
            if (cmp == 0) {
                return fams[mid];
            } else if (cmp < 0) {
                lo = mid + 1;
            } else {
                hi = mid - 1;
            }
        }
        throw new IllegalArgumentException("the store holds no family " + child + " <- " + Arrays.toString(parents));
    }

    /** {@code vars} ascending (itself when it already is). */
    static int[] sorted(int[] vars) {
        for (int i = 1; i < vars.length; i++) {
            if (vars[i] < vars[i - 1]) {
                int[] s = vars.clone();
                Arrays.sort(s);
                return s;
            }
        }
        return vars;
    }

    /** θ(k | j) of store family {@code f}: the posterior mean, or this draw's value. */
    double theta(int f, long j, int k) {
        FamilyCounts fc = store.family(f);
        int r = store.arity(fc.child());
        double q = store.configurations(fc.parents());
        int row = Arrays.binarySearch(fc.configs(), j);
        if (rng == null) {
            long nijk = row >= 0 ? fc.counts()[row * r + k] : 0;
            long nij = 0;
            if (row >= 0) {
                for (int x = 0; x < r; x++) {
                    nij += fc.counts()[row * r + x];
                }
            }
            return score.predictive(nijk, nij, r, q);
        }
        double[][] rows = drawn.computeIfAbsent(f, key -> new double[(int) q][]);
        double[] theta = rows[(int) j];
        if (theta == null) {
            double a = score.cellAlpha(r, q);
            double[] lg = new double[r];
            for (int x = 0; x < r; x++) {
                lg[x] = logGamma(a + (row >= 0 ? fc.counts()[row * r + x] : 0), rng);
            }
            double z = LogSum.of(lg);
            theta = new double[r];
            for (int x = 0; x < r; x++) {
                theta[x] = Math.exp(lg[x] - z);
            }
            rows[(int) j] = theta;
        }
        return theta[k];
    }

    /** The log of a Gamma(shape, 1) draw ({@link DirichletDraw#logGamma}, the one Gamma sampler). */
    static double logGamma(double shape, SplittableRandom rng) {
        return DirichletDraw.logGamma(shape, rng);
    }

    /** The variables {@code vars} as a bitset of {@code words} 64-bit words (any number of variables). */
    static long[] mask(int[] vars, int words) {
        long[] m = new long[words];
        for (int v : vars) {
            m[v >>> 6] |= 1L << v;
        }
        return m;
    }
}
