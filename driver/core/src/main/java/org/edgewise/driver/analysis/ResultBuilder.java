package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.result.EdgeResult;

/**
 * Builds the parts of an {@link EdgeResult} that every averaging method shares — the edge list,
 * the most probable parent sets, a single network, settings and provenance — from plain arrays,
 * so that the given-order, exact and MCMC methods all report alike. A method supplies an n×n
 * edge-posterior matrix {@code post[from][to]} and, per child, parent-set posteriors aligned with
 * {@link LocalScores#masks(int)}.
 */
public final class ResultBuilder {
    private ResultBuilder() {
    }

    /** How the given-order result states its evidence (DESIGN.md, "Convention"). */
    public static final String ORDER_MODULAR = "order-modular";

    /** The {@code dagPrior} of a given-order result: given an order both DAG priors coincide. */
    public static final String EITHER_GIVEN_ORDER = "either (order given)";

    static int[] identity(int n) {
        int[] out = new int[n];
        for (int i = 0; i < n; i++) {
            out[i] = i;
        }
        return out;
    }

    /** One entry for every ordered pair of distinct variables, from-major in store order. */
    public static List<EdgeResult.Edge> edges(List<String> names, double[][] post) {
        int n = names.size();
        List<EdgeResult.Edge> out = new ArrayList<>(n * (n - 1));
        for (int from = 0; from < n; from++) {
            for (int to = 0; to < n; to++) {
                if (from != to) {
                    out.add(new EdgeResult.Edge(names.get(from), names.get(to), clamp(post[from][to])));
                }
            }
        }
        return out;
    }

    /** Sums of floating-point posteriors can exceed 1 by an ulp; a probability is reported in [0,1]. */
    static double clamp(double p) {
        return p < 0 ? 0 : Math.min(p, 1.0);
    }

    /**
     * Per child (store order), its {@code k} most probable parent sets with posterior &gt; 0, most
     * probable first (ties: fewer parents, then store order).
     */
    public static List<EdgeResult.VariableParents> topParents(LocalScores ls, double[][] setPosterior, int k) {
        ScoreStore store = ls.store();
        int n = ls.variableCount();
        List<EdgeResult.VariableParents> out = new ArrayList<>(n);
        for (int child = 0; child < n; child++) {
            double[] p = setPosterior[child];
            final int c = child;
            Integer[] live = OrderPosterior.positiveSets(p);
            Arrays.sort(live, (a, b) -> {
                int cmp = Double.compare(p[b], p[a]);
                if (cmp != 0) {
                    return cmp;
                }
                cmp = Integer.compare(Long.bitCount(ls.masks(c)[a]), Long.bitCount(ls.masks(c)[b]));
                return cmp != 0 ? cmp : Integer.compare(a, b);
            });
            List<EdgeResult.ParentSet> top = new ArrayList<>();
            for (int t = 0; t < Math.min(k, live.length); t++) {
                top.add(new EdgeResult.ParentSet(names(store, ls.parents(child, live[t])), clamp(p[live[t]])));
            }
            out.add(new EdgeResult.VariableParents(store.variables().get(child).name(), top));
        }
        return out;
    }

    /**
     * The network with parent set {@code setPerChild[i]} (an index into {@link LocalScores#masks(int)})
     * for every child; its log score is Σ_i (s(i,U_i) + log ρ_i(U_i)).
     */
    public static EdgeResult.Network network(LocalScores ls, int[] setPerChild) {
        ScoreStore store = ls.store();
        Map<String, List<String>> parents = new LinkedHashMap<>();
        double total = 0;
        for (int child = 0; child < ls.variableCount(); child++) {
            int s = setPerChild[child];
            total += ls.weights(child)[s];
            parents.put(store.variables().get(child).name(), names(store, ls.parents(child, s)));
        }
        return new EdgeResult.Network(total, parents);
    }

    /** Score, ESS, prior, d and the query-time constraints (tally-time ones are in the provenance's manifest). */
    public static EdgeResult.Settings settings(LocalScores ls) {
        Manifest m = ls.store().manifest();
        return new EdgeResult.Settings(ls.familyScore().kind().label(),
                ls.familyScore().reportedEss(),
                ls.options().prior().label(), m.maxParents(), rules(ls.options().forbid()),
                rules(ls.options().require()), m.tiers() == null || m.tiers().isEmpty() ? null : m.tiers());
    }

    /** Where the counts came from: the store path and its manifest's input description. */
    public static EdgeResult.Provenance provenance(ScoreStore store, Path path) {
        Manifest m = store.manifest();
        EdgeResult.Provenance p = new EdgeResult.Provenance(path == null ? null : path.toString(),
                m.input() == null ? null : m.input().paths(), m.input() == null ? 0 : m.input().rows(),
                m.input() == null ? null : m.input().fingerprint(), m.createdAt(), m.score(), m.ess(),
                m.candidates());
        return m.missingValues() == null ? p : p.withMissingValues(missingValuesWords(m.missingValues()));
    }

    /** How a store averaged over its missing values, with the shares missing and the assumption's caution. */
    static String missingValuesWords(org.edgewise.driver.store.MissingValues mv) {
        StringBuilder sb = new StringBuilder(mv.describe()).append(String.format(java.util.Locale.ROOT,
                "; %.1f%% of the rows incomplete", 100 * mv.incompleteRowShare()));
        for (var e : mv.missingCellShare().entrySet()) {
            if (e.getValue() > 0) {
                sb.append(String.format(java.util.Locale.ROOT, ", %s %.1f%% missing", e.getKey(), 100 * e.getValue()));
            }
        }
        return sb.append(". Valid if whether a value is missing depends only on values that were observed"
                + " (missing at random); not if it depends on the missing value itself").toString();
    }

    static List<String> rules(List<EdgeRule> rules) {
        List<String> out = new ArrayList<>();
        for (EdgeRule r : rules) {
            out.add(r.toString());
        }
        return out;
    }

    static List<String> names(ScoreStore store, int[] vars) {
        List<String> out = new ArrayList<>(vars.length);
        for (int v : vars) {
            out.add(store.variables().get(v).name());
        }
        return out;
    }
}
