package org.edgewise.driver.average;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.ScoreStore;

/**
 * Which children's candidate parent sets bound the posterior, after sampling or the exact sum over
 * a store tallied with pruned candidates (the manifest lists each child's candidates): a pure
 * function of the local scores and the per-child parent-set posteriors. A child is on the boundary
 * by one of two stated rules, and the finding says which:
 * <ul>
 *   <li>{@link Rule#FILLED}: the posterior puts at least {@link #FILLED_MASS} on parent sets that
 *       use the whole candidate set (every candidate a parent). The child then takes every parent it
 *       was allowed, so a variable left out may be wanted too. Only a candidate set no larger than the
 *       in-degree bound can be filled; a larger one is checked by the second rule alone.</li>
 *   <li>{@link Rule#NEAR_EXCLUDED}: the best excluded variable's single-parent gain s(i,{x}) − s(i,∅)
 *       comes within {@link #MARGIN_NATS} of the weakest included candidate's gain. Only excluded
 *       variables whose single-parent family the store holds can be checked (a pruned tally keeps
 *       only families inside the candidate sets, so there this rule usually cannot act).</li>
 *   <li>{@link Rule#NEIGHBOUR}: with the tables of a wider stored set beside the sampled ones (a store
 *       tallied with a reserve of further candidates), the posterior's parent sets have one-step
 *       neighbours that bring in an excluded variable — one added while the set is below the in-degree
 *       bound, or one swapped for a parent — holding at least {@link #NEIGHBOUR_MASS} of the local mass
 *       Σ_U P(U) · Σ_{V ∈ N(U)} e^{w(V)} / (e^{w(U)} + Σ_{V ∈ N(U)} e^{w(V)}). This is the check behind
 *       the iterative search-space expansion of Kuipers, Suter &amp; Moffa (2022, "Efficient sampling and
 *       structure learning of Bayesian networks", JCGS), whose "plus one" neighbourhood lets a parent set
 *       hold one variable beyond the search space: a pruned true parent that the data want shows up
 *       as a neighbour far better than the proxy standing in for it.</li>
 * </ul>
 * A child that none of the rules can check — more candidates than the in-degree bound and no stored
 * family with a parent beyond them — is {@linkplain #unchecked unchecked}: its result must say so.
 */
public final class CandidateBoundary {
    /**
     * Posterior mass on filled parent sets that flags a child: more likely than not, the child uses
     * every candidate it was given (a stated rule, not a derived one).
     */
    public static final double FILLED_MASS = 0.5;

    /**
     * Score margin, in nats, within which an excluded variable counts as a rival of the weakest
     * included candidate: 2 nats is a Bayes factor of e² ≈ 7.4 between the two single-parent families,
     * below the factor of 20 (3 nats) that common practice reads as strong evidence, so the data do not
     * clearly justify leaving the excluded one out.
     */
    public static final double MARGIN_NATS = 2.0;

    /**
     * Local mass on one-step neighbours beyond the candidates that flags a child ({@link Rule#NEIGHBOUR}):
     * a stated rule. One chance in twenty that a single move would leave the candidate set is far above
     * what a set that does not bind gives (e^{−Δ} for a score deficit Δ of many nats on a table of any
     * size), and far below what a pruned true parent gives (close to 1).
     */
    public static final double NEIGHBOUR_MASS = 0.05;

    /** Parent sets whose posterior is below this are skipped by the neighbour rule (their share cannot reach the threshold). */
    static final double NEGLIGIBLE = 1e-9;

    /** How a child was found on the boundary. */
    public enum Rule {
        FILLED("filled"), NEAR_EXCLUDED("near-excluded"), NEIGHBOUR("neighbour-beyond");

        private final String word;

        Rule(String word) {
            this.word = word;
        }

        public String word() {
            return word;
        }
    }

    /**
     * One child on the boundary.
     *
     * @param child      variable index
     * @param rule       which rule flagged it
     * @param filledMass posterior mass on parent sets that use every candidate (NaN when the set cannot be filled)
     * @param excluded   the best excluded variable checked (−1 when none could be checked)
     * @param gap        weakest included gain minus the best excluded gain, nats (NaN when none checked)
     * @param beyondMass the neighbour rule's local mass beyond the candidates (NaN when no wider table was given
     *                   or none of the child's stored sets goes beyond its candidates)
     */
    public record Finding(int child, Rule rule, double filledMass, int excluded, double gap, double beyondMass) {
    }

