package org.edgewise.job.input;

import java.io.Serializable;
import java.util.HashMap;
import java.util.List;
import org.edgewise.driver.store.Variable;

/**
 * How raw values become state indices: per variable its ordered state labels (a map from label
 * to index) or, for a discretised column, its bin edges; the state of a missing value (when the
 * policy is {@code state}). Rows dropped for missing values never reach it.
 */
public final class Encoding implements Serializable {
    private static final long serialVersionUID = 1L;

    private final int[] fields;
    /** Driver-side only (Variable is not serialisable); executors need only the arrays below. */
    private final transient List<Variable> variables;
    private final int[] arity;
    private final HashMap<String, Integer>[] index;
    private final double[][] edges;
    private final int[] missingState;

    /**
     * @param fields       row field of each variable
     * @param variables    the variables (labels; bin edges for discretised ones)
     * @param missingState per variable, the state index of a missing value, or −1
     */
    @SuppressWarnings("unchecked")
    public Encoding(int[] fields, List<Variable> variables, int[] missingState) {
        this.fields = fields.clone();
        this.variables = List.copyOf(variables);
        this.missingState = missingState.clone();
        int n = fields.length;
        this.arity = new int[n];
        for (int v = 0; v < n; v++) {
            arity[v] = variables.get(v).arity();
        }
        this.index = new HashMap[n];
        this.edges = new double[n][];
        for (int v = 0; v < n; v++) {
            Variable var = variables.get(v);
            if (var.binEdges() != null) {
                edges[v] = var.binEdges().stream().mapToDouble(Double::doubleValue).toArray();
            } else {
                index[v] = new HashMap<>();
                for (int s = 0; s < var.arity(); s++) {
                    if (s != missingState[v]) {
                        index[v].put(var.states().get(s), s);
                    }
                }
            }
        }
    }

    public List<Variable> variables() {
        return variables;
    }

    /**
     * Turns a raw block (block-local codes, raw numbers) into a block of global state indices:
     * a 256-entry table per categorical column maps local codes to states; discretised values are
     * binned. Missing values get the missing state (rows dropped for missing values never got here).
     */
    public Block encode(RawBlock raw) {
        int n = fields.length;
        int rows = raw.rows;
        byte[][] cols = new byte[n][rows];
        int[] table = new int[256];
        for (int v = 0; v < n; v++) {
            byte[] out = cols[v];
            if (edges[v] != null) {
                double[] x = raw.values[v];
                for (int t = 0; t < rows; t++) {
                    out[t] = (byte) (Double.isNaN(x[t]) ? missingState[v] : bin(edges[v], x[t]));
                }
            } else {
                java.util.Arrays.fill(table, -1);
                for (var e : raw.stats.codes(v).entrySet()) {
                    table[e.getValue()] = index[v].get(e.getKey().toString());
                }
                table[ColumnStats.MISSING_CODE] = missingState[v];
                byte[] in = raw.codes[v];
                for (int t = 0; t < rows; t++) {
                    int s = table[in[t] & 0xFF];
                    if (s < 0) {
                        throw new IllegalStateException("value without a state in column " + v);
                    }
                    out[t] = (byte) s;
                }
            }
        }
        return new Block(rows, cols, raw.weights);
    }

    /** Number of edges ≤ x: bin k is [e_{k−1}, e_k). */
    static int bin(double[] e, double x) {
        int lo = 0;
        int hi = e.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (e[mid] <= x) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    /** Arity of every variable. */
    public int[] arities() {
        return arity.clone();
    }
}
