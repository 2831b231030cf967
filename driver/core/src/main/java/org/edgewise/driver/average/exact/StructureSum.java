package org.edgewise.driver.average.exact;

import java.util.Locale;
import java.util.concurrent.atomic.AtomicLong;
import java.util.function.LongConsumer;
import java.util.stream.IntStream;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.convergence.Estimate;

/**
 * Exact sums over DAGs under the <b>structure-modular</b> prior P(G) ∝ Π_i ρ_i(U_i) (every DAG
 * with in-degree ≤ d counted once, not once per consistent order): log P(D), every edge posterior
 * and every parent-set posterior, by dynamic programming over subsets with inclusion–exclusion
 * over sink sets (Tian &amp; He 2009, "Computing posterior probabilities of structural features in
 * Bayesian networks", UAI; the DAG-counting recursion of Robinson 1973). With
 * β_i(U) = exp(s(i,U) + log ρ_i(U)) for the allowed parent sets (zero otherwise) and
 * α_i(W) = Σ_{U ⊆ W} β_i(U) (zeta transform, as for {@link ExactOrderSum}):
 * <pre>
 *   R(∅) = 1,   R(S) = Σ_{∅≠T⊆S} (−1)^{|T|+1} R(S∖T) Π_{i∈T} α_i(S∖T)        (forward)
 * </pre>
 * R(S) is the weight of all DAGs on S: R(S∖T)·Π α_i(S∖T) weighs the DAGs on S in which every node
 * of T is a sink with parents outside T, and a DAG with k sinks is counted Σ_j (−1)^{j+1} C(k,j) = 1
 * time. Z = R(V). For the posteriors this class differentiates the recursion (reverse mode; the
 * adjoint plays the part of Koivisto's backward sum — derivation ours, documented here):
 * <pre>
 *   R̄(V) = 1,  R̄(W) = ∂Z/∂R(W) = Σ_{∅≠T⊆V∖W} (−1)^{|T|+1} R̄(W∪T) Π_{i∈T} α_i(W)      (backward)
 *   ᾱ_k(W) = ∂Z/∂α_k(W) = R(W) Σ_{T∋k} (−1)^{|T|+1} R̄(W∪T) Π_{i∈T∖{k}} α_i(W)
 *   K_i(U) = ∂Z/∂β_i(U) = Σ_{W ⊇ U} ᾱ_i(W)        (superset transform)
 *   P(U_i = U | D) = β_i(U) K_i(U) / Z,   P(j → i | D) = Σ_{U ∋ j} P(U_i = U | D)
 * </pre>
 * Z is linear in each child's β_i (every DAG uses one parent set per child), so β_i(U)·∂Z/∂β_i(U)
 * is exactly the weight of the DAGs in which i has parents U. R̄(W) is the (positive) weight of
 * all ways to complete a DAG on W to one on V; ᾱ may be negative, so its positive (odd |T|) and
 * negative (even |T|) parts are kept as two log tables, each transformed, and subtracted at the end.
 *
 * <p><b>Log space.</b> Every stored quantity is a logarithm. A sum with signs is formed in linear
 * space against a reference that bounds its terms: for R(S) the order sum
 * F(S) = Σ_{i∈S} α_i(S∖{i}) F(S∖{i}) (each DAG on S counted once per linear extension, so
 * R(S) ≤ F(S) ≤ |S|!·R(S)), for R̄ the largest term. Every term of R(S) weighs a subset of the DAGs
 * on S, so |terms| ≤ R(S) and the cancellation costs at most a factor 2^|S| of relative accuracy
 * (≈ 3·10⁻¹¹ at n = 18): independent of the magnitude of the scores (tested with scores of −10⁶).
 * The parent-set posteriors are a difference of two positive sums each at most about 3^n times
 * the result (worst case: the empty graph dominates), so their absolute error is below
 * 3^n · 2·10⁻¹⁶ — 10⁻¹³ at n = 10, 10⁻⁷ at n = 18 in that worst case.
 *
 * <p><b>Constraints.</b> Forbidden / required edges and the in-degree bound act through the
 * allowed parent sets. Tiers (and the precedences required edges imply) admit a DAG G when G
 * together with the precedence relation ≺c is acyclic; then the recursion runs over the
 * ≺c-downward-closed S only, with T restricted to the ≺c-maximal members of S (those are
 * exactly the sinks of G ∪ ≺c). log P(D) is normalised over the same admitted DAGs:
 * log P(D) = log Z − log Z_ρ, Z_ρ the same sum with β_i = ρ_i alone.
 *
 * <p><b>Cost.</b> The sum over (W, T) pairs is 3^n terms, once forward for Z, once for Z_ρ, once
 * backward (plus |T| additions per term for ᾱ); both cores take the subsets of one size. Memory
 * ({@link #bytes}): α_i and the two parts of ᾱ_i, 3·n·2^(n−1) doubles; R, F, R̄; and per thread an
 * accumulator and scratch of 2^n entries each (28 bytes per entry).
 */
