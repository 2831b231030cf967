package org.edgewise.driver.average;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;

/** Small stores for the unknown-order tests, tallied with the reference {@link InMemoryTally}. */
public final class TestStores {
    private TestStores() {
    }

    public static ScoreStore random(int n, int arity, int d, int rows, long seed) {
        Network net = RandomNetwork.generate("v", n, arity, 2, n, 1.5, 0, seed);
        return InMemoryTally.tally(RandomNetwork.variables(net), new ForwardSampler(net).sample(rows, seed + 1), d,
                FamilyScore.withDefaults());
    }

    /**
     * {@link #random}'s network sampled {@code rows} times, every row then repeated {@code times}
     * times: a table whose posterior is as sharp as {@code rows · times} rows give while its
     * structure is only as certain as {@code rows} distinct draws allow — the shape that trapped
     * every chain in one wrong mode (issue 20).
     */
    public static ScoreStore repeated(int n, int arity, int d, int rows, int times, long seed) {
        Network net = RandomNetwork.generate("v", n, arity, 2, n, 1.5, 0, seed);
        int[][] once = new ForwardSampler(net).sample(rows, seed + 1);
        int[][] all = new int[rows * times][];
        for (int r = 0; r < all.length; r++) {
            all[r] = once[r % rows];
        }
        return InMemoryTally.tally(RandomNetwork.variables(net), all, d, FamilyScore.withDefaults());
    }

    /**
     * A wide store: {@link RandomNetwork} (ternary, at most 2 parents drawn among the 6 preceding
     * variables), each child's candidate parents its {@code k} nearest neighbours on each side in
     * the generating order (standing in for a store tallied with {@code --candidates 2k}).
     */
    public static ScoreStore windowed(int n, int k, int d, int rows, long seed) {
        Network net = RandomNetwork.generate("v", n, 3, 2, 6, 1.5, 0, seed);
        List<org.edgewise.driver.store.Variable> vars = RandomNetwork.variables(net);
        int[][] data = new ForwardSampler(net).sample(rows, seed + 1);
        List<org.edgewise.driver.store.FamilyCounts> fams = new java.util.ArrayList<>();
        List<Double> sc = new java.util.ArrayList<>();
        FamilyScore fs = FamilyScore.withDefaults();
        for (int c = 0; c < n; c++) {
            final int child = c;
            int[] cand = java.util.stream.IntStream.rangeClosed(Math.max(0, c - k), Math.min(n - 1, c + k))
                    .filter(v -> v != child).toArray();
            for (int size = 0; size <= Math.min(d, cand.length); size++) {
                for (int[] ps : org.edgewise.driver.store.ParentSets.subsets(cand, size)) {
                    org.edgewise.driver.store.FamilyCounts fc = InMemoryTally.count(vars, data, child, ps);
                    fams.add(fc);
                    sc.add(fs.logScore(fc.counts(), vars.get(child).arity(), Math.pow(3, ps.length)));
                }
            }
        }
        org.edgewise.driver.store.Manifest m0 = InMemoryTally.tally(vars.subList(0, 1), new int[][] {{0}}, 0, fs).manifest();
        org.edgewise.driver.store.Manifest m = org.edgewise.driver.store.Manifest.of(m0.program(), m0.programVersion(),
                m0.createdAt(), m0.input(), vars, d, null, List.of(), List.of(), List.of(), m0.score(), m0.ess());
        return new ScoreStore(m, fams, sc.stream().mapToDouble(Double::doubleValue).toArray());
    }

    /** The same store with every stored score multiplied by {@code factor} (e.g. to reach −10⁶). */
    public static ScoreStore scaled(ScoreStore s, double factor) {
        double[] sc = s.logScores();
        for (int k = 0; k < sc.length; k++) {
            sc[k] *= factor;
        }
        return new ScoreStore(s.manifest(), s.families(), sc);
    }

    public static LocalScores scores(ScoreStore s) {
        return LocalScores.build(s, ScoringOptions.asStored());
    }

    public static LocalScores scores(ScoreStore s, List<EdgeRule> forbid, List<EdgeRule> require) {
        return LocalScores.build(s, new ScoringOptions(null, Double.NaN, null, forbid, require));
    }

    /** The variables' names, by index, tier by tier (tiers as {@link OrderConstraints#of} takes them). */
    public static List<List<String>> tiers(ScoreStore s, int[]... tiers) {
        List<List<String>> out = new ArrayList<>();
        for (int[] tier : tiers) {
            List<String> names = new ArrayList<>();
            for (int v : tier) {
                names.add(s.variables().get(v).name());
            }
            out.add(names);
        }
        return out;
    }

    /** The scores of {@code s} with the edges between variables 2 and 4 forbidden both ways and 0 → 3 required. */
    public static LocalScores forbidTwoRequireOne(ScoreStore s) {
        String v0 = s.variables().get(0).name();
        String v2 = s.variables().get(2).name();
        String v3 = s.variables().get(3).name();
        String v4 = s.variables().get(4).name();
        return scores(s, List.of(new EdgeRule(v2, v4), new EdgeRule(v4, v2)), List.of(new EdgeRule(v0, v3)));
    }

    /** Scores with their order constraints, named for assertion messages. */
    public record Constrained(String what, LocalScores scores, OrderConstraints constraints) {
    }

    /**
     * The constrained cases of {@code s} (at least five variables): its plain scores under {@code tiers}
     * ("tiers"), {@link #forbidTwoRequireOne} without tiers ("forbid + require") and under
     * {@code tiersWithEdges} ("forbid + require + tiers").
     */
    public static List<Constrained> constrained(ScoreStore s, int[][] tiers, int[][] tiersWithEdges) {
        LocalScores plain = scores(s);
        LocalScores fr = forbidTwoRequireOne(s);
        return List.of(new Constrained("tiers", plain, OrderConstraints.of(plain, tiers(s, tiers))),
                new Constrained("forbid + require", fr, OrderConstraints.of(fr, List.of())),
                new Constrained("forbid + require + tiers", fr, OrderConstraints.of(fr, tiers(s, tiersWithEdges))));
    }
}
