package org.edgewise.driver.average;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.Manifest;
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
 * </ul>
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

    /** How a child was found on the boundary. */
    public enum Rule {
        FILLED("filled"), NEAR_EXCLUDED("near-excluded");

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
     */
    public record Finding(int child, Rule rule, double filledMass, int excluded, double gap) {
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
            int[] cand = names.stream().mapToInt(m::variableIndex).sorted().toArray();
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
            if (filled >= FILLED_MASS) {
                out.add(new Finding(child, Rule.FILLED, filled, bestX, gap));
            } else if (gap <= MARGIN_NATS) { // NaN: nothing to compare, never flagged
                out.add(new Finding(child, Rule.NEAR_EXCLUDED, filled, bestX, gap));
            }
        }
        return out;
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
