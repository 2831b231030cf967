package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.NetworkJson;
import org.edgewise.driver.network.NetworkReader;
import org.edgewise.driver.posterior.DagSample;
import org.edgewise.driver.posterior.StructurePosterior;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;

/**
 * The {@code export} service: one network taken from a saved posterior sample, with posterior-mean
 * probability tables, in the network JSON that {@code simulate}, {@code compare} and a report's truth
 * read ({@link NetworkReader}). The structure is either
 * <ul>
 *   <li>{@link Structure#BEST}: the sample's DAG of highest posterior score Σ_i [s(i, U_i) + log ρ_i(U_i)]
 *       (the family scores plus the structure prior; under the structure-modular prior this is log P(G | D)
 *       up to a constant; an order-modular sample weighs DAGs also by their linear extensions, which this
 *       figure leaves out) — exact for the DAGs the sample holds, not a search beyond them; or</li>
 *   <li>{@link Structure#CONSENSUS}: every edge whose posterior over the sample exceeds 1/2, when that
 *       graph is acyclic (refused, naming a cycle, when not).</li>
 * </ul>
 * Each table θ̄_ijk = (N_ijk + α_ijk)/(N_ij + α_ij) (Heckerman, Geiger &amp; Chickering 1995, eq. 23;
 * {@link FamilyScore#predictive}) from the store's counts of the family (child, parent set) under the
 * sample's scoring; a parent configuration the data never show gets 1/r. A family the store does not
 * count (more parents than its bound, or a parent outside the child's candidates) has no table: refused,
 * naming it. Memory: the network's tables (8 bytes per cell) and its JSON text.
 */
public final class ExportAnalysis {
    /** Which single network to take from the sample. */
    public enum Structure {
        BEST("best"), CONSENSUS("consensus");

        private final String word;

        Structure(String word) {
            this.word = word;
        }

        public String word() {
            return word;
        }

        /** The structure a user names ({@code what} names the input in messages). */
        public static Structure parse(String text, String what) {
            for (Structure s : values()) {
                if (s.word.equalsIgnoreCase(text)) {
                    return s;
                }
            }
            throw new UserError(what + " must be best or consensus, got '" + text + "'");
        }
    }

    /**
     * @param network the network written
     * @param json    its network JSON
     * @param summary one line for people: what the structure is and where the tables come from
     */
    public record Exported(Network network, String json, String summary) {
    }

    private ExportAnalysis() {
    }

    /** The network of {@code structure} from the sample {@code sample} drawn from the store of {@code scoring}. */
    public static Exported run(Scoring scoring, Path sample, Structure structure) {
        Inputs in = Inputs.ofSample(scoring, sample);
        LocalScores ls = in.scores();
        StructurePosterior p = StructurePosterior.of(ls, in.saved(), null, null, ProgressListener.NONE);
        ScoreStore store = ls.store();
        int n = ls.variableCount();
        DagSample d = p.sampleDags(0, 0).dags();
        int[][] parents;
        String what;
        if (structure == Structure.BEST) {
            int[][] best = null;
            double bestScore = Double.NEGATIVE_INFINITY;
            long times = 0;
            Map<String, Double> scored = new HashMap<>();
            Map<String, Long> count = new HashMap<>();
            List<Map<String, Integer>> sets = setIndex(ls);
            for (int c = 0; c < d.chains(); c++) {
                for (int k = 0; k < d.perChain(); k++) {
                    int[][] g = d.dags()[c][k];
                    String key = Arrays.deepToString(g);
                    count.merge(key, 1L, Long::sum);
                    double s = scored.computeIfAbsent(key, x -> logScore(ls, sets, g, sample));
                    if (s > bestScore) {
                        bestScore = s;
                        best = g;
                    }
                }
            }
            times = count.get(Arrays.deepToString(best));
            parents = best;
            what = String.format(Locale.ROOT, "the highest-posterior DAG of sample %s: log score %.6f (family scores plus "
                    + "structure prior), %d of its %d DAGs, %d distinct", sample, bestScore, times, d.total(), count.size());
        } else {
            double[][] post = p.edges().posterior();
            parents = new int[n][];
            int edges = 0;
            for (int b = 0; b < n; b++) {
                List<Integer> pa = new ArrayList<>();
                for (int a = 0; a < n; a++) {
                    if (a != b && post[a][b] > 0.5) {
                        pa.add(a);
                    }
                }
                parents[b] = pa.stream().mapToInt(Integer::intValue).toArray();
                edges += pa.size();
            }
            String cycle = cycle(parents, store);
            if (cycle != null) {
                throw new UserError("the consensus graph of sample " + sample + " (edges of posterior above 0.5) has a cycle, "
                        + cycle + ": it is no DAG; export the highest-posterior DAG instead");
            }
            what = String.format(Locale.ROOT, "the consensus graph of sample %s: the %d edges of posterior above 0.5 over its %d DAGs",
                    sample, edges, d.total());
        }
        Network net = withTables(ls, parents, sample, what);
        String summary = what + "; tables: posterior means (N_ijk + a_ijk)/(N_ij + a_ij) from the counts of store "
                + scoring.store() + " (" + ls.familyScore().kind().label()
                + (ls.familyScore().kind().usesEss() ? ", ESS " + ls.familyScore().ess() : "") + ")";
        return new Exported(net, NetworkJson.write(net), summary);
    }

