package org.edgewise.driver.average.exact;

import java.util.Arrays;
import java.util.function.LongConsumer;
import java.util.stream.IntStream;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;

/**
 * The two passes of {@link StructureSum} over pairs (W, T), T ⊆ V∖W (formulas there): forward,
 * R(W∪T) += (−1)^{|T|+1} R(W) Π_{i∈T} α_i(W), pushed from each W once R(W) is final (W in order of
 * size); backward, R̄(W) and ᾱ_k(W) pulled from the supersets W∪T. Π_{i∈T} α_i(W) is built
 * incrementally over the subsets T of V∖W (T from T minus its lowest member: one addition of
 * logs per term). Subsets of one size run in parallel: forward on one accumulator per thread
 * (summed when a size is complete), backward writing only the entries of its own W.
 *
 * <p>Memory: R, F, R̄ of 2^n doubles and the subsets by size (4·2^n bytes); per thread 2^n doubles
 * of accumulator, 2^n doubles and 2^n ints of scratch; with tiers the maximal members of every S
 * (4·2^n bytes).
 */
final class SinkRecursion {
    final int n;
    final int full;
    private final int threads;
    private final int[][] bySize;
    /** Per S, its ≺c-maximal members, or −1 when S is not ≺c-downward closed; null without constraints. */
    private final int[] maximal;

    SinkRecursion(int n, OrderConstraints oc) {
        this.n = n;
        this.full = (1 << n) - 1;
        this.threads = Math.max(1, Runtime.getRuntime().availableProcessors());
        int[] count = new int[n + 1];
        for (int s = 0; s <= full; s++) {
            count[Integer.bitCount(s)]++;
        }
        bySize = new int[n + 1][];
        for (int k = 0; k <= n; k++) {
            bySize[k] = new int[count[k]];
        }
        Arrays.fill(count, 0);
        for (int s = 0; s <= full; s++) {
            int k = Integer.bitCount(s);
            bySize[k][count[k]++] = s;
        }
        if (oc.restricts()) {
            int[] before = oc.predecessorMasks();
            int[] after = new int[n];
            for (int b = 0; b < n; b++) {
                for (int a = 0; a < n; a++) {
                    if ((before[b] >> a & 1) != 0) {
                        after[a] |= 1 << b;
                    }
                }
            }
            maximal = new int[full + 1];
            for (int s = 0; s <= full; s++) {
                int m = 0;
                boolean closed = true;
                for (int rest = s; rest != 0; rest &= rest - 1) {
                    int v = Integer.numberOfTrailingZeros(rest);
                    closed &= (before[v] & ~s) == 0;
                    if ((after[v] & s) == 0) {
                        m |= 1 << v;
                    }
                }
                maximal[s] = closed ? m : -1;
            }
        } else {
            maximal = null;
        }
    }

    /** True when T = S∖W may be removed from S as a set of sinks (S closed, T among its maximal members). */
    private boolean removable(int s, int t) {
        if (maximal == null) {
            return true;
        }
        int m = maximal[s];
        return m >= 0 && (t & ~m) == 0;
    }

    /** log F(S) = log Σ_{i maximal in S} α_i(S∖{i}) F(S∖{i}): the order sum over the closed S (−∞ elsewhere). */
    double[] orderSum(double[][] alpha) {
        double[] f = new double[full + 1];
        Arrays.fill(f, Double.NEGATIVE_INFINITY);
        f[0] = 0;
        for (int k = 1; k <= n; k++) {
            int[] level = bySize[k];
            // the sets of one size depend only on the smaller ones: in parallel, each written once
            int parts = level.length < 4096 ? 1 : threads;
            IntStream.range(0, parts).parallel().forEach(th -> {
                double[] t = new double[n];
                for (int idx = th; idx < level.length; idx += parts) {
                    int s = level[idx];
                    int m = maximal == null ? s : maximal[s];
                    if (m < 0) {
                        continue;
                    }
                    int len = 0;
                    double max = Double.NEGATIVE_INFINITY;
                    for (int rest = m; rest != 0; rest &= rest - 1) {
                        int i = Integer.numberOfTrailingZeros(rest);
                        int prev = s & ~(1 << i);
                        double v = alpha[i][ExactOrderSum.compress(prev, i)] + f[prev];
                        t[len++] = v;
                        max = Math.max(max, v);
                    }
                    f[s] = LogSum.of(t, len, max);
                }
            });
        }
        return f;
    }

