package org.edgewise.driver.report;

import org.edgewise.driver.ProjectFiles;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderSum;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.NetworkReader;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;

/** Hand-built results for the report and compare tests (EdgeResult objects, no `edges` command needed). */
final class ReportFixtures {
    private ReportFixtures() {
    }

    /** The demo network of sample-data/ (tests run in driver/). */
    static Network fleet() {
        return NetworkReader.read(ProjectFiles.path("sample-data", "fleet-network.json"));
    }

    /**
     * A real given-order result for the fleet network: 2,000 rows sampled with a fixed seed,
     * tallied in memory (d = 2, BDeu ESS 1), edge posteriors under the network's own topological
     * order by the existing OrderSum; plus ESS-sensitivity entries at 0.1 and 10.
     */
    static synchronized EdgeResult fleetGivenOrder(int rows) {
        return CACHE.computeIfAbsent(rows, ReportFixtures::computeFleetGivenOrder);
    }

    private static final Map<Integer, EdgeResult> CACHE = new java.util.HashMap<>();

    /** A store of {@code rows} rows forward-sampled from {@code net} (seed {@code seed}), d = 2, BDeu ESS 1. */
    static ScoreStore tally(Network net, int rows, long seed) {
        int n = net.size();
        int[][] data = new int[rows][n];
        SplittableRandom rng = new SplittableRandom(seed);
        ForwardSampler sampler = new ForwardSampler(net);
        for (int[] row : data) {
            sampler.draw(rng, row);
        }
        List<Variable> vars = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            vars.add(new Variable(net.names().get(i), net.states().get(i)));
        }
        return InMemoryTally.tally(vars, data, 2, FamilyScore.of(ScoreKind.BDEU, 1.0));
    }

    private static EdgeResult computeFleetGivenOrder(int rows) {
        Network net = fleet();
        ScoreStore store = tally(net, rows, 7);
        int[] order = net.topoOrder();
        List<String> orderNames = new ArrayList<>();
        for (int v : order) {
            orderNames.add(net.names().get(v));
        }
        LocalScores ls = LocalScores.build(store, ScoringOptions.asStored());
        OrderSum.OrderResult main = OrderSum.evaluate(ls, order);
        List<EdgeResult.Sensitivity> sens = new ArrayList<>();
        for (double ess : new double[] {0.1, 10}) {
            OrderSum.OrderResult o = OrderSum.evaluate(LocalScores.build(store, ScoringOptions.asStored().withEss(ess)), order);
            sens.add(new EdgeResult.Sensitivity(ess, o.logEvidence(), edges(net.names(), o.edgePosterior(), null, null)));
        }
        return new EdgeResult("order", net.names(), main.logEvidence(), main.logEvidenceNormalized(), "order-modular",
                orderNames, new EdgeResult.Settings("bdeu", 1.0, "uniform", 2, List.of(), List.of(), null),
                new EdgeResult.Provenance("out/store", List.of("fleet.csv"), rows, "ab12cd34", "2026-12-01T00:00:00Z",
                        "bdeu", 1.0, null),
                edges(net.names(), main.edgePosterior(), null, null), parentSets(ls, net.names(), order), null, null, null, sens, null, null);
    }

    /** The same result presented as an MCMC run with made-up diagnostics (traces, MCSE, R̂). */
    static EdgeResult asMcmc(EdgeResult r, double maxRhat) {
        int n = r.variables().size();
        double[][] p = EdgeMatrix.of(r).p();
        double[][] mcse = new double[n][n];
        double[][] rhat = new double[n][n];
        SplittableRandom rng = new SplittableRandom(3);
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                mcse[a][b] = 0.01 * Math.sqrt(p[a][b] * (1 - p[a][b]));
                rhat[a][b] = 1 + (maxRhat - 1) * rng.nextDouble();
            }
        }
        rhat[0][1] = maxRhat;
        List<List<Double>> traces = new ArrayList<>();
        for (int c = 0; c < 4; c++) {
            List<Double> t = new ArrayList<>();
            double level = -31000 - 40 * c * (maxRhat > 1.01 ? 1 : 0);
            for (int i = 0; i < 200; i++) {
                t.add(level - 300 * Math.exp(-i / 15.0) + 8 * rng.nextGaussian());
            }
            traces.add(t);
        }
        EdgeResult.Diagnostics d = new EdgeResult.Diagnostics(4, 20000, 2000, 42, 0.31, maxRhat, 412.5,
                maxRhat <= 1.01, traces, 100);
        return new EdgeResult("mcmc", r.variables(), null, null, "order-modular", null, r.settings(), r.store(),
                edges(r.variables(), p, mcse, rhat), r.parentSets(), r.bestNetwork(), d,
                List.of(new EdgeResult.Feature("ancestor", r.variables().get(0), r.variables().get(4), 0.97, 0.004)), null, null, null);
    }

    static List<EdgeResult.Edge> edges(List<String> names, double[][] p, double[][] mcse, double[][] rhat) {
        List<EdgeResult.Edge> out = new ArrayList<>();
        for (int a = 0; a < names.size(); a++) {
            for (int b = 0; b < names.size(); b++) {
                if (a != b) {
                    out.add(new EdgeResult.Edge(names.get(a), names.get(b), p[a][b],
                            mcse == null ? null : mcse[a][b], rhat == null ? null : rhat[a][b]));
                }
            }
        }
        return out;
    }

    static List<EdgeResult.VariableParents> parentSets(LocalScores ls, List<String> names, int[] order) {
        int[] pos = OrderSum.positions(order, names.size());
        List<EdgeResult.VariableParents> out = new ArrayList<>();
        for (int child = 0; child < names.size(); child++) {
            long pred = ls.predecessorMask(child, pos);
            double z = OrderSum.childLogSum(ls, child, pred);
            List<EdgeResult.ParentSet> sets = new ArrayList<>();
            for (int s = 0; s < ls.setCount(child); s++) {
                if ((ls.masks(child)[s] & ~pred) == 0) {
                    List<String> ps = new ArrayList<>();
                    for (int v : ls.parents(child, s)) {
                        ps.add(names.get(v));
                    }
                    sets.add(new EdgeResult.ParentSet(ps, Math.exp(ls.weights(child)[s] - z)));
                }
            }
            sets.sort(Comparator.comparingDouble(x -> -x.posterior()));
            out.add(new EdgeResult.VariableParents(names.get(child), sets.subList(0, Math.min(5, sets.size()))));
        }
        return out;
    }

    /** A three-variable result written by hand: a → b strong, b → c medium, c → a weak. */
    static EdgeResult tiny(List<String> names) {
        Map<String, Double> p = new LinkedHashMap<>();
        String a = names.get(0);
        String b = names.get(1);
        String c = names.get(2);
        List<EdgeResult.Edge> e = List.of(
                new EdgeResult.Edge(a, b, 0.9), new EdgeResult.Edge(b, a, 0.05),
                new EdgeResult.Edge(b, c, 0.6), new EdgeResult.Edge(c, b, 0.3),
                new EdgeResult.Edge(a, c, 0.1), new EdgeResult.Edge(c, a, 0.2));
        p.put("unused", 0.0);
        return new EdgeResult("exact", names, -1234.5, null, "order-modular", null,
                new EdgeResult.Settings("bdeu", 1.0, "uniform", 2, List.of(), List.of(), null),
                new EdgeResult.Provenance("store", List.of("in.csv"), 100, "f00d", "2026-12-01T00:00:00Z", "bdeu", 1.0, null),
                e, List.of(new EdgeResult.VariableParents(b, List.of(new EdgeResult.ParentSet(List.of(a), 0.9),
                        new EdgeResult.ParentSet(List.of(), 0.1)))),
                new EdgeResult.Network(-1230.0, Map.of(a, List.of(), b, List.of(a), c, List.of(b))), null, null, null, null, null);
    }

    /** {@code r} with another DAG prior label and essential graph (null: not assessed). */
    static EdgeResult with(EdgeResult r, String dagPrior, List<EdgeResult.EssentialPair> essentialGraph) {
        return new EdgeResult(r.method(), r.variables(), r.logEvidence(), r.logEvidenceNormalized(), r.evidenceConvention(),
                r.order(), r.settings(), r.store(), r.edges(), r.parentSets(), r.bestNetwork(), r.diagnostics(), r.features(),
                r.sensitivity(), dagPrior, essentialGraph);
    }

    /**
     * The chain slice of the demo (DESIGN.md, "DAG priors over unknown orders"): season – ambient_heat –
     * compressor_wear. DAG-edge posteriors as the order-modular prior tilts them (P(ambient_heat → season)
     * = 0.934, the figure measured on the demo), and an essential graph, written by hand, in which both
     * pairs are adjacent but almost always reversible (a chain's class has no compelled edge), plus a
     * compelled pair compressor_wear → sensor_fault ← compressor_age (a v-structure's edges are compelled).
     */
    static EdgeResult demoChain(String dagPrior) {
        List<String> v = List.of("season", "ambient_heat", "compressor_wear", "compressor_age", "sensor_fault");
        List<EdgeResult.Edge> e = new ArrayList<>();
        double[][] p = new double[5][5];
        p[1][0] = 0.934;
        p[0][1] = 0.060;
        p[2][1] = 0.870;
        p[1][2] = 0.120;
        p[2][4] = 0.950;
        p[3][4] = 0.940;
        p[3][2] = 0.030;
        for (int a = 0; a < 5; a++) {
            for (int b = 0; b < 5; b++) {
                if (a != b) {
                    e.add(new EdgeResult.Edge(v.get(a), v.get(b), p[a][b], 0.004, 1.001));
                }
            }
        }
        EdgeResult r = new EdgeResult("mcmc", v, null, null, "order-modular", null,
                new EdgeResult.Settings("bdeu", 1.0, "uniform", 2, List.of(), List.of(), null),
                new EdgeResult.Provenance("store", List.of("fleet.csv"), 5000, "beef", "2026-12-01T00:00:00Z", "bdeu", 1.0, null),
                e, null, null, null, null, null, dagPrior, null);
        return with(r, dagPrior, List.of(
                new EdgeResult.EssentialPair("season", "ambient_heat", 0.994, 0.0, 0.004, 0.990, 0.003),
                new EdgeResult.EssentialPair("ambient_heat", "compressor_wear", 0.990, 0.010, 0.020, 0.960, 0.004),
                new EdgeResult.EssentialPair("compressor_wear", "sensor_fault", 0.950, 0.930, 0.0, 0.020, 0.005),
                new EdgeResult.EssentialPair("compressor_age", "sensor_fault", 0.940, 0.920, 0.0, 0.020, 0.005),
                new EdgeResult.EssentialPair("compressor_age", "compressor_wear", 0.030, 0.0, 0.0, 0.030, 0.002)));
    }
}
