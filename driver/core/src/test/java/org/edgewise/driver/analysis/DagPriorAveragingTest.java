package org.edgewise.driver.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.ProjectFiles;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.exact.StructureSum;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.NetworkReader;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * The structure-modular and essential-graph results: MCMC against the exact DP, essential-graph
 * features from exact draws against a class-by-class enumeration of every DAG (classes by
 * skeleton and v-structures, Verma &amp; Pearl 1990 — no use of Meek's rules), and the demo.
 */
class DagPriorAveragingTest {

    static ScoreStore random(int n, int d, int rows, long seed) {
        Network net = RandomNetwork.generate("v", n, 2, 2, n, 1.5, 0, seed);
        return InMemoryTally.tally(RandomNetwork.variables(net), new ForwardSampler(net).sample(rows, seed + 1), d,
                FamilyScore.withDefaults());
    }

    static UnknownOrderSettings settings(UnknownOrderSettings.Method m, DagPrior prior, boolean essential, int samples, long steps) {
        return settings(m, prior, essential, samples, steps, 1000);
    }

    static UnknownOrderSettings settings(UnknownOrderSettings.Method m, DagPrior prior, boolean essential, int samples, long steps,
                                         int draws) {
        return new UnknownOrderSettings(m, List.of(), 5, 4, steps, null, draws, null, null, null, false, false, samples, 3, prior, essential);
    }

    @Test
    void structureModularMcmcAgreesWithTheExactSum() {
        for (int n : new int[] {8, 10}) {
            ScoreStore s = random(n, 2, 300, 70 + n);
            LocalScores ls = LocalScores.build(s, ScoringOptions.asStored());
            StructureSum.Result exact = StructureSum.run(ls, OrderConstraints.none(n));
            EdgeResult mc = EdgeAnalysis.edges(ls, null,
                    settings(UnknownOrderSettings.Method.MCMC, DagPrior.STRUCTURE_MODULAR, false, 10000, 100_000, 5000),
                    ProgressListener.NONE);
            assertEquals("structure-modular", mc.dagPrior());
            for (EdgeResult.Edge e : mc.edges()) {
                int a = s.manifest().variableIndex(e.from());
                int b = s.manifest().variableIndex(e.to());
                double diff = Math.abs(exact.edgePosterior()[a][b] - e.posterior());
                double mcse = e.mcse() == null ? 0 : e.mcse();
                // the tolerance: within 0.05 and within 5 MCSE (+0.01 for estimates stuck at 0 or 1)
                assertTrue(diff <= 0.05 && diff <= 5 * mcse + 0.01, "n = " + n + " " + e + " exact " + exact.edgePosterior()[a][b]);
            }
        }
    }

    /** Exact essential-graph features by enumeration: per DAG, the edges every member of its class orients alike. */
    static double[][][] enumeratedEssential(LocalScores ls, DagPrior prior) {
        return enumeratedEssential(ls, prior, g -> true);
    }

    /**
     * The same over the DAGs {@code admitted} keeps (the posterior restricted to them), each class
     * being its admitted members only (structure-modular prior, or order-modular without constraints).
     */
    static double[][][] enumeratedEssential(LocalScores ls, DagPrior prior, java.util.function.Predicate<int[]> admitted) {
        int n = ls.variableCount();
        double[][] logBeta = DagEnumeration.logWeights(ls);
        List<int[]> dags = DagEnumeration.allDags(n).stream().filter(admitted).toList();
        Map<String, int[]> alike = new HashMap<>();
        for (int[] g : dags) {
            int[] a = alike.computeIfAbsent(DagEnumeration.classKey(g, n), k -> {
                int[] x = new int[n];
                Arrays.fill(x, -1);
                return x;
            });
            for (int v = 0; v < n; v++) {
                a[v] &= g[v];
            }
        }
        double[] lw = new double[dags.size()];
        for (int k = 0; k < dags.size(); k++) {
            for (int i = 0; i < n; i++) {
                lw[k] += logBeta[i][dags.get(k)[i]];
            }
            if (prior == DagPrior.ORDER_MODULAR) {
                lw[k] += Math.log(DagEnumeration.linearExtensions(dags.get(k), n));
            }
        }
        double z = LogSum.of(lw);
        double[][][] out = new double[4][n][n]; // adjacent, a->b compelled, b->a compelled, reversible
        for (int k = 0; k < dags.size(); k++) {
            double p = Math.exp(lw[k] - z);
            int[] g = dags.get(k);
            int[] c = alike.get(DagEnumeration.classKey(g, n));
            for (int a = 0; a < n; a++) {
                for (int b = a + 1; b < n; b++) {
                    boolean adj = ((g[b] >> a | g[a] >> b) & 1) != 0;
                    boolean ab = (c[b] >> a & 1) != 0;
                    boolean ba = (c[a] >> b & 1) != 0;
                    out[0][a][b] += adj ? p : 0;
                    out[1][a][b] += ab ? p : 0;
                    out[2][a][b] += ba ? p : 0;
                    out[3][a][b] += adj && !ab && !ba ? p : 0;
                }
            }
        }
        return out;
    }

    @Test
    void essentialGraphFromExactDrawsMatchesTheClassEnumerationUnderBothPriors() {
        ScoreStore s = random(5, 4, 60, 91);
        LocalScores ls = LocalScores.build(s, ScoringOptions.asStored());
        for (DagPrior prior : DagPrior.values()) {
            double[][][] exact = enumeratedEssential(ls, prior);
            EdgeResult r = EdgeAnalysis.edges(ls, null,
                    settings(UnknownOrderSettings.Method.EXACT, prior, true, 20_000, 1), ProgressListener.NONE);
            assertEquals(10, r.essentialGraph().size());
            for (EdgeResult.EssentialPair p : r.essentialGraph()) {
                int a = s.manifest().variableIndex(p.a());
                int b = s.manifest().variableIndex(p.b());
                double tol = 5 * p.mcse() + 2e-3; // 5 MCSE; the floor covers features of probability near 0 or 1
                assertEquals(exact[0][a][b], p.adjacent(), tol, prior + " adjacent " + p);
                assertEquals(exact[1][a][b], p.aToB(), tol, prior + " a->b " + p);
                assertEquals(exact[2][a][b], p.bToA(), tol, prior + " b->a " + p);
                assertEquals(exact[3][a][b], p.undirected(), tol, prior + " reversible " + p);
                assertTrue(p.mcse() <= 0.005, "20,000 independent draws give MCSE <= 0.0036: " + p);
            }
        }
    }

    @Test
    void tiersCompelEveryEdgeBetweenThemAndTheRestrictedClassesMatchTheEnumeration() {
        // issue 21: with tiers every adjacency between tiers is compelled forward (P(a -> b compelled) =
        // P(adjacent), never "undirected"); the rest against the enumeration of the admitted DAGs (every
        // edge between tiers forward) grouped by skeleton and v-structures, the admitted members only
        ScoreStore s = random(5, 4, 60, 91);
        LocalScores ls = LocalScores.build(s, ScoringOptions.asStored());
        List<String> names = EdgeAnalysis.names(ls);
        List<List<String>> tiers = List.of(List.of(names.get(3), names.get(0)), List.of(names.get(4)),
                List.of(names.get(1), names.get(2)));
        int[] tier = new int[5];
        for (int t = 0; t < tiers.size(); t++) {
            for (String v : tiers.get(t)) {
                tier[names.indexOf(v)] = t;
            }
        }
        double[][][] exact = enumeratedEssential(ls, DagPrior.STRUCTURE_MODULAR, g -> {
            for (int b = 0; b < 5; b++) {
                for (int a = 0; a < 5; a++) {
                    if ((g[b] >> a & 1) != 0 && tier[a] > tier[b]) {
                        return false;
                    }
                }
            }
            return true;
        });
        int between = 0;
        // exact and MCMC under both DAG priors: the exact DP over DAGs, the DP over orders, order MCMC and
        // partition MCMC (StructurePosterior.of)
        for (UnknownOrderSettings.Method m : UnknownOrderSettings.Method.values()) {
            for (DagPrior prior : DagPrior.values()) {
                UnknownOrderSettings base = settings(m, prior, true, 20_000, 20_000, 2000);
                UnknownOrderSettings st = new UnknownOrderSettings(m, tiers, base.seed(), base.chains(), base.steps(),
                        base.burnIn(), base.draws(), base.untilRhat(), base.maxSteps(), base.maxSeconds(), false, false,
                        base.orderSamples(), base.topParents(), prior, true);
                EdgeResult r = EdgeAnalysis.edges(ls, null, st, ProgressListener.NONE);
                for (EdgeResult.EssentialPair p : r.essentialGraph()) {
                    int a = s.manifest().variableIndex(p.a());
                    int b = s.manifest().variableIndex(p.b());
                    String what = m + " " + prior + " " + p;
                    if (tier[a] != tier[b]) {
                        between++;
                        double forward = tier[a] < tier[b] ? p.aToB() : p.bToA();
                        double backward = tier[a] < tier[b] ? p.bToA() : p.aToB();
                        assertEquals(p.adjacent(), forward, 1e-12, "compelled forward " + what);
                        assertEquals(0.0, backward, 1e-12, what);
                        assertEquals(0.0, p.undirected(), 1e-12, what);
                    }
                    if (m == UnknownOrderSettings.Method.EXACT && prior == DagPrior.STRUCTURE_MODULAR) {
                        int lo = Math.min(a, b);
                        int hi = Math.max(a, b);
                        double ab = a < b ? p.aToB() : p.bToA();
                        double ba = a < b ? p.bToA() : p.aToB();
                        double tol = 5 * p.mcse() + 2e-3;
                        assertEquals(exact[0][lo][hi], p.adjacent(), tol, "adjacent " + what);
                        assertEquals(exact[1][lo][hi], ab, tol, "lo->hi " + what);
                        assertEquals(exact[2][lo][hi], ba, tol, "hi->lo " + what);
                        assertEquals(exact[3][lo][hi], p.undirected(), tol, "reversible " + what);
                    }
                }
            }
        }
        assertTrue(between > 0);
    }

    @Test
    void importanceWeightedExactDrawsMatchTheClassEnumeration() {
        // the fallback when rejection would take too long: order-modular draws weighted by 1/ext(G)
        ScoreStore s = random(5, 4, 60, 93);
        LocalScores ls = LocalScores.build(s, ScoringOptions.asStored());
        double[][][] exact = enumeratedEssential(ls, DagPrior.STRUCTURE_MODULAR);
        var d = org.edgewise.driver.average.exact.ExactDagSampler.of(ls, OrderConstraints.none(5)).drawWeighted(40_000, 3);
        List<String> names = EdgeAnalysis.names(ls);
        for (EdgeResult.EssentialPair p : EdgeAnalysis.essential(names, d)) {
            int a = s.manifest().variableIndex(p.a());
            int b = s.manifest().variableIndex(p.b());
            double tol = 5 * p.mcse() + 2e-3;
            assertEquals(exact[0][a][b], p.adjacent(), tol, "adjacent " + p);
            assertEquals(exact[1][a][b], p.aToB(), tol, "a->b " + p);
            assertEquals(exact[3][a][b], p.undirected(), tol, "reversible " + p);
        }
    }

    /** The demo data (sample-data/fleet.csv), tallied in memory with d = 2 and BDeu ESS 1. */
    static ScoreStore fleet() throws IOException {
        Network net = NetworkReader.read(ProjectFiles.path("sample-data", "fleet-network.json"));
        List<String> lines = Files.readAllLines(ProjectFiles.path("sample-data", "fleet.csv"));
        String[] header = lines.get(0).split(",");
        List<Variable> vars = new ArrayList<>();
        int[] column = new int[header.length];
        for (int c = 0; c < header.length; c++) {
            int i = net.names().indexOf(header[c]);
            column[c] = i;
        }
        for (int i = 0; i < net.size(); i++) {
            vars.add(new Variable(net.names().get(i), net.states().get(i)));
        }
        int[][] rows = new int[lines.size() - 1][net.size()];
        for (int r = 1; r < lines.size(); r++) {
            String[] f = lines.get(r).split(",");
            for (int c = 0; c < f.length; c++) {
                rows[r - 1][column[c]] = vars.get(column[c]).stateIndex(f[c]);
            }
        }
        return InMemoryTally.tally(vars, rows, 2, FamilyScore.withDefaults());
    }

    @Test
    void demoSeasonAndAmbientHeatAreAdjacentButMostlyReversible() throws IOException {
        ScoreStore s = fleet();
        LocalScores ls = LocalScores.build(s, ScoringOptions.asStored());
        EdgeResult r = EdgeAnalysis.edges(ls, null,
                settings(UnknownOrderSettings.Method.EXACT, DagPrior.STRUCTURE_MODULAR, true, 10_000, 1), ProgressListener.NONE);
        EdgeResult.EssentialPair pair = r.essentialGraph().stream()
                .filter(p -> Set2.of(p.a(), p.b()).equals(Set2.of("season", "ambient_heat"))).findFirst().orElseThrow();
        assertTrue(pair.adjacent() > 0.9, pair.toString());
        assertTrue(pair.undirected() > 0.5 * pair.adjacent(), pair.toString());
    }

    /** An unordered pair of names. */
    record Set2(String lo, String hi) {
        static Set2 of(String a, String b) {
            return a.compareTo(b) < 0 ? new Set2(a, b) : new Set2(b, a);
        }
    }
}
