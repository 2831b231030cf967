package org.edgewise.driver.average.exact;

import java.util.Arrays;
import java.util.SplittableRandom;
import java.util.concurrent.atomic.AtomicLong;
import java.util.function.LongConsumer;
import java.util.stream.IntStream;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.givenorder.OrderSum;

/**
 * Exact sum over all variable orders by dynamic programming over subsets (Koivisto &amp; Sood 2004,
 * "Exact Bayesian structure discovery in Bayesian networks", JMLR 5; Koivisto 2006, "Advances in
 * exact Bayesian structure discovery in Bayesian networks", UAI: all edge posteriors together by
 * forward–backward sums and fast zeta transforms). Everything is in log space.
 *
 * <p>With β_i(U) = exp(s(i,U) + log ρ_i(U)) for the allowed parent sets of i (zero otherwise):
 * <pre>
 *   α_i(S) = Σ_{U ⊆ S} β_i(U)                        S ⊆ V∖{i}   (zeta transform, per child)
 *   F(∅) = 1,  F(S) = Σ_{i ∈ S} α_i(S∖{i}) F(S∖{i})  (forward: orders of S as a prefix)
 *   B(V) = 1,  B(S) = Σ_{i ∉ S} α_i(S) B(S ∪ {i})    (backward: orders of V∖S after S)
 *   Z = F(V) = Σ_≺ Π_i α_i(pred_≺(i)) = Σ_≺ exp(logEvidence(≺))
 *   γ_i(S) = F(S) B(S ∪ {i}),  Γ_i(U) = Σ_{S ⊇ U, S ⊆ V∖{i}} γ_i(S)   (superset zeta transform)
 *   P(j → i | D) = Σ_{U ∋ j} β_i(U) Γ_i(U) / Z
 * </pre>
 * {@code logEvidence(≺)} is the given-order, order-modular evidence of {@link OrderSum}. The
 * reported {@link Result#logEvidence()} is under the uniform prior over the allowed orders:
 * <pre>
 *   logEvidence = log( (1/N) Σ_≺ exp(logEvidence(≺)) ) = log Z − log N
 * </pre>
 * with N = n! without tiers (N = {@link OrderConstraints#logOrderCount()} with them); orders
 * excluded by tiers have prior 0. {@link Result#logOrderSum()} is log Z itself. This is the
 * order-modular prior of Koivisto &amp; Sood: a DAG G is weighted by Π_i ρ_i(U_i) times the number of
 * orders consistent with it.
 *
 * <p>Cost: about n(n−1)2^(n−1) log-additions for the α's and as many for the Γ's, plus n·2^n
 * each way for F and B; both cores are used (children in parallel for the transforms, subsets
 * of one size in parallel for F and B).
 *
 * <p>Memory (allocated in {@link #run}): one double array of 2^(n−1) per child (α_i, then reused
 * for Γ_i) and two of 2^n (F, B): {@code 8·(n·2^(n−1) + 2·2^n)} bytes — 3.9 GB at n = 25,
 * 15.9 GB at n = 27. {@link #estimate} states it before anything is allocated; {@link #run}
 * refuses with a {@link UserError} when it does not fit in the JVM's maximum heap.
 */
public final class ExactOrderSum {
    /** Largest n the array layout supports (2^n entries per array must fit an int index). */
    public static final int MAX_VARIABLES = 30;
    /**
     * Nanoseconds per log-addition on one idle core (a rough figure: about 10–20 ns on current x86
     * cores; the benchmark, scripts/bench unknown-order, measured ~100 ns per op and core on a
     * machine shared with a load average of 12, see docs/unknown-order.md).
     */
    static final double NANOS_PER_OP = 20.0;

    private ExactOrderSum() {
    }

