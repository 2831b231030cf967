package org.edgewise.driver.average;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import org.apache.commons.math3.special.Gamma;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.Tiers;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.EdgeRule;

/**
 * Which variable orders an unknown-order method may visit. Tiers: every variable listed in an
 * earlier tier precedes every variable listed in a later one; variables in no tier are free
 * (any position). Required edges a→b add "a precedes b" for sampling (orders that break them have
 * zero likelihood anyway, since b then has no allowed parent set), but not to the order prior:
 * the prior is uniform over the tier-consistent orders, of which there are
 * {@code n! · Π_t s_t! / m!} (s_t the size of tier t, m = Σ s_t: the listed variables must appear
 * in one of the Π s_t! of their m! relative arrangements).
 *
 * <p>Memory: an n × n boolean matrix (10 kB at n = 100). Immutable.
 */
public final class OrderConstraints {
    private final int n;
    private final int[] tier;
    private final boolean[][] mustPrecede;
    private final boolean any;
    private final double logOrderCount;
    private final List<List<String>> tierNames;

    private OrderConstraints(int n, int[] tier, boolean[][] mustPrecede, boolean any, double logOrderCount,
                             List<List<String>> tierNames) {
        this.n = n;
        this.tier = tier;
        this.mustPrecede = mustPrecede;
        this.any = any;
        this.logOrderCount = logOrderCount;
        this.tierNames = tierNames;
    }

    /** No restriction: all n! orders. */
    public static OrderConstraints none(int n) {
        int[] t = new int[n];
        Arrays.fill(t, -1);
        return new OrderConstraints(n, t, new boolean[n][n], false, Gamma.logGamma(n + 1.0), List.of());
    }

    /**
     * @param ls    the local scores (variables, and the required edges of its options)
     * @param tiers tiers by variable name, earliest first (may be empty)
     */
    public static OrderConstraints of(LocalScores ls, List<List<String>> tiers) {
        InputNames in = ls.options().names();
        int n = ls.variableCount();
        var vars = ls.store().variables();
        int[] tier = Tiers.resolve(vars.stream().map(org.edgewise.driver.store.Variable::name).toList(), tiers, in.tiers());
        double logSizes = 0;
        int listed = 0;
        List<List<String>> names = new ArrayList<>();
        for (List<String> tierList : tiers) {
            listed += tierList.size();
            logSizes += Gamma.logGamma(tierList.size() + 1.0);
            names.add(List.copyOf(tierList));
        }
        boolean[][] must = new boolean[n][n];
        boolean any = false;
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (tier[a] >= 0 && tier[b] >= 0 && tier[a] < tier[b]) {
                    must[a][b] = true;
                    any = true;
                }
            }
        }
        List<EdgeRule> required = new ArrayList<>(ls.options().require());
        if (ls.store().manifest().required() != null) {
            required.addAll(ls.store().manifest().required());
        }
        for (EdgeRule e : required) {
            int a = ls.store().manifest().variableIndex(e.from());
            int b = ls.store().manifest().variableIndex(e.to());
            if (a < 0 || b < 0) {
                continue;
            }
            if (tier[a] >= 0 && tier[b] >= 0 && tier[a] > tier[b]) {
                throw new UserError(in.require() + " " + e + " contradicts " + in.tiers() + ": " + e.from() + " is in a later tier than " + e.to());
            }
            must[a][b] = true;
            any = true;
        }
        closeTransitively(must, n, vars);
        double logCount = Gamma.logGamma(n + 1.0) + logSizes - Gamma.logGamma(listed + 1.0);
        return new OrderConstraints(n, tier, must, any, logCount, names);
    }

    private static void closeTransitively(boolean[][] must, int n, List<org.edgewise.driver.store.Variable> vars) {
        for (int k = 0; k < n; k++) {
            for (int a = 0; a < n; a++) {
                if (must[a][k]) {
                    for (int b = 0; b < n; b++) {
                        if (must[k][b]) {
                            must[a][b] = true;
                        }
                    }
                }
            }
        }
        for (int a = 0; a < n; a++) {
            if (must[a][a]) {
                throw new UserError("the required edges and tiers form a cycle through variable " + vars.get(a).name()
                        + ": no order satisfies them");
            }
        }
    }

    public int variableCount() {
        return n;
    }

    /** True when some order is excluded (tiers or required edges). */
    public boolean restricts() {
        return any;
    }

    /** True when {@code a} must come before {@code b}. */
    public boolean mustPrecede(int a, int b) {
        return mustPrecede[a][b];
    }

    /** log of the number of tier-consistent orders: the normaliser of the uniform order prior. */
    public double logOrderCount() {
        return logOrderCount;
    }

    /** Tier index of variable v (0 = earliest), or −1 when v is in no tier. */
    public int tier(int v) {
        return tier[v];
    }

    /** The tiers by name, as given. */
    public List<List<String>> tierNames() {
        return tierNames;
    }

    /** Per variable, the bitmask (n ≤ 31) of the variables that must precede it. */
    public int[] predecessorMasks() {
        if (n > 31) {
            throw new IllegalStateException("bitmask form needs n <= 31");
        }
        int[] m = new int[n];
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (mustPrecede[a][b]) {
                    m[b] |= 1 << a;
                }
            }
        }
        return m;
    }

    /** True when {@code order} respects every constraint. */
    public boolean allows(int[] order) {
        for (int p = 0; p < order.length; p++) {
            for (int q = p + 1; q < order.length; q++) {
                if (mustPrecede[order[q]][order[p]]) {
                    return false;
                }
            }
        }
        return true;
    }

    /**
     * A random order respecting the constraints: repeatedly a uniformly chosen variable among those
     * whose required predecessors are all placed (not uniform over such orders; a starting point).
     */
    public int[] randomOrder(SplittableRandom rng) {
        int[] order = new int[n];
        boolean[] placed = new boolean[n];
        int[] ready = new int[n];
        for (int p = 0; p < n; p++) {
            int k = 0;
            for (int v = 0; v < n; v++) {
                if (!placed[v] && readyToPlace(v, placed)) {
                    ready[k++] = v;
                }
            }
            int v = ready[rng.nextInt(k)];
            order[p] = v;
            placed[v] = true;
        }
        return order;
    }

    /** Whether {@code v} may come next once the variables marked {@code placed} are placed (its required predecessors are). */
    public boolean readyAfter(int v, boolean[] placed) {
        return readyToPlace(v, placed);
    }

    private boolean readyToPlace(int v, boolean[] placed) {
        for (int u = 0; u < n; u++) {
            if (mustPrecede[u][v] && !placed[u]) {
                return false;
            }
        }
        return true;
    }
}