    /** Σ_i [s(i, U_i) + log ρ_i(U_i)] of a DAG, from the local scores' weights. */
    private static double logScore(LocalScores ls, List<Map<String, Integer>> sets, int[][] g, Path sample) {
        double s = 0;
        for (int v = 0; v < g.length; v++) {
            Integer set = sets.get(v).get(Arrays.toString(g[v]));
            if (set == null) {
                throw new UserError("sample " + sample + " gives " + ls.store().variables().get(v).name()
                        + " a parent set the store's scoring does not allow");
            }
            s += ls.weights(v)[set];
        }
        return s;
    }

    /** Per child, the index in the local scores of each allowed parent set, keyed by its sorted parents. */
    private static List<Map<String, Integer>> setIndex(LocalScores ls) {
        List<Map<String, Integer>> out = new ArrayList<>();
        for (int v = 0; v < ls.variableCount(); v++) {
            Map<String, Integer> m = new HashMap<>();
            for (int set = 0; set < ls.setCount(v); set++) {
                int[] pa = ls.parents(v, set).clone();
                Arrays.sort(pa);
                m.put(Arrays.toString(pa), set);
            }
            out.add(m);
        }
        return out;
    }

    /** A directed cycle of the graph as "a -> b -> … -> a", or null when it is acyclic. */
    static String cycle(int[][] parents, ScoreStore store) {
        int n = parents.length;
        int[] colour = new int[n]; // 0 new, 1 on the path, 2 done
        int[] next = new int[n];
        for (int start = 0; start < n; start++) {
            if (colour[start] != 0) {
                continue;
            }
            // depth-first along parent arrows: a cycle of parents read backwards is a cycle of edges
            java.util.ArrayDeque<Integer> path = new java.util.ArrayDeque<>();
            path.push(start);
            colour[start] = 1;
            while (!path.isEmpty()) {
                int v = path.peek();
                if (next[v] < parents[v].length) {
                    int u = parents[v][next[v]++];
                    if (colour[u] == 1) {
                        List<String> names = new ArrayList<>();
                        names.add(store.variables().get(u).name());
                        for (int w : path) { // from v back up the path to u: each is a child of the one before
                            names.add(store.variables().get(w).name());
                            if (w == u) {
                                break;
                            }
                        }
                        return String.join(" -> ", names);
                    }
                    if (colour[u] == 0) {
                        colour[u] = 1;
                        path.push(u);
                    }
                } else {
                    colour[v] = 2;
                    path.pop();
                }
            }
        }
        return null;
    }

    /** The network of {@code parents} with the posterior-mean table of every family, from the store's counts. */
    private static Network withTables(LocalScores ls, int[][] parents, Path sample, String what) {
        ScoreStore store = ls.store();
        FamilyScore score = ls.familyScore();
        int n = parents.length;
        List<String> names = new ArrayList<>();
        List<List<String>> states = new ArrayList<>();
        List<List<String>> parentNames = new ArrayList<>();
        List<double[][]> rows = new ArrayList<>();
        for (int v = 0; v < n; v++) {
            names.add(store.variables().get(v).name());
            states.add(store.variables().get(v).states());
        }
        for (int v = 0; v < n; v++) {
            FamilyCounts fc = family(store, v, parents[v]);
            int r = store.arity(v);
            double q = store.configurations(fc.parents());
            if (q * r > NetworkReader.MAX_CPT_ENTRIES) {
                throw new UserError(String.format(Locale.ROOT, "%s: the table of %s would hold %.0f entries (a network file "
                        + "holds at most %d per variable)", what, names.get(v), q * r, NetworkReader.MAX_CPT_ENTRIES));
            }
            List<String> pn = new ArrayList<>();
            for (int p : fc.parents()) {
                pn.add(names.get(p));
            }
            double[][] table = new double[(int) q][r];
            for (int j = 0; j < q; j++) {
                int row = Arrays.binarySearch(fc.configs(), j);
                long nij = 0;
                if (row >= 0) {
                    for (int k = 0; k < r; k++) {
                        nij += fc.counts()[row * r + k];
                    }
                }
                for (int k = 0; k < r; k++) {
                    table[j][k] = score.predictive(row >= 0 ? fc.counts()[row * r + k] : 0, nij, r, q);
                }
            }
            parentNames.add(pn);
            rows.add(table);
        }
        return Network.of("exported from sample " + sample, "from-sample", what, names, states, parentNames, rows);
    }

    /** The store's counts of (child, parents), or a refusal naming the family it does not hold. */
    static FamilyCounts family(ScoreStore store, int child, int[] parents) {
        for (int f = store.firstFamilyOf(child); f < store.endFamilyOf(child); f++) {
            int[] pa = store.family(f).parents().clone();
            Arrays.sort(pa);
            if (Arrays.equals(pa, parents)) {
                return store.family(f);
            }
        }
        List<String> pn = new ArrayList<>();
        for (int p : parents) {
            pn.add(store.variables().get(p).name());
        }
        throw new UserError("the table of " + store.variables().get(child).name() + " given {" + String.join(", ", pn)
                + "} needs the counts of that family, which the store does not hold (it counts parent sets of size at most "
                + store.manifest().maxParents() + ", among each variable's candidates); tally with a larger "
                + "maximum parent-set size, or export the highest-posterior DAG");
    }
}