public final class StructureSum {
    /** Largest n attempted: 3^22 ≈ 3·10^10 terms per pass is already hours here. */
    public static final int MAX_VARIABLES = 22;
    /** Nanoseconds per (W, T) term and core, measured by scripts/bench unknown-order (rough). */
    static final double NANOS_PER_TERM = 12.0;

    private StructureSum() {
    }

    /**
     * @param logEvidence   log P(D) under the structure-modular prior: log Z − log Z_ρ
     * @param logDagSum     log Z = log Σ_G Π_i β_i(U_i) over the admitted DAGs
     * @param logPriorSum   log Z_ρ = log Σ_G Π_i ρ_i(U_i) (with {@code --prior uniform}: the number of admitted DAGs)
     * @param edgePosterior {@code [from][to]}
     * @param setPosterior  per child, aligned with {@link LocalScores#masks(int)}
     */
    public record Result(double logEvidence, double logDagSum, double logPriorSum, double[][] edgePosterior,
                         double[][] setPosterior) {
    }

    /** Memory and time for n variables, and the largest n that fits. */
    public record Estimate(int n, long bytes, double seconds, int largestN) {
        @Override
        public String toString() {
            return String.format(Locale.ROOT,
                    "exact structure-modular sum for n = %d needs about %.2f GiB and %s s on idle cores here; this JVM allows n <= %d",
                    n, bytes / (double) (1L << 30),
                    seconds < 1e6 ? String.format(Locale.ROOT, "%.0f", seconds) : String.format(Locale.ROOT, "%.1e", seconds),
                    largestN);
        }
    }

    /** Bytes used for n variables on {@code threads} threads. */
    public static long bytes(int n, int threads) {
        if (n > 40) {
            return Long.MAX_VALUE;
        }
        long e = 1L << n;
        return 8L * (3L * n * (e / 2) + 3L * e) + 4L * e + 28L * threads * e;
    }

    /** The estimate for n variables on {@code threads} cores with {@code maxBytes} of heap. */
    public static Estimate estimate(int n, int threads, long maxBytes) {
        double terms = Math.pow(3, n);
        double seconds = (3.0 + n / 6.0) * terms * NANOS_PER_TERM * 1e-9 / Math.max(1, threads);
        int largest = 1;
        while (largest < MAX_VARIABLES && bytes(largest + 1, threads) <= maxBytes) {
            largest++;
        }
        return new Estimate(n, bytes(n, threads), seconds, largest);
    }

    /** The estimate for this JVM (maximum heap less what is in use, all processors). */
    public static Estimate estimateHere(int n) {
        Runtime rt = Runtime.getRuntime();
        long free = rt.maxMemory() - (rt.totalMemory() - rt.freeMemory());
        return estimate(n, rt.availableProcessors(), (long) (free * 0.9));
    }

    /** Too large for this JVM: the estimate, and the two ways out. */
    public static final class TooLarge extends org.edgewise.driver.WordedError {
        private final Estimate estimate;

        TooLarge(Estimate e, org.edgewise.driver.InputNames in) {
            super(e + "; use " + in.methodMcmc() + " (sampling under the same prior) or " + in.orderModular()
                    + " (exact to larger n)");
            this.estimate = e;
        }

        public Estimate estimate() {
            return estimate;
        }

        @Override
        public String worded(org.edgewise.driver.InputNames names, String heapSetting) {
            return getMessage() + " (or raise the heap with " + heapSetting + ")";
        }
    }