    /**
     * @param logEvidence   log((1/N) Σ_≺ exp(logEvidence(≺))), N the number of allowed orders
     * @param logOrderSum   log Σ_≺ exp(logEvidence(≺)) over the allowed orders
     * @param logOrderCount log N
     * @param edgePosterior {@code [from][to]} posterior of the edge from → to
     * @param setPosterior  per child, the posterior of each allowed parent set (aligned with
     *                      {@link LocalScores#masks(int)}): β_i(U) Γ_i(U) / Z
     * @param sampledOrders orders drawn from P(≺ | D) (empty when none were asked)
     */
    public record Result(double logEvidence, double logOrderSum, double logOrderCount, double[][] edgePosterior,
                         double[][] setPosterior, int[][] sampledOrders) {
    }

    /** Memory and time needed for n variables, and the largest n whose memory fits {@code maxBytes}. */
    public record Estimate(int n, long bytes, double seconds, int largestN) {
        @Override
        public String toString() {
            double gib = 8.0 * (n * Math.pow(2, n - 1) + 2 * Math.pow(2, n)) / (1L << 30);
            return String.format(java.util.Locale.ROOT,
                    "exact sum over orders for n = %d needs about %s GiB and %s s on idle cores here; this JVM allows n <= %d",
                    n, gib < 1e4 ? String.format(java.util.Locale.ROOT, "%.1f", gib) : String.format(java.util.Locale.ROOT, "%.1e", gib),
                    seconds < 1e6 ? String.format(java.util.Locale.ROOT, "%.0f", seconds) : String.format(java.util.Locale.ROOT, "%.1e", seconds),
                    largestN);
        }
    }

    /** Bytes the DP arrays take for n variables. */
    public static long bytes(int n) {
        if (n > 50) {
            return Long.MAX_VALUE; // far beyond any heap (and beyond a long's shifts)
        }
        return 8L * ((long) n * (1L << (n - 1)) + 2L * (1L << n));
    }

    /** The estimate for n variables on {@code threads} cores with {@code maxBytes} of heap. */
    public static Estimate estimate(int n, int threads, long maxBytes) {
        double ops = 2.0 * n * (n - 1) * Math.pow(2, n - 2) + 2.0 * n * Math.pow(2, n);
        double seconds = ops * NANOS_PER_OP * 1e-9 / Math.max(1, threads);
        int largest = 1;
        while (largest < MAX_VARIABLES && bytes(largest + 1) <= maxBytes) {
            largest++;
        }
        return new Estimate(n, bytes(n), seconds, largest);
    }

    /** The estimate for this JVM (its maximum heap less what is in use, all processors). */
    public static Estimate estimateHere(int n) {
        Runtime rt = Runtime.getRuntime();
        long free = rt.maxMemory() - (rt.totalMemory() - rt.freeMemory());
        return estimate(n, rt.availableProcessors(), (long) (free * 0.9));
    }

    /** Runs with no order samples and no progress reporting. */
    public static Result run(LocalScores ls, OrderConstraints oc) {
        return run(ls, oc, 0, 0L, null);
    }