    private CandidateBoundary() {
    }

    /**
     * The children on the boundary, in variable order; null when the store was not pruned (its
     * manifest lists no candidates), an empty list when none is.
     *
     * @param setPosterior per child, the posterior of each of {@code ls.masks(child)}'s parent sets
     */
    public static List<Finding> find(LocalScores ls, double[][] setPosterior) {
        return find(ls, setPosterior, null);
    }

    /**
     * As {@link #find(LocalScores, double[][])}; with {@code wider} (the tables of every stored family
     * under the same scoring, of which {@code ls} keeps each child's sets inside its current
     * candidates) a child's candidates are {@code ls.candidates(child)}, the excluded variables are
     * the stored ones beyond them, and the neighbour rule acts too.
     */
    public static List<Finding> find(LocalScores ls, double[][] setPosterior, LocalScores wider) {
        ScoreStore store = ls.store();
        Manifest m = store.manifest();
        if (m.candidates() == null || m.candidates().isEmpty()) {
            return null;
        }
        int n = ls.variableCount();
        List<Finding> out = new ArrayList<>();
        for (int child = 0; child < n; child++) {
            List<String> names = m.candidates().get(m.variables().get(child).name());
            if (names == null) {
                continue;
            }
            int[] cand = wider == null ? names.stream().mapToInt(m::variableIndex).sorted().toArray() : ls.candidates(child);
            double filled = Double.NaN;
            if (cand.length > 0 && cand.length <= m.maxParents()) {
                long full = 0;
                int[] pos = ls.candidates(child);
                for (int c : cand) {
                    int at = Arrays.binarySearch(pos, c);
                    if (at >= 0) {
                        full |= 1L << at;
                    }
                }
                filled = 0;
                long[] masks = ls.masks(child);
                for (int s = 0; s < masks.length; s++) {
                    if ((masks[s] & full) == full && Long.bitCount(full) == cand.length) {
                        filled += setPosterior[child][s];
                    }
                }
            }
            double empty = single(store, child, -1);
            double weakest = Double.POSITIVE_INFINITY;
            for (int c : cand) {
                double g = single(store, child, c) - empty;
                if (!Double.isNaN(g)) {
                    weakest = Math.min(weakest, g);
                }
            }
            int bestX = -1;
            double bestGain = Double.NEGATIVE_INFINITY;
            for (int x = 0; x < n; x++) {
                if (x == child || Arrays.binarySearch(cand, x) >= 0) {
                    continue;
                }
                double g = single(store, child, x) - empty;
                if (!Double.isNaN(g) && g > bestGain) {
                    bestGain = g;
                    bestX = x;
                }
            }
            double gap = bestX < 0 || Double.isInfinite(weakest) ? Double.NaN : weakest - bestGain;
            double beyond = wider == null ? Double.NaN : beyondMass(ls, setPosterior[child], wider, child, m.maxParents());
            if (filled >= FILLED_MASS) {
                out.add(new Finding(child, Rule.FILLED, filled, bestX, gap, beyond));
            } else if (beyond >= NEIGHBOUR_MASS) { // NaN: nothing beyond stored, never flagged
                out.add(new Finding(child, Rule.NEIGHBOUR, filled, bestX, gap, beyond));
            } else if (gap <= MARGIN_NATS) { // NaN: nothing to compare, never flagged
                out.add(new Finding(child, Rule.NEAR_EXCLUDED, filled, bestX, gap, beyond));
            }
        }
        return out;
    }

