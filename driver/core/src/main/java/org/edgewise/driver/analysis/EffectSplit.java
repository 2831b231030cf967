package org.edgewise.driver.analysis;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.effect.EffectOrders;
import org.edgewise.driver.effect.WeightedDags;
import org.edgewise.driver.posterior.StructurePosterior;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.store.Manifest;

/**
 * Where the gap between conditioning and setting comes from (issue 21, point 3). The posterior over
 * networks splits into those in which x cannot affect y (no directed path; probability p₀, the
 * effect there is exactly 0) and those in which it can (1 − p₀). With Δ_obs the model's
 * observational difference P(y | x = a) − P(y | x = a0) and Δ_do = P(y | do(a)) − P(y | do(a0)):
 * <pre>
 *   Δ_obs − Δ_do = p₀ · Δ_obs                  (networks without a path: the whole association is not an effect)
 *                + [(1 − p₀) · Δ_obs − Δ_do]    (networks with a path: association beyond the effect = confounding)
 * </pre>
 * exactly, reading the association as alike in both groups of networks (the model's conditional is
 * one average, not one per group — a first-order split, said so in the result). The first part
 * means the data do not fix the direction (or only a common cause joins them); the second is
 * confounding through back-door paths, named by x's most probable parents (the variables the
 * adjustment formula conditions on; Pearl 2000 §3.3). A part is dominant when it is at least two
 * thirds of the two parts' absolute sum; the gap counts as nothing when it is within 0.005 or a
 * tenth of |Δ_obs| (common practice, not a test). Where risks are not estimable (a case-control sample
 * drawn on the outcome) the same split is taken on the log odds ratio — the model's conditional log
 * odds ratio against the effect's, both unchanged by sampling on the outcome, and 0 in a network
 * without a path — so the reason for the gap is named there too.
 */
final class EffectSplit {
    /** Orders read at most to find x's parents (evenly spaced over the list). */
    static final int MAX_ORDERS = 300;

    private EffectSplit() {
    }

    /** The scale of a split where risks are estimable. */
    static final String RISK_DIFFERENCE = "risk difference";
    /** The scale of a split where they are not (a case-control sample drawn on the outcome). */
    static final String LOG_ODDS_RATIO = "log odds ratio";

    /**
     * The split of the gap between {@code association} (the model's conditioning) and {@code setting}
     * (the effect), both on {@code scale}: risk differences, or log odds ratios — the formula is the same,
     * a network without a path having no effect on either scale (0).
     *
     * @param parentOf P(z → some intervened variable) per variable z (see {@link #parents})
     */
    static EffectResult.Split of(Manifest m, int[] set, int[] target, double noPath, double association, double setting,
                                 double[] parentOf, String scale) {
        double direction = noPath * association;
        double confounding = (1 - noPath) * association - setting;
        double gap = association - setting;
        List<String> backDoor = new ArrayList<>();
        List<Integer> zs = new ArrayList<>();
        for (int z = 0; z < parentOf.length; z++) {
            if (set[z] < 0 && target[z] < 0 && parentOf[z] >= 0.1) {
                zs.add(z);
            }
        }
        zs.sort(Comparator.comparingDouble(z -> -parentOf[z]));
        for (int z : zs.subList(0, Math.min(3, zs.size()))) {
            backDoor.add(m.variables().get(z).name());
        }
        String cause;
        double dir = Math.abs(direction);
        double conf = Math.abs(confounding);
        if (Math.abs(gap) <= Math.max(0.005, 0.1 * Math.abs(association))) {
            cause = "none";
        } else if (dir >= 2 * conf) {
            cause = "unknown direction";
        } else if (conf >= 2 * dir) {
            cause = "confounding";
        } else {
            cause = "both";
        }
        String x = names(m, set);
        String y = names(m, target);
        return new EffectResult.Split(noPath, 1 - noPath, association, setting, direction, confounding,
                backDoor, cause, words(cause, x, y, noPath, association, setting, direction, confounding, backDoor, scale), scale);
    }

    /** The names of the variables a question fixes, joined by commas. */
    private static String names(Manifest m, int[] cells) {
        List<String> out = new ArrayList<>();
        for (int v = 0; v < cells.length; v++) {
            if (cells[v] >= 0) {
                out.add(m.variables().get(v).name());
            }
        }
        return String.join(", ", out);
    }