    /**
     * The whole computation.
     *
     * @param orderSamples number of orders to draw from the exact posterior P(≺ | D) (Koivisto &amp;
     *                     Sood 2004, sampling backwards: the last variable of S is i with probability
     *                     α_i(S∖{i}) F(S∖{i}) / F(S)); used for features beyond single edges
     * @param seed         seed of those draws
     * @param progress     receives the fraction done in parts per million, or null
     */
    public static Result run(LocalScores ls, OrderConstraints oc, int orderSamples, long seed, LongConsumer progress) {
        int n = ls.variableCount();
        Estimate est = estimateHere(n);
        if (n > MAX_VARIABLES || est.bytes() > (long) ((Runtime.getRuntime().maxMemory()
                - (Runtime.getRuntime().totalMemory() - Runtime.getRuntime().freeMemory())) * 0.9)) {
            throw new TooLargeForExact(est, Runtime.getRuntime().maxMemory());
        }
        final int full = (1 << n) - 1;
        final int half = 1 << (n - 1);
        int[] before = oc.restricts() ? oc.predecessorMasks() : null;
        double totalOps = 2.0 * n * (n - 1) * (half / 2.0) + 2.0 * n * (double) (1L << n);
        AtomicLong done = new AtomicLong();
        LongConsumer tick = progress == null ? x -> { } : ops -> progress.accept(
                (long) (1e6 * Math.min(1.0, done.addAndGet(ops) / totalOps)));

        // α_i for every child: scatter the allowed sets, then the subset (zeta) transform.
        double[][] alpha = new double[n][];
        IntStream.range(0, n).parallel().forEach(i -> {
            double[] a = scatter(ls, i, ls.weights(i), false);
            subsetZeta(a, n - 1);
            alpha[i] = a;
            tick.accept((long) (n - 1) * (half / 2));
        });

        double[] fwd = new double[1 << n];
        double[] bwd = new double[1 << n];
        Arrays.fill(fwd, Double.NEGATIVE_INFINITY);
        Arrays.fill(bwd, Double.NEGATIVE_INFINITY);
        fwd[0] = 0;
        if (before == null || valid(full, before)) {
            bwd[full] = 0;
        }
        for (int k = 1; k <= n; k++) {
            final int size = k;
            layer(n, size, (s, t) -> {
                if (before != null && !valid(s, before)) {
                    return;
                }
                double max = Double.NEGATIVE_INFINITY;
                int m = 0;
                for (int rest = s; rest != 0; rest &= rest - 1) {
                    int i = Integer.numberOfTrailingZeros(rest);
                    int prev = s & ~(1 << i);
                    double v = alpha[i][compress(prev, i)] + fwd[prev];
                    t[m++] = v;
                    max = Math.max(max, v);
                }
                fwd[s] = LogSum.of(t, m, max);
            });
        }
        tick.accept((long) n << n);
        for (int k = n - 1; k >= 0; k--) {
            final int size = k;
            layer(n, size, (s, t) -> {
                if (before != null && !valid(s, before)) {
                    return;
                }
                double max = Double.NEGATIVE_INFINITY;
                int m = 0;
                for (int rest = full & ~s; rest != 0; rest &= rest - 1) {
                    int i = Integer.numberOfTrailingZeros(rest);
                    double v = alpha[i][compress(s, i)] + bwd[s | (1 << i)];
                    t[m++] = v;
                    max = Math.max(max, v);
                }
                bwd[s] = LogSum.of(t, m, max);
            });
        }
        tick.accept((long) n << n);
        double logZ = fwd[full];
        if (logZ == Double.NEGATIVE_INFINITY) {
            throw new UserError("no variable order has positive posterior under the given constraints "
                    + "(required edges, tiers and the in-degree bound cannot all be met)");
        }

        int[][] samples = sampleOrders(n, alpha, fwd, before, orderSamples, seed);

        // Edges: γ_i(S) = F(S) B(S ∪ {i}) into α_i's array, superset transform, then the sets.
        double[][] edges = new double[n][n];
        double[][] sets = new double[n][];
        IntStream.range(0, n).parallel().forEach(i -> {
            double[] g = alpha[i];
            alpha[i] = null;
            for (int c = 0; c < half; c++) {
                int s = expand(c, i);
                g[c] = fwd[s] + bwd[s | (1 << i)];
            }
            long[] masks = ls.masks(i);
            int dMax = 0;
            for (long m : masks) {
                dMax = Math.max(dMax, Long.bitCount(m));
            }
            supersetZetaUpTo(g, n - 1, dMax);
            double[] w = ls.weights(i);
            int[] cand = ls.candidates(i);
            double[] col = new double[n];
            double[] setPost = new double[masks.length];
            for (int s = 0; s < masks.length; s++) {
                long m = masks[s];
                double p = Math.exp(w[s] + g[compress(globalMask(m, cand), i)] - logZ);
                setPost[s] = p;
                for (; m != 0; m &= m - 1) {
                    col[cand[Long.numberOfTrailingZeros(m)]] += p;
                }
            }
            sets[i] = setPost;
            synchronized (edges) {
                for (int j = 0; j < n; j++) {
                    edges[j][i] = Math.min(1.0, col[j]);
                }
            }
            tick.accept((long) (n - 1) * (half / 2));
        });
        return new Result(logZ - oc.logOrderCount(), logZ, oc.logOrderCount(), edges, sets, samples);
    }

