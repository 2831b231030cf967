package org.edgewise.driver.query;

import java.util.Arrays;
import org.edgewise.driver.average.LogSum;

/**
 * Sums the relevant hidden variables of a case out of a product of {@link AveragedFamilies}
 * factors, exactly, by enumerating their joint states (the caller checks their number against its
 * limit). Each factor that depends on no hidden variable is a constant; each other factor is split
 * into the parent sets that touch no hidden variable (summed once per child state) and those that
 * do, then tabulated over the joint states of the hidden variables it depends on (usually one or
 * two), so the enumeration only looks values up and adds logs. Stateless.
 */
final class HiddenSum {
    private HiddenSum() {
    }

    /**
     * log Σ over the joint states of {@code hidden} of Π_{c kept} f_c(x), with {@code x} the case
     * (its hidden entries overwritten as scratch, restored to 0 at the end) and {@code keep} the
     * factors that matter.
     */
    static double logSum(AveragedFamilies f, int[] x, boolean[] keep, int[] hidden) {
        int n = f.variableCount();
        boolean[] isHidden = new boolean[n];
        long hiddenMask = 0;
        for (int h : hidden) {
            isHidden[h] = true;
            hiddenMask |= n <= 64 ? 1L << h : 0;
        }
        // Split every dependent factor into the sets that touch no hidden variable (summed once per
        // child state, in base) and the sets that do (re-evaluated for every joint state).
        double constant = 0;
        int[] dependent = new int[n];
        int nd = 0;
        for (int c = 0; c < n; c++) {
            if (!keep[c]) {
                continue;
            }
            boolean depends = isHidden[c];
            for (int p : f.parentUnion(c)) {
                depends |= isHidden[p];
            }
            if (depends) {
                dependent[nd++] = c;
            } else {
                constant += f.logFactor(c, x);
            }
        }
        dependent = Arrays.copyOf(dependent, nd);
        double[][] base = new double[dependent.length][];
        int[][] varying = new int[dependent.length][];
        for (int d = 0; d < dependent.length; d++) {
            int c = dependent[d];
            int[][] ps = f.parents(c);
            int[] vary = new int[ps.length];
            int nv = 0;
            double[] b = new double[f.arity(c)];
            int saved = x[c];
            for (int t = 0; t < ps.length; t++) {
                if (f.touches(c, t, hiddenMask, isHidden)) {
                    vary[nv++] = t;
                } else if (isHidden[c]) {
                    for (int k = 0; k < f.arity(c); k++) {
                        x[c] = k;
                        b[k] += f.term(c, t, x);
                    }
                } else {
                    b[saved] += f.term(c, t, x);
                }
            }
            x[c] = saved;
            base[d] = b;
            varying[d] = Arrays.copyOf(vary, nv);
        }
        // Tabulate each dependent factor over the joint states of the hidden variables it depends
        // on (usually one or two), so the enumeration below only looks values up.
        double[][] logTable = new double[dependent.length][];
        int[][] on = new int[dependent.length][];
        boolean[] uses = new boolean[n];
        int[] hsBuf = new int[hidden.length];
        for (int d = 0; d < dependent.length; d++) {
            int c = dependent[d];
            uses[c] = isHidden[c];
            for (int t : varying[d]) {
                for (int p : f.parents(c)[t]) {
                    uses[p] |= isHidden[p];
                }
            }
            int m = 0;
            for (int h : hidden) {
                if (uses[h]) {
                    hsBuf[m++] = h;
                    uses[h] = false;
                }
            }
            uses[c] = false;
            int[] hs = Arrays.copyOf(hsBuf, m);
            logTable[d] = tabulate(f, c, x, hs, isHidden[c], base[d], varying[d]);
            on[d] = hs;
        }
        for (int h : hidden) {
            x[h] = 0;
        }
        double acc = Double.NEGATIVE_INFINITY;
        while (true) {
            double lp = 0;
            for (int d = 0; d < dependent.length; d++) {
                int cell = 0;
                for (int h : on[d]) {
                    cell = cell * f.arity(h) + x[h];
                }
                lp += logTable[d][cell];
            }
            acc = LogSum.add(acc, lp);
            int i = 0;
            while (i < hidden.length && ++x[hidden[i]] == f.arity(hidden[i])) {
                x[hidden[i]] = 0;
                i++;
            }
            if (i == hidden.length) {
                break;
            }
        }
        return constant + acc;
    }