    /**
     * The sentence the CLI and the report print: the two figures, the cause that dominates and the
     * parts of the gap, naming the set variables {@code x} and the outcome {@code y}.
     */
    static String words(String cause, String x, String y, double noPath, double association, double setting, double direction,
                        double confounding, List<String> backDoor, String scale) {
        String through = backDoor.isEmpty() ? "back-door paths (no single parent of " + x + " stands out)"
                : "the back-door variable" + (backDoor.size() == 1 ? " " : "s ") + String.join(", ", backDoor);
        boolean odds = LOG_ODDS_RATIO.equals(scale);
        String head = odds
                ? String.format(Locale.ROOT, "conditioning shows an odds ratio of %.4g, setting %.4g", Math.exp(association), Math.exp(setting))
                : String.format(Locale.ROOT, "conditioning shows a difference of %+.4f, setting %+.4f", tidy(association), tidy(setting));
        String parts = String.format(Locale.ROOT, " (of the gap%s, %+.4f from the networks in which %s cannot affect %s, "
                + "probability %.4f; %+.4f from confounding in the networks in which it can, probability %.4f)",
                odds ? " in log odds ratio" : "", tidy(direction), x, y, noPath, tidy(confounding), 1 - noPath);
        return switch (cause) {
            case "none" -> head + ": they agree, so the association is the effect";
            case "unknown direction" -> head + String.format(Locale.ROOT, ": the gap comes mostly from an unknown direction \u2014 "
                    + "the data do not fix the directions between %s and %s, and in networks with posterior probability %.4f %s "
                    + "cannot affect %s, so there the association is not an effect", x, y, noPath, x, y) + parts;
            case "confounding" -> head + ": the gap comes mostly from confounding through " + through + parts;
            default -> head + ": the gap comes from both an unknown direction and confounding through " + through + parts;
        };
    }

    /** A figure that prints as zero at four decimals made exactly zero (no "-0.0000"). */
    private static double tidy(double v) {
        return Math.abs(v) < 5e-5 ? 0 : v;
    }

    /**
     * P(z is a parent of some intervened variable) for every z, over what the effect averaged:
     * the weighted DAGs themselves, or the parent-set posteriors given each order (weighted by the
     * order's evidence when the list is weighted; at most {@value #MAX_ORDERS} orders, evenly spaced).
     */
    static double[] parents(LocalScores ls, StructurePosterior.EffectSource src, int[] set) {
        int n = ls.variableCount();
        double[] out = new double[n];
        if (src instanceof StructurePosterior.OverDags d) {
            WeightedDags g = d.dags();
            double total = 0;
            for (int k = 0; k < g.size(); k++) {
                double w = g.weight(k);
                total += w;
                boolean[] seen = new boolean[n];
                for (int x = 0; x < n; x++) {
                    if (set[x] >= 0) {
                        for (int z : g.parents(k)[x]) {
                            seen[z] = true;
                        }
                    }
                }
                for (int z = 0; z < n; z++) {
                    out[z] += seen[z] ? w : 0;
                }
            }
            for (int z = 0; z < n; z++) {
                out[z] = total > 0 ? out[z] / total : 0;
            }
            return out;
        }
        EffectOrders eo = ((StructurePosterior.OverOrders) src).orders();
        int count = eo.orders().size();
        int step = Math.max(1, count / MAX_ORDERS);
        List<double[]> per = new ArrayList<>();
        List<Double> logW = new ArrayList<>();
        for (int i = 0; i < count; i += step) {
            OrderPosterior op = OrderPosterior.of(ls, eo.orders().get(i));
            double[][] sets = op.setPosteriors();
            double[] one = new double[n];
            for (int x = 0; x < n; x++) {
                if (set[x] < 0) {
                    continue;
                }
                for (int s = 0; s < ls.setCount(x); s++) {
                    for (int z : ls.parents(x, s)) {
                        one[z] = Math.min(1, one[z] + sets[x][s]); // several set variables: bounded by 1
                    }
                }
            }
            per.add(one);
            logW.add(eo.weighted() ? op.result().logEvidence() : 0.0);
        }
        double max = logW.stream().mapToDouble(Double::doubleValue).max().orElse(0);
        double total = 0;
        for (int i = 0; i < per.size(); i++) {
            double w = Math.exp(logW.get(i) - max);
            total += w;
            for (int z = 0; z < n; z++) {
                out[z] += w * per.get(i)[z];
            }
        }
        for (int z = 0; z < n; z++) {
            out[z] /= total;
        }
        return out;
    }
}