    /**
     * Orders from P(≺ | D) ∝ Π_i α_i(pred(i)), drawn backwards from S = V: the last variable of S
     * is i with probability α_i(S∖{i}) F(S∖{i}) / F(S) (Koivisto &amp; Sood 2004, sec. on sampling).
     */
    private static int[][] sampleOrders(int n, double[][] alpha, double[] fwd, int[] before, int count, long seed) {
        int[][] out = new int[count][];
        SplittableRandom rng = new SplittableRandom(seed);
        double[] t = new double[n];
        for (int r = 0; r < count; r++) {
            int[] order = new int[n];
            drawOrder(n, alpha, fwd, null, rng, order, t);
            out[r] = order;
        }
        return out;
    }

    /**
     * One order from P(≺ | D) ∝ Π_i α_i(pred(i)), drawn backwards through the forward sums F: from
     * S = V, the last variable of S is i with probability α_i(S∖{i}) F(S∖{i}) / F(S) (Koivisto &amp;
     * Sood 2004, sec. on sampling), then the same for S∖{i}. {@code after} (may be null) per
     * variable the bits of those it must precede: such an i is never last while they are in S.
     * {@code t} is scratch of length n; the order is written into {@code order}.
     */
    static void drawOrder(int n, double[][] alpha, double[] f, int[] after, SplittableRandom rng,
                          int[] order, double[] t) {
        int s = (1 << n) - 1;
        for (int p = n - 1; p >= 0; p--) {
            double u = rng.nextDouble();
            int m = 0;
            int last = -1;
            double acc = 0;
            for (int rest = s; rest != 0; rest &= rest - 1) {
                int i = Integer.numberOfTrailingZeros(rest);
                int prev = s & ~(1 << i);
                t[m++] = after != null && (after[i] & s) != 0 ? Double.NEGATIVE_INFINITY
                        : alpha[i][compress(prev, i)] + f[prev] - f[s];
            }
            m = 0;
            for (int rest = s; rest != 0; rest &= rest - 1) {
                int i = Integer.numberOfTrailingZeros(rest);
                double pr = Math.exp(t[m++]);
                if (pr > 0) {
                    last = i;
                    acc += pr;
                    if (u < acc) {
                        break;
                    }
                }
            }
            order[p] = last;
            s &= ~(1 << last);
        }
    }

    /** True when S contains every required predecessor of each of its members (a possible prefix). */
    private static boolean valid(int s, int[] before) {
        for (int rest = s; rest != 0; rest &= rest - 1) {
            int v = Integer.numberOfTrailingZeros(rest);
            if ((before[v] & ~s) != 0) {
                return false;
            }
        }
        return true;
    }

    /** Runs {@code body} on every subset of {0..n−1} with {@code size} members, in parallel chunks. */
    private interface SubsetBody {
        void accept(int s, double[] scratch);
    }

    private static void layer(int n, int size, SubsetBody body) {
        int total = 1 << n;
        int chunks = Math.max(1, Math.min(256, total >> 12));
        int per = total / chunks;
        IntStream.range(0, chunks).parallel().forEach(c -> {
            int end = c == chunks - 1 ? total : (c + 1) * per;
            double[] scratch = new double[n];
            for (int s = c * per; s < end; s++) {
                if (Integer.bitCount(s) == size) {
                    body.accept(s, scratch);
                }
            }
        });
    }

    /**
     * Child i's per-set values {@code w} by compressed global parent mask S ⊆ V∖{i} (2^(n−1)
     * entries): log Σ exp w over the allowed sets with mask S, or with {@code max} the largest;
     * −∞ where no set has mask S.
     */
    public static double[] scatter(LocalScores ls, int i, double[] w, boolean max) {
        double[] a = new double[1 << (ls.variableCount() - 1)];
        Arrays.fill(a, Double.NEGATIVE_INFINITY);
        long[] masks = ls.masks(i);
        int[] cand = ls.candidates(i);
        for (int s = 0; s < masks.length; s++) {
            int c = compress(globalMask(masks[s], cand), i);
            a[c] = max ? Math.max(a[c], w[s]) : LogSum.add(a[c], w[s]);
        }
        return a;
    }