    /**
     * The neighbour rule's mass for one child: Σ_U P(U) · Σ_{V ∈ N(U)} e^{w(V)} / (e^{w(U)} + Σ_{V ∈ N(U)} e^{w(V)}),
     * N(U) the stored sets U ∪ {x} (|U| &lt; d) and U \ {y} ∪ {x} for x beyond the candidates, w the log weights
     * (score plus log prior) of {@code wider}; NaN when {@code wider} holds nothing beyond them. In log space.
     */
    public static double beyondMass(LocalScores ls, double[] posterior, LocalScores wider, int child, int d) {
        int[] all = wider.candidates(child);
        int[] cand = ls.candidates(child);
        long inside = 0;
        for (int c : cand) {
            int at = Arrays.binarySearch(all, c);
            if (at >= 0) {
                inside |= 1L << at;
            }
        }
        long beyond = (all.length == 64 ? -1L : (1L << all.length) - 1) & ~inside;
        if (beyond == 0) {
            return Double.NaN;
        }
        long[] wm = wider.masks(child);
        double[] ww = wider.weights(child);
        Map<Long, Double> weight = new HashMap<>(wm.length * 2);
        for (int s = 0; s < wm.length; s++) {
            weight.put(wm[s], ww[s]);
        }
        long[] masks = ls.masks(child);
        double mass = 0;
        double[] terms = new double[Long.bitCount(beyond) * (d + 1)];
        for (int s = 0; s < masks.length; s++) {
            if (!(posterior[s] > NEGLIGIBLE)) {
                continue;
            }
            long u = 0; // the set over the wider table's positions
            for (long rest = masks[s]; rest != 0; rest &= rest - 1) {
                u |= 1L << Arrays.binarySearch(all, cand[Long.numberOfTrailingZeros(rest)]);
            }
            Double wu = weight.get(u);
            if (wu == null) {
                continue;
            }
            int t = 0;
            for (long xs = beyond; xs != 0; xs &= xs - 1) {
                long x = Long.lowestOneBit(xs);
                if (Long.bitCount(u) < d) {
                    t = put(weight.get(u | x), terms, t);
                }
                for (long ys = u; ys != 0; ys &= ys - 1) {
                    t = put(weight.get(u & ~Long.lowestOneBit(ys) | x), terms, t);
                }
            }
            if (t == 0) {
                continue;
            }
            double out = LogSum.of(terms, t);
            mass += posterior[s] * Math.exp(out - LogSum.add(out, wu));
        }
        return mass;
    }

    private static int put(Double w, double[] terms, int t) {
        if (w == null) {
            return t;
        }
        terms[t] = w;
        return t + 1;
    }

    /**
     * The children none of the rules can check: pruned (fewer candidates than the variables the
     * tally-time constraints allow as parents), more candidates than the in-degree bound, and no stored
     * family with a parent beyond them ({@code wider} null: beyond the manifest's candidates). Empty
     * when the store was not pruned.
     */
    public static List<Integer> unchecked(LocalScores ls, LocalScores wider) {
        Manifest m = ls.store().manifest();
        List<Integer> out = new ArrayList<>();
        if (m.candidates() == null) {
            return out;
        }
        int n = ls.variableCount();
        for (int child = 0; child < n; child++) {
            List<String> names = m.candidates().get(m.variables().get(child).name());
            if (names == null) {
                continue;
            }
            int[] cand = wider == null ? names.stream().mapToInt(m::variableIndex).sorted().toArray() : ls.candidates(child);
            if (cand.length <= m.maxParents() || cand.length >= allowedParents(m, child)) {
                continue;
            }
            boolean beyond = false;
            if (wider != null) {
                beyond = wider.candidates(child).length > cand.length;
            } else {
                for (int x = 0; x < n && !beyond; x++) {
                    beyond = x != child && Arrays.binarySearch(cand, x) < 0 && !Double.isNaN(single(ls.store(), child, x));
                }
            }
            if (!beyond) {
                out.add(child);
            }
        }
        return out;
    }

    /** How many variables the tally-time constraints (forbidden edges, tiers) allow as parents of {@code child}. */
    static int allowedParents(Manifest m, int child) {
        String name = m.variables().get(child).name();
        int childTier = tier(m, name);
        int count = 0;
        for (int x = 0; x < m.variableCount(); x++) {
            String xn = m.variables().get(x).name();
            if (x == child || m.forbidden() != null && m.forbidden().contains(new EdgeRule(xn, name))) {
                continue;
            }
            int t = tier(m, xn);
            if (t >= 0 && childTier >= 0 && t > childTier) {
                continue;
            }
            count++;
        }
        return count;
    }

    private static int tier(Manifest m, String name) {
        if (m.tiers() == null) {
            return -1;
        }
        for (int t = 0; t < m.tiers().size(); t++) {
            if (m.tiers().get(t).contains(name)) {
                return t;
            }
        }
        return -1;
    }

    /** The stored log score of {@code child} with parent set {parent} (empty for −1), NaN when not stored. */
    static double single(ScoreStore store, int child, int parent) {
        for (int f = store.firstFamilyOf(child); f < store.endFamilyOf(child); f++) {
            FamilyCounts fc = store.family(f);
            int[] ps = fc.parents();
            if (parent < 0 ? ps.length == 0 : ps.length == 1 && ps[0] == parent) {
                return store.logScore(f);
            }
        }
        return Double.NaN;
    }
}
