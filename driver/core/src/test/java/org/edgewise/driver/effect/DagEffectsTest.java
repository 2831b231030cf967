package org.edgewise.driver.effect;

import static org.edgewise.driver.effect.EffectBruteForce.H;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * A do-query on one DAG by variable elimination on its mutilated graph ({@link DagEffects}) against
 * brute force: the truncated factorisation (Spirtes, Glymour &amp; Scheines 1993; Pearl 2000, eq. 3.10)
 * summed over every joint state of all n variables — not only the relevant ancestors — with the
 * posterior-mean parameters θ̄_ijk = (N_ijk + α_ijk)/(N_ij + α_ij) counted from the rows by
 * {@link EffectBruteForce#theta} (no store, no elimination). Random networks n ≤ 10 with arities 2–3,
 * random DAGs (in-degree ≤ 2), random interventions, targets and evidence; to 1e-12.
 */
class DagEffectsTest {

    /** Brute force with θ̄ memoised per (variable, parents' states, state): the same counts, counted once. */
    private static final class Truth {
        final List<Variable> vars;
        final int[][] rows;
        final int[][] parents;
        final Map<String, Double> memo = new HashMap<>();

        Truth(List<Variable> vars, int[][] rows, int[][] parents) {
            this.vars = vars;
            this.rows = rows;
            this.parents = parents;
        }

        double theta(int v, int[] x) {
            StringBuilder key = new StringBuilder().append(v).append(':').append(x[v]);
            for (int p : parents[v]) {
                key.append(',').append(x[p]);
            }
            return memo.computeIfAbsent(key.toString(), k -> EffectBruteForce.theta(vars, rows, parents[v], v, x, 1.0));
        }

        /** Σ over every joint state agreeing with {@code fixed} of Π_{v not intervened} θ̄_v(x_v | x_U). */
        double truncated(boolean[] cut, int[] fixed) {
            int n = vars.size();
            int[] x = new int[n];
            double total = 0;
            while (true) {
                boolean ok = true;
                for (int v = 0; v < n; v++) {
                    ok &= fixed[v] == H || fixed[v] == x[v];
                }
                if (ok) {
                    double p = 1;
                    for (int v = 0; v < n; v++) {
                        if (!cut[v]) {
                            p *= theta(v, x);
                        }
                    }
                    total += p;
                }
                int v = 0;
                while (v < n && ++x[v] == vars.get(v).arity()) {
                    x[v] = 0;
                    v++;
                }
                if (v == n) {
                    return total;
                }
            }
        }
    }

    static int[][] randomDag(int n, int d, SplittableRandom rng) {
        int[] order = new int[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
        }
        for (int i = n - 1; i > 0; i--) {
            int j = rng.nextInt(i + 1);
            int t = order[i];
            order[i] = order[j];
            order[j] = t;
        }
        int[][] parents = new int[n][];
        for (int i = 0; i < n; i++) {
            int[] pa = new int[Math.min(i, d)];
            int k = 0;
            for (int e = 0; e < i && k < d; e++) {
                if (rng.nextDouble() < 0.4) {
                    pa[k++] = order[e];
                }
            }
            parents[order[i]] = Arrays.copyOf(pa, k);
            Arrays.sort(parents[order[i]]);
        }
        return parents;
    }

    @Test
    void doQueriesByEliminationEqualTheTruncatedFactorisationSummedOverEveryJointState() {
        SplittableRandom rng = new SplittableRandom(19);
        int checked = 0;
        for (int net = 0; net < 12; net++) {
            int n = 5 + net % 6; // 5 … 10
            int[] arity = new int[n];
            for (int v = 0; v < n; v++) {
                arity[v] = n >= 9 ? 2 : 2 + rng.nextInt(2);
            }
            List<Variable> vars = HeldOutData.variables(arity);
            int[][] rows = HeldOutData.table(100 + net, 150, arity);
            ScoreStore store = InMemoryTally.tally(vars, rows, 2, FamilyScore.withDefaults());
            LocalScores ls = LocalScores.build(store, ScoringOptions.asStored());
            Parameters mean = Parameters.mean(ls);
            DagEffects engine = new DagEffects(store, 1L << 20, "the limit");
            for (int g = 0; g < 3; g++) {
                int[][] parents = randomDag(n, 2, rng);
                Truth truth = new Truth(vars, rows, parents);
                for (int t = 0; t < 4; t++) {
                    boolean[] cut = new boolean[n];
                    int[] fixed = new int[n];
                    Arrays.fill(fixed, H);
                    int x = rng.nextInt(n);
                    cut[x] = true;
                    fixed[x] = rng.nextInt(arity[x]);
                    if (rng.nextBoolean()) { // a second intervened variable
                        int x2 = rng.nextInt(n);
                        cut[x2] = true;
                        fixed[x2] = rng.nextInt(arity[x2]);
                    }
                    int y = rng.nextInt(n);
                    if (!cut[y]) {
                        fixed[y] = rng.nextInt(arity[y]);
                    }
                    int w = rng.nextInt(n);
                    if (!cut[w] && w != y && rng.nextBoolean()) { // evidence, possibly a descendant of x
                        fixed[w] = rng.nextInt(arity[w]);
                    }
                    double want = truth.truncated(cut, fixed);
                    double got = Math.exp(engine.logProbability(parents, cut, fixed, mean));
                    assertEquals(want, got, 1e-12, () -> "net " + Arrays.deepToString(parents) + " fixed " + Arrays.toString(fixed)
                            + " cut " + Arrays.toString(cut));
                    // observing instead of setting: the plain factorisation, the same brute force with nothing cut
                    boolean[] none = new boolean[n];
                    assertEquals(truth.truncated(none, fixed), Math.exp(engine.logProbability(parents, none, fixed, mean)), 1e-12);
                    checked++;
                }
            }
        }
        assertEquals(144, checked);
    }

    /**
     * Four binary variables, v3 &lt;- {v0, v1, v2}, v2 &lt;- {v0, v1}, v1 &lt;- v0: P(v3 | do(v0)) leaves v1 and v2
     * hidden, both in the factors of v2 and v3, so elimination must build a table over both (4 entries,
     * by hand). Under a limit of 2 it is refused before any number is computed, naming the table's size and
     * what to change (word for word); under 4 it answers.
     */
    @Test
    void aDagWhoseEliminationIsTooWideIsRefusedWithItsWidth() {
        Network chain = RandomNetwork.generate("v", 4, 2, 1, 1, 1.0, 0.1, 3L);
        int[][] rows = new ForwardSampler(chain).sample(50, 5L);
        ScoreStore store = InMemoryTally.tally(RandomNetwork.variables(chain), rows, 3, FamilyScore.withDefaults());
        int[][] parents = {{}, {0}, {0, 1}, {0, 1, 2}};
        boolean[] cut = {true, false, false, false};
        int[] fixed = {0, H, H, 1};
        DagEffects small = new DagEffects(store, 2, "the table limit");
        UserError e = assertThrows(UserError.class, () -> small.on(parents, "DAG 7 of 9").plan(cut, fixed));
        assertEquals("DAG 7 of 9: summing out the hidden ancestors of the target in a sampled network by elimination would "
                + "build a table of 4 entries (limit 2); observe more of them (evidence on an ancestor), or raise the table limit",
                e.getMessage());
        DagEffects enough = new DagEffects(store, 4, "the table limit");
        assertTrue(enough.logProbability(parents, cut, fixed, Parameters.mean(LocalScores.build(store, ScoringOptions.asStored())))
                < 0);
    }
}
