package org.edgewise.driver.report;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.network.Network;

/**
 * How well a result's edge posteriors recover a known network (the figures of {@code compare}).
 *
 * <ul>
 * <li>Directed: every ordered pair (a, b), a ≠ b, is an item scored by P(a → b), positive when the
 *     truth has a → b. AUROC and average precision by {@link RankMetrics}.</li>
 * <li>Skeleton: every unordered pair {a, b} is an item scored by min(1, P(a→b) + P(b→a))
 *     ({@link EdgeMatrix#adjacency}), positive when the truth has an edge either way.</li>
 * <li>Consensus graph at a threshold t: a → b when P(a → b) &gt; t. Structural Hamming distance
 *     SHD = missing + extra + reversed, each counting 1: per unordered pair, a true edge with no
 *     consensus edge either way is <i>missing</i>; a true a → b with consensus b → a only is
 *     <i>reversed</i>; every consensus edge on a pair the truth leaves unconnected is
 *     <i>extra</i>, and so is a consensus b → a beside a correct a → b (only possible for t &lt; ½).
 *     Precision = correctly directed consensus edges / consensus edges, recall = correctly
 *     directed consensus edges / true edges; the skeleton variants ignore direction.</li>
 * </ul>
 * The truth is the network restricted to the result's variables (its induced subgraph); truth
 * variables the result lacks are listed in {@code truthOnly}.
 */
public record EdgeRecovery(double threshold, int variables, int trueEdges, Ranking directed, Ranking skeleton,
                           String skeletonScore, Consensus consensus, List<String> truthOnly)
        implements org.edgewise.driver.result.JsonResult {
    @Override
    public String kind() {
        return "recovery";
    }

    @Override
    public int formatVersion() {
        return 1;
    }

    /** How a pair is scored for the skeleton figures (stated in the JSON output). */
    public static final String SKELETON_SCORE = "min(1, P(a->b) + P(b->a))";

    /** AUROC and AP over {@code positives + negatives} items; null figures when undefined. */
    public record Ranking(long positives, long negatives, Double auroc, Double averagePrecision) {
    }

    /** Figures of the thresholded consensus graph; edge lists as "a -> b". */
    public record Consensus(int edges, int correct, Double precision, Double recall, Double skeletonPrecision,
                            Double skeletonRecall, int shd, List<String> missing, List<String> extra,
                            List<String> reversed) {
    }

    /** Truth adjacency over the result's variables: {@code t[a][b]} when the truth has a → b. */
    public static boolean[][] truthMatrix(EdgeMatrix m, Network truth, String truthName) {
        int n = m.size();
        int[] at = new int[n];
        for (int i = 0; i < n; i++) {
            at[i] = truth.indexOf(m.variables().get(i));
            if (at[i] < 0) {
                throw new UserError("result variable '" + m.variables().get(i) + "' is not in the truth network " + truthName);
            }
        }
        boolean[][] t = new boolean[n][n];
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                t[a][b] = a != b && truth.hasEdge(at[a], at[b]);
            }
        }
        return t;
    }

    public static EdgeRecovery of(EdgeMatrix m, Network truth, String truthName, double threshold) {
        boolean[][] t = truthMatrix(m, truth, truthName);
        int n = m.size();
        List<String> truthOnly = new ArrayList<>();
        for (String v : truth.names()) {
            if (!m.variables().contains(v)) {
                truthOnly.add(v);
            }
        }
        int trueEdges = 0;
        double[] dScore = new double[n * (n - 1)];
        boolean[] dPos = new boolean[dScore.length];
        double[] sScore = new double[n * (n - 1) / 2];
        boolean[] sPos = new boolean[sScore.length];
        int di = 0;
        int si = 0;
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a == b) {
                    continue;
                }
                dScore[di] = m.p()[a][b];
                dPos[di++] = t[a][b];
                if (t[a][b]) {
                    trueEdges++;
                }
                if (a < b) {
                    sScore[si] = m.adjacency(a, b);
                    sPos[si++] = t[a][b] || t[b][a];
                }
            }
        }
        return new EdgeRecovery(threshold, n, trueEdges, ranking(dScore, dPos), ranking(sScore, sPos),
                SKELETON_SCORE, consensus(m, t, threshold), truthOnly);
    }

    private static Ranking ranking(double[] s, boolean[] pos) {
        long p = 0;
        for (boolean b : pos) {
            if (b) {
                p++;
            }
        }
        return new Ranking(p, pos.length - p, finite(RankMetrics.auroc(s, pos)), finite(RankMetrics.averagePrecision(s, pos)));
    }

    /** Consensus-graph figures, per the definitions in the class comment. */
    static Consensus consensus(EdgeMatrix m, boolean[][] t, double threshold) {
        int n = m.size();
        boolean[][] g = m.consensus(threshold);
        List<String> names = m.variables();
        List<String> missing = new ArrayList<>();
        List<String> extra = new ArrayList<>();
        List<String> reversed = new ArrayList<>();
        Agreement directed = new Agreement();
        Agreement skeleton = new Agreement();
        for (int a = 0; a < n; a++) {
            for (int b = a + 1; b < n; b++) {
                boolean ab = g[a][b];
                boolean ba = g[b][a];
                boolean tab = t[a][b];
                boolean tba = t[b][a];
                directed.add(ab, tab);
                directed.add(ba, tba);
                boolean est = ab || ba;
                boolean tru = tab || tba;
                skeleton.add(est, tru);
                if (!tru) {
                    if (ab) {
                        extra.add(names.get(a) + " -> " + names.get(b));
                    }
                    if (ba) {
                        extra.add(names.get(b) + " -> " + names.get(a));
                    }
                } else if (!est) {
                    missing.add(tab ? names.get(a) + " -> " + names.get(b) : names.get(b) + " -> " + names.get(a));
                } else if (tab && !ab) {
                    reversed.add(names.get(a) + " -> " + names.get(b));
                } else if (tba && !ba) {
                    reversed.add(names.get(b) + " -> " + names.get(a));
                } else if (tab && ba) {
                    extra.add(names.get(b) + " -> " + names.get(a));
                } else if (tba && ab) {
                    extra.add(names.get(a) + " -> " + names.get(b));
                }
            }
        }
        int shd = missing.size() + extra.size() + reversed.size();
        return new Consensus(directed.estimated, directed.correct, directed.precision(), directed.recall(),
                skeleton.precision(), skeleton.recall(), shd, missing, extra, reversed);
    }

    /** Items (edges, or pairs for the skeleton) in the consensus graph, in the truth, and in both. */
    private static final class Agreement {
        int estimated;
        int truth;
        int correct;

        void add(boolean inConsensus, boolean inTruth) {
            estimated += inConsensus ? 1 : 0;
            truth += inTruth ? 1 : 0;
            correct += inConsensus && inTruth ? 1 : 0;
        }

        Double precision() {
            return ratio(correct, estimated);
        }

        Double recall() {
            return ratio(correct, truth);
        }
    }

    private static Double ratio(int a, int b) {
        return b == 0 ? null : (double) a / b;
    }

    private static Double finite(double v) {
        return Double.isNaN(v) ? null : v;
    }
}