    /**
     * log f_c over the joint states of {@code hs} (the hidden variables factor c depends on; c
     * itself among them when hidden), mixed radix with hs[0] most significant. Each parent set
     * touches only the hidden variables it contains, so its terms are evaluated over those alone,
     * summed into one small table per distinct subset, and the subsets are broadcast once.
     * Memory: the result (one double per joint state) plus one small table per subset.
     */
    private static double[] tabulate(AveragedFamilies f, int c, int[] x, int[] hs, boolean childHidden, double[] base, int[] varying) {
        int m = hs.length;
        int size = 1;
        for (int h : hs) {
            size *= f.arity(h);
        }
        int childBit = 0;
        if (childHidden) {
            for (int i = 0; i < m; i++) {
                if (hs[i] == c) {
                    childBit = 1 << i;
                }
            }
        }
        int[] keys = new int[4];
        double[][] sums = new double[4][];
        int groups = 0;
        if (childHidden) {
            keys[0] = childBit;
            sums[0] = base.clone();
            groups = 1;
        }
        int[] saved = new int[m];
        for (int i = 0; i < m; i++) {
            saved[i] = x[hs[i]];
        }
        for (int t : varying) {
            int key = childBit;
            for (int p : f.parents(c)[t]) {
                for (int i = 0; i < m; i++) {
                    if (hs[i] == p) {
                        key |= 1 << i;
                    }
                }
            }
            int g = 0;
            while (g < groups && keys[g] != key) {
                g++;
            }
            if (g == groups) {
                if (groups == keys.length) {
                    keys = Arrays.copyOf(keys, groups * 2);
                    sums = Arrays.copyOf(sums, groups * 2);
                }
                keys[g] = key;
                sums[g] = new double[subStates(f, hs, key)];
                groups++;
            }
            double[] sum = sums[g];
            for (int i = 0; i < m; i++) {
                if ((key >>> i & 1) != 0) {
                    x[hs[i]] = 0;
                }
            }
            for (int cell = 0; cell < sum.length; cell++) {
                sum[cell] += f.term(c, t, x);
                int i = m - 1;
                while (i >= 0) {
                    if ((key >>> i & 1) != 0) {
                        if (++x[hs[i]] < f.arity(hs[i])) {
                            break;
                        }
                        x[hs[i]] = 0;
                    }
                    i--;
                }
            }
        }
        double constant = childHidden ? 0 : base[x[c]];
        // stride[g][i]: how far group g's sub-index moves when digit i moves by one (0 when the
        // group does not involve hs[i]); sub-indices are updated as the digits count up.
        int[][] stride = new int[groups][m];
        for (int g = 0; g < groups; g++) {
            int st = 1;
            for (int i = m - 1; i >= 0; i--) {
                if ((keys[g] >>> i & 1) != 0) {
                    stride[g][i] = st;
                    st *= f.arity(hs[i]);
                }
            }
        }
        double[] table = new double[size];
        int[] digit = new int[m];
        int[] sub = new int[groups];
        for (int cell = 0; cell < size; cell++) {
            double factor = constant;
            for (int g = 0; g < groups; g++) {
                factor += sums[g][sub[g]];
            }
            table[cell] = Math.log(factor);
            int i = m - 1;
            while (i >= 0) {
                if (++digit[i] < f.arity(hs[i])) {
                    for (int g = 0; g < groups; g++) {
                        sub[g] += stride[g][i];
                    }
                    break;
                }
                digit[i] = 0;
                for (int g = 0; g < groups; g++) {
                    sub[g] -= (f.arity(hs[i]) - 1) * stride[g][i];
                }
                i--;
            }
        }
        for (int i = 0; i < m; i++) {
            x[hs[i]] = saved[i];
        }
        return table;
    }

    private static int subStates(AveragedFamilies f, int[] hs, int key) {
        int s = 1;
        for (int i = 0; i < hs.length; i++) {
            if ((key >>> i & 1) != 0) {
                s *= f.arity(hs[i]);
            }
        }
        return s;
    }

}