    /** Runs without progress reporting. */
    public static Result run(LocalScores ls, OrderConstraints oc) {
        return run(ls, oc, null);
    }

    /**
     * The whole computation; refuses ({@link TooLarge}) before allocating when n exceeds
     * {@link #MAX_VARIABLES} or the arrays do not fit this JVM's heap.
     *
     * @param progress receives the fraction done in parts per million, or null
     */
    public static Result run(LocalScores ls, OrderConstraints oc, LongConsumer progress) {
        int n = ls.variableCount();
        Estimate est = estimateHere(n);
        if (n > est.largestN()) {
            throw new TooLarge(est, ls.options().names());
        }
        SinkRecursion p = new SinkRecursion(n, oc);
        double total = 3.0 * Math.pow(3, n);
        AtomicLong done = new AtomicLong();
        LongConsumer tick = progress == null ? x -> { } : x -> progress.accept(
                (long) (1e6 * Math.min(1.0, done.addAndGet(x) / total)));

        double[][] prior = alphas(ls, n, true);
        double logPriorSum = p.forward(prior, tick)[p.full];
        prior = null;
        double[][] alpha = alphas(ls, n, false);
        double[] r = p.forward(alpha, tick);
        double logZ = r[p.full];
        if (logZ == Double.NEGATIVE_INFINITY) {
            throw new UserError("no DAG has positive posterior under the given constraints "
                    + "(required edges, tiers and the in-degree bound cannot all be met)");
        }
        double[][] pos = new double[n][];
        double[][] neg = new double[n][];
        p.backward(alpha, r, pos, neg, tick);

        double[][] edges = new double[n][n];
        double[][] sets = new double[n][];
        IntStream.range(0, n).parallel().forEach(i -> {
            long[] masks = ls.masks(i);
            int dMax = 0;
            for (long m : masks) {
                dMax = Math.max(dMax, Long.bitCount(m));
            }
            ExactOrderSum.supersetZetaUpTo(pos[i], n - 1, dMax);
            ExactOrderSum.supersetZetaUpTo(neg[i], n - 1, dMax);
            double[] w = ls.weights(i);
            int[] cand = ls.candidates(i);
            double[] setPost = new double[masks.length];
            double[] col = new double[n];
            for (int s = 0; s < masks.length; s++) {
                int c = ExactOrderSum.compress(ExactOrderSum.globalMask(masks[s], cand), i);
                double q = Math.exp(w[s] + pos[i][c] - logZ) - Math.exp(w[s] + neg[i][c] - logZ);
                q = q < 0 ? 0 : q;
                setPost[s] = q;
                for (long m = masks[s]; m != 0; m &= m - 1) {
                    col[cand[Long.numberOfTrailingZeros(m)]] += q;
                }
            }
            sets[i] = setPost;
            synchronized (edges) {
                for (int j = 0; j < n; j++) {
                    edges[j][i] = Math.min(1.0, col[j]);
                }
            }
        });
        return new Result(logZ - logPriorSum, logZ, logPriorSum, edges, sets);
    }

    /**
     * log Z = log Σ_G Π_i β_i(U_i) over the admitted DAGs alone: the forward pass only (3^n terms,
     * no posteriors), for ratios of sums such as P(x | D) = Z(D ∪ x) / Z(D)
     * ({@code query.StructureCasePrediction}). −∞ when no DAG is admitted. Refuses as {@link #run}.
     */
    public static double logDagSum(LocalScores ls, OrderConstraints oc) {
        int n = ls.variableCount();
        Estimate est = estimateHere(n);
        if (n > est.largestN()) {
            throw new TooLarge(est, ls.options().names());
        }
        return new SinkRecursion(n, oc).forward(alphas(ls, n, false), x -> { })[(1 << n) - 1];
    }

    /** Per child, log α_i(W) over the 2^(n−1) subsets W of V∖{i}, of the weights or of the priors alone. */
    static double[][] alphas(LocalScores ls, int n, boolean priorOnly) {
        double[][] alpha = new double[n][];
        IntStream.range(0, n).parallel().forEach(i -> {
            double[] a = ExactOrderSum.scatter(ls, i, priorOnly ? ls.logPriors(i) : ls.weights(i), false);
            ExactOrderSum.subsetZeta(a, n - 1);
            alpha[i] = a;
        });
        return alpha;
    }
}