    /** log R(S) for every S (−∞ where no DAG is admitted). */
    double[] forward(double[][] alpha, LongConsumer tick) {
        double[] f = orderSum(alpha);
        double[] r = new double[full + 1];
        Arrays.fill(r, Double.NEGATIVE_INFINITY);
        r[0] = 0;
        double[][] acc = new double[threads][full + 1];
        for (int k = 0; k < n; k++) {
            int[] ws = bySize[k];
            long work = 1L << (n - k);
            IntStream.range(0, threads).parallel().forEach(th -> {
                Scratch sc = new Scratch(n);
                for (int idx = th; idx < ws.length; idx += threads) {
                    push(ws[idx], alpha, r, f, acc[th], sc);
                    tick.accept(work);
                }
            });
            for (int s : bySize[k + 1]) {
                double sum = 0;
                for (double[] a : acc) {
                    sum += a[s];
                    a[s] = 0;
                }
                r[s] = f[s] != Double.NEGATIVE_INFINITY && sum > 0 ? f[s] + Math.log(sum) : Double.NEGATIVE_INFINITY;
            }
        }
        return r;
    }

    private static final class Scratch {
        final double[] logP;
        final int[] sets;
        final double[] term;
        final int[] vars;
        final double[] aw;
        final double[] posAcc;
        final double[] negAcc;

        Scratch(int n) {
            logP = new double[1 << n];
            sets = new int[1 << n];
            term = new double[1 << n];
            vars = new int[n];
            aw = new double[n];
            posAcc = new double[n];
            negAcc = new double[n];
        }
    }

    /**
     * Starts the enumeration of the subsets T of V∖W: the members of V∖W into {@code sc.vars},
     * their log α(W) into {@code sc.aw}, log P(∅) = 0 and W ∪ ∅ = W at index 0; returns |V∖W|.
     */
    private int begin(int w, double[][] alpha, Scratch sc) {
        int cn = 0;
        for (int rest = full & ~w; rest != 0; rest &= rest - 1) {
            int v = Integer.numberOfTrailingZeros(rest);
            sc.vars[cn] = v;
            sc.aw[cn++] = alpha[v][ExactOrderSum.compress(w, v)];
        }
        sc.logP[0] = 0;
        sc.sets[0] = w;
        return cn;
    }

    /**
     * The subset with index t ≥ 1 (bit b = member {@code sc.vars[b]}) from t without its lowest bit:
     * logP[t] = Σ_{b ∈ t} log α_{vars[b]}(W), sets[t] = W ∪ T. Small enough to be inlined in the loops.
     */
    private static void extend(int t, Scratch sc) {
        int low = Integer.numberOfTrailingZeros(t);
        int prev = t & (t - 1);
        sc.logP[t] = sc.logP[prev] + sc.aw[low];
        sc.sets[t] = sc.sets[prev] | (1 << sc.vars[low]);
    }

    private void push(int w, double[][] alpha, double[] r, double[] f, double[] acc, Scratch sc) {
        double rw = r[w];
        if (rw == Double.NEGATIVE_INFINITY) {
            return;
        }
        int end = 1 << begin(w, alpha, sc);
        for (int t = 1; t < end; t++) {
            extend(t, sc);
            double lp = sc.logP[t];
            int s = sc.sets[t];
            double fs = f[s];
            if (lp == Double.NEGATIVE_INFINITY || fs == Double.NEGATIVE_INFINITY || !removable(s, s & ~w)) {
                continue;
            }
            double v = Math.exp(rw + lp - fs);
            acc[s] += (Integer.bitCount(t) & 1) != 0 ? v : -v;
        }
    }

