package org.edgewise.driver.effect;

import java.util.Arrays;
import java.util.BitSet;
import java.util.HashMap;
import java.util.Locale;
import java.util.Map;
import org.edgewise.driver.UserError;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.query.DagInference;
import org.edgewise.driver.store.ScoreStore;

/**
 * Interventional probabilities under one DAG G with parameters θ, by the truncated
 * factorisation (Spirtes, Glymour &amp; Scheines 1993; Pearl 2000, eq. 3.10):
 * <pre>
 *   P(v | do(x = a), G, θ) = Π_{i ∉ X} θ_i(v_i | v_{U_i})   for v consistent with x = a, else 0,
 * </pre>
 * summed over the states of the hidden variables. That is inference on the mutilated graph G_x̄ (the
 * intervened variables' incoming edges cut, their factors the constant 1): only the ancestors of the
 * fixed cells in G_x̄ are relevant, the rest sum out to 1. The sum is exact variable elimination in log
 * space ({@link DagInference}), so its cost follows the width of G_x̄ on that ancestral set, not the
 * number of hidden variables. Each DAG's plans (the ancestral set and elimination order per pattern of
 * fixed cells) are made once ({@link OnDag#plan}) and refused above a limit on the largest table
 * before any numeric work.
 *
 * <p>Also: whether G has a directed path from an intervened variable to the target.
 *
 * <p>Memory: per DAG one plan per pattern of fixed cells asked (a few ints per variable of the
 * ancestral set) and the store family of each variable; per evaluation the tables of
 * {@link DagInference} (at most the limit's entries × 8 bytes each).
 */
final class DagEffects {
    private final int n;
    private final int[] arity;
    private final long maxTable;
    /** How the caller names the table limit in messages. */
    private final String maxHiddenName;

    DagEffects(ScoreStore store, long maxTable, String maxHiddenName) {
        this.n = store.variableCount();
        this.arity = new int[n];
        for (int v = 0; v < n; v++) {
            arity[v] = store.arity(v);
        }
        this.maxTable = maxTable;
        this.maxHiddenName = maxHiddenName;
    }

    /** One DAG, with its plans; {@code where} names it in a refusal (e.g. "DAG 3 of 2000"), or "". */
    OnDag on(int[][] parents, String where) {
        return new OnDag(parents, where);
    }

    /**
     * log P(cells fixed in {@code states} | do(intervened), G, θ), with {@code states} fixing the
     * intervened variables too; −∞ when it is 0.
     */
    double logProbability(int[][] parents, boolean[] intervened, int[] states, Parameters theta) {
        return on(parents, "").logProbability(intervened, states, theta);
    }

    /** A DAG and the plans made on it, keyed by the intervened variables and the pattern of fixed cells. */
    final class OnDag {
        private final int[][] parents;
        private final String where;
        private final Map<BitSet, DagInference.Plan> plans = new HashMap<>();
        private final int[] family;

        private OnDag(int[][] parents, String where) {
            this.parents = parents;
            this.where = where;
            this.family = new int[n];
            Arrays.fill(family, -1);
        }

        /**
         * The elimination plan for a case of this pattern on the mutilated DAG; a {@link UserError}
         * naming the largest table (the width) when it exceeds the limit.
         */
        DagInference.Plan plan(boolean[] intervened, int[] states) {
            BitSet key = new BitSet(2 * n);
            for (int v = 0; v < n; v++) {
                if (intervened[v]) {
                    key.set(v);
                }
                if (states[v] != CaseParser.HIDDEN) {
                    key.set(n + v);
                }
            }
            DagInference.Plan p = plans.get(key);
            if (p == null) {
                p = DagInference.plan(mutilated(intervened), arity, states);
                if (p.largest() > maxTable) {
                    throw new UserError(String.format(Locale.ROOT, "%ssumming out the hidden ancestors of the target in a "
                            + "sampled network by elimination would build a table of %.0f entries (limit %d); observe more "
                            + "of them (evidence on an ancestor), or raise %s", where.isEmpty() ? "" : where + ": ",
                            p.largest(), maxTable, maxHiddenName));
                }
                plans.put(key, p);
            }
            return p;
        }

        /** As {@link DagEffects#logProbability}, on this DAG. */
        double logProbability(boolean[] intervened, int[] states, Parameters theta) {
            DagInference.Plan p = plan(intervened, states);
            for (int v : p.factors()) {
                if (!intervened[v] && family[v] < 0) {
                    family[v] = theta.family(v, parents[v]);
                }
            }
            return DagInference.logProbability(p, mutilated(intervened), arity, states,
                    (v, j, k) -> intervened[v] ? 0.0 : Math.log(theta.theta(family[v], j, k)));
        }

        /** The parents in G_x̄: none for an intervened variable. */
        private int[][] mutilated(boolean[] intervened) {
            int[][] m = parents.clone();
            for (int v = 0; v < n; v++) {
                if (intervened[v]) {
                    m[v] = NONE;
                }
            }
            return m;
        }
    }

    private static final int[] NONE = new int[0];

    /** Whether some directed path in G leads from a variable of {@code from} to a variable of {@code to}. */
    static boolean hasPath(int[][] parents, int[] from, int[] to) {
        int n = parents.length;
        boolean[] reach = new boolean[n];
        for (int v : from) {
            reach[v] = true;
        }
        boolean progress = true;
        while (progress) {
            progress = false;
            for (int v = 0; v < n; v++) {
                if (reach[v]) {
                    continue;
                }
                for (int p : parents[v]) {
                    if (reach[p]) {
                        reach[v] = true;
                        progress = true;
                        break;
                    }
                }
            }
        }
        for (int v : to) {
            if (reach[v]) {
                return true;
            }
        }
        return false;
    }
}
