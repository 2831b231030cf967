package org.edgewise.driver.effect;

import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;

/**
 * Raw conditional frequencies from the store's counts, no model: n(y = b, x = a, w = e) / n(x = a,
 * w = e). The store holds the counts of every family it scored, not the table; the frequency is
 * read from any stored family whose variables (child and parents) include those of the target, the
 * intervention and the evidence, by summing out the others — exact, since each family's counts
 * are the table's margin over its variables. When no stored family contains them all (a small
 * maximum number of parents), the frequency is not available from the store.
 *
 * <p>Rows with a missing value in a family's variables are not in its counts, so the frequency is
 * over the rows complete on the family that served it. Memory: none beyond the store.
 */
public final class ObservedCounts {
    /**
     * Counts of one conditioning event.
     *
     * @param events rows with the target and the condition
     * @param rows   rows with the condition
     * @param family the stored family the counts come from, e.g. {@code "status <- alcohol"}
     */
    public record Count(long events, long rows, String family) {
        /** events / rows; NaN when no row has the condition. */
        public double frequency() {
            return rows == 0 ? Double.NaN : events / (double) rows;
        }
    }

    private ObservedCounts() {
    }

    /**
     * The counts of {@code target} among the rows with {@code condition} (both state vectors over the
     * store's variables, {@link CaseParser#HIDDEN} where left out), or null when no stored family
     * contains their variables. Prefers the smallest such family (the fewest rows dropped for
     * missing values elsewhere), then one whose child is in the target (it reads as y &lt;- x).
     */
    public static Count of(ScoreStore store, int[] target, int[] condition) {
        int n = store.variableCount();
        int needed = 0;
        for (int v = 0; v < n; v++) {
            if (target[v] != CaseParser.HIDDEN || condition[v] != CaseParser.HIDDEN) {
                needed++;
            }
        }
        FamilyCounts best = null;
        for (FamilyCounts fc : store.families()) {
            // the family holds every needed variable (any number of variables: counted, not a one-word mask)
            int held = target[fc.child()] != CaseParser.HIDDEN || condition[fc.child()] != CaseParser.HIDDEN ? 1 : 0;
            for (int p : fc.parents()) {
                held += target[p] != CaseParser.HIDDEN || condition[p] != CaseParser.HIDDEN ? 1 : 0;
            }
            boolean better = best == null || fc.parents().length < best.parents().length
                    || fc.parents().length == best.parents().length && target[fc.child()] != CaseParser.HIDDEN
                    && target[best.child()] == CaseParser.HIDDEN;
            if (held == needed && better) {
                best = fc;
            }
        }
        if (best == null) {
            return null;
        }
        int r = store.arity(best.child());
        int[] par = best.parents();
        int[] state = new int[par.length];
        long events = 0;
        long rows = 0;
        for (int m = 0; m < best.rows(); m++) {
            long j = best.configs()[m];
            for (int i = par.length - 1; i >= 0; i--) {
                int a = store.arity(par[i]);
                state[i] = (int) (j % a);
                j /= a;
            }
            boolean condOk = true;
            boolean targetOk = true;
            for (int i = 0; i < par.length; i++) {
                condOk &= condition[par[i]] == CaseParser.HIDDEN || condition[par[i]] == state[i];
                targetOk &= target[par[i]] == CaseParser.HIDDEN || target[par[i]] == state[i];
            }
            if (!condOk) {
                continue;
            }
            int c = best.child();
            for (int k = 0; k < r; k++) {
                if (condition[c] != CaseParser.HIDDEN && condition[c] != k) {
                    continue;
                }
                long nijk = best.counts()[m * r + k];
                rows += nijk;
                if (targetOk && (target[c] == CaseParser.HIDDEN || target[c] == k)) {
                    events += nijk;
                }
            }
        }
        StringBuilder name = new StringBuilder(store.variables().get(best.child()).name());
        if (par.length > 0) {
            name.append(" <- ");
            for (int i = 0; i < par.length; i++) {
                name.append(i == 0 ? "" : ",").append(store.variables().get(par[i]).name());
            }
        }
        return new Count(events, rows, name.toString());
    }
}