    /**
     * log R̄(W) for every W, and into {@code pos[k]} / {@code neg[k]} (indexed by W compressed
     * without k) the logs of the odd-|T| and even-|T| parts of ᾱ_k(W).
     */
    void backward(double[][] alpha, double[] r, double[][] pos, double[][] neg, LongConsumer tick) {
        int half = 1 << (n - 1);
        for (int i = 0; i < n; i++) {
            pos[i] = new double[half];
            neg[i] = new double[half];
            Arrays.fill(pos[i], Double.NEGATIVE_INFINITY);
            Arrays.fill(neg[i], Double.NEGATIVE_INFINITY);
        }
        double[] rb = new double[full + 1];
        Arrays.fill(rb, Double.NEGATIVE_INFINITY);
        rb[full] = 0;
        for (int k = n - 1; k >= 0; k--) {
            int[] ws = bySize[k];
            int size = k;
            IntStream.range(0, threads).parallel().forEach(th -> {
                Scratch sc = new Scratch(n);
                for (int idx = th; idx < ws.length; idx += threads) {
                    pull(ws[idx], alpha, r, rb, pos, neg, sc);
                    tick.accept(1L << (n - size));
                }
            });
        }
    }

    private void pull(int w, double[][] alpha, double[] r, double[] rb, double[][] pos, double[][] neg, Scratch sc) {
        if (maximal != null && maximal[w] < 0) {
            return;
        }
        int cn = begin(w, alpha, sc);
        double[] term = sc.term;
        int end = 1 << cn;
        double max = Double.NEGATIVE_INFINITY;
        for (int t = 1; t < end; t++) {
            extend(t, sc);
            double lp = sc.logP[t];
            int s = sc.sets[t];
            double v = lp == Double.NEGATIVE_INFINITY || !removable(s, s & ~w) ? Double.NEGATIVE_INFINITY : lp + rb[s];
            term[t] = v;
            max = Math.max(max, v);
        }
        if (max == Double.NEGATIVE_INFINITY) {
            return;
        }
        boolean withAlpha = r[w] != Double.NEGATIVE_INFINITY;
        Arrays.fill(sc.posAcc, 0, cn, 0.0);
        Arrays.fill(sc.negAcc, 0, cn, 0.0);
        double sum = 0;
        for (int t = 1; t < end; t++) {
            double v = term[t];
            if (v == Double.NEGATIVE_INFINITY) {
                continue;
            }
            double e = Math.exp(v - max);
            boolean odd = (Integer.bitCount(t) & 1) != 0;
            sum += odd ? e : -e;
            if (withAlpha) {
                double[] into = odd ? sc.posAcc : sc.negAcc;
                for (int bits = t; bits != 0; bits &= bits - 1) {
                    into[Integer.numberOfTrailingZeros(bits)] += e;
                }
            }
        }
        rb[w] = sum > 0 ? max + Math.log(sum) : Double.NEGATIVE_INFINITY;
        if (withAlpha) {
            for (int b = 0; b < cn; b++) {
                double a = sc.aw[b];
                if (a == Double.NEGATIVE_INFINITY) {
                    continue;
                }
                int v = sc.vars[b];
                int c = ExactOrderSum.compress(w, v);
                double base = r[w] + max - a;
                pos[v][c] = sc.posAcc[b] > 0 ? base + Math.log(sc.posAcc[b]) : Double.NEGATIVE_INFINITY;
                neg[v][c] = sc.negAcc[b] > 0 ? base + Math.log(sc.negAcc[b]) : Double.NEGATIVE_INFINITY;
            }
        }
    }
}
