package org.edgewise.job.input;

import java.io.Serializable;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.Iterator;
import java.util.List;
import java.util.NoSuchElementException;
import org.apache.spark.sql.Row;
import org.edgewise.driver.store.Variable;

/**
 * How raw values become state indices: per variable its ordered state labels (a map from label
 * to index) or, for a discretised column, its bin edges; the state of a missing value (when the
 * policy is {@code state}); whether rows with a missing value are dropped.
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
    private final boolean drop;

    /**
     * @param fields       row field of each variable
     * @param variables    the variables (labels; bin edges for discretised ones)
     * @param missingState per variable, the state index of a missing value, or −1
     * @param drop         skip rows with a missing value
     */
    @SuppressWarnings("unchecked")
    public Encoding(int[] fields, List<Variable> variables, int[] missingState, boolean drop) {
        this.fields = fields.clone();
        this.variables = List.copyOf(variables);
        this.missingState = missingState.clone();
        this.drop = drop;
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

    /** Encodes row {@code r} into column slot {@code t}; false when the row is dropped. */
    boolean encode(Row r, byte[][] cols, int t) {
        for (int v = 0; v < fields.length; v++) {
            int f = fields[v];
            String s = r.isNullAt(f) ? null : r.getString(f);
            int state;
            if (s == null || s.isEmpty()) {
                if (drop) {
                    return false;
                }
                state = missingState[v];
            } else if (edges[v] != null) {
                state = bin(edges[v], ColumnStats.parse(s));
            } else {
                state = index[v].get(s);
            }
            cols[v][t] = (byte) state;
        }
        return true;
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

    /** Encodes a partition's rows into blocks of {@link Block#ROWS} rows, lazily. */
    public Iterator<Block> blocks(Iterator<Row> rows) {
        int n = fields.length;
        return new Iterator<>() {
            Block next;

            @Override
            public boolean hasNext() {
                if (next == null && rows.hasNext()) {
                    byte[][] cols = new byte[n][Block.ROWS];
                    int t = 0;
                    while (t < Block.ROWS && rows.hasNext()) {
                        if (encode(rows.next(), cols, t)) {
                            t++;
                        }
                    }
                    if (t > 0) {
                        if (t < Block.ROWS) {
                            for (int v = 0; v < n; v++) {
                                cols[v] = java.util.Arrays.copyOf(cols[v], t);
                            }
                        }
                        next = new Block(t, cols);
                    }
                }
                return next != null;
            }

            @Override
            public Block next() {
                if (!hasNext()) {
                    throw new NoSuchElementException();
                }
                Block b = next;
                next = null;
                return b;
            }
        };
    }

    /** Arity of every variable. */
    public int[] arities() {
        return arity.clone();
    }

    static List<String> names(List<Variable> vs) {
        List<String> out = new ArrayList<>();
        for (Variable v : vs) {
            out.add(v.name());
        }
        return out;
    }
}