    /** Global variable bitmask (n ≤ 31) of a parent-set mask over the candidates {@code cand}. */
    public static int globalMaskOf(long candMask, int[] cand) {
        return globalMask(candMask, cand);
    }

    /** Global variable bitmask of a parent-set mask over {@code cand}. */
    static int globalMask(long candMask, int[] cand) {
        int g = 0;
        for (long m = candMask; m != 0; m &= m - 1) {
            g |= 1 << cand[Long.numberOfTrailingZeros(m)];
        }
        return g;
    }

    /** Index of S ⊆ V∖{i} among the 2^(n−1) subsets: bit i removed. */
    public static int compress(int s, int i) {
        return (s & ((1 << i) - 1)) | ((s >>> (i + 1)) << i);
    }

    /** Inverse of {@link #compress}: a zero inserted at bit i. */
    static int expand(int c, int i) {
        return (c & ((1 << i) - 1)) | ((c >>> i) << (i + 1));
    }

    /** In place, a[S] ← log Σ_{T ⊆ S} exp a[T] over {@code bits} bits (Yates / fast zeta transform). */
    public static void subsetZeta(double[] a, int bits) {
        int size = 1 << bits;
        for (int b = 1; b < size; b <<= 1) {
            for (int base = 0; base < size; base += b << 1) {
                for (int k = base; k < base + b; k++) {
                    a[k + b] = LogSum.addTruncated(a[k + b], a[k]);
                }
            }
        }
    }

    /** In place, a[S] ← log Σ_{T ⊇ S} exp a[T] over {@code bits} bits. */
    public static void supersetZeta(double[] a, int bits) {
        int size = 1 << bits;
        for (int b = 1; b < size; b <<= 1) {
            for (int base = 0; base < size; base += b << 1) {
                for (int k = base; k < base + b; k++) {
                    a[k] = LogSum.addTruncated(a[k], a[k + b]);
                }
            }
        }
    }

    /**
     * As {@link #supersetZeta}, but correct only at the entries with at most {@code d} bits set
     * (the others are left partly summed): an entry T lacking bit b needs updating at the stage of
     * bit b only while T has at most d of the bits already processed, since later stages never
     * read entries with more. Work Σ_b C(b, ≤d)·2^(bits−1−b) ≈ 2^(bits−1)·Σ_{k≤d} 2 = (d+1)·2^bits
     * log-additions instead of bits·2^(bits−1) — a third at n = 25, d = 3 (Koivisto 2006 uses
     * truncated transforms in the same spirit).
     */
    public static void supersetZetaUpTo(double[] a, int bits, int d) {
        if (d >= bits) {
            supersetZeta(a, bits);
            return;
        }
        for (int b = 0; b < bits; b++) {
            int[] lows = lowMasks(b, d);
            int bit = 1 << b;
            int highCount = 1 << (bits - 1 - b);
            for (int hi = 0; hi < highCount; hi++) {
                int base = hi << (b + 1);
                for (int lo : lows) {
                    int k = base | lo;
                    a[k] = LogSum.addTruncated(a[k], a[k | bit]);
                }
            }
        }
    }

    /** All masks over {@code b} bits with at most {@code d} bits set, increasing. */
    static int[] lowMasks(int b, int d) {
        java.util.List<Integer> out = new java.util.ArrayList<>();
        collect(b, d, 0, 0, out);
        int[] r = out.stream().mapToInt(Integer::intValue).sorted().toArray();
        return r;
    }

    private static void collect(int b, int d, int from, int mask, java.util.List<Integer> out) {
        out.add(mask);
        if (d == 0) {
            return;
        }
        for (int x = from; x < b; x++) {
            collect(b, d - 1, x + 1, mask | (1 << x), out);
        }
    }
}
