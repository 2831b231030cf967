package org.edgewise.job.input;

import java.util.ArrayList;
import java.util.Collections;
import java.util.Comparator;
import java.util.List;
import org.apache.spark.api.java.JavaRDD;
import org.apache.spark.sql.Encoders;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.Variable;
import org.edgewise.job.TallyOptions;
import org.edgewise.job.TallyOptions.MissingPolicy;

/**
 * The {@link Encoding} derived from {@link TableScan}'s statistics: ordered states per variable
 * (numeric order when every value is a number, otherwise lexicographic), equal-frequency bins for
 * discretised columns (approximate quantiles, relative error {@link TableScan#QUANTILE_ERROR}), and
 * the missing-value state under {@code --missing state}.
 */
final class VariableStates {
    private VariableStates() {
    }

    /** The encoding of the selected columns, once the input has passed {@link InputRefusals#check}. */
    static Encoding encoding(Table table, TallyOptions o, List<String> names, int[] fields, boolean[] binned,
                             JavaRDD<RawBlock> rawBlocks, ColumnStats stats) {
        int n = names.size();
        List<Variable> variables = new ArrayList<>();
        int[] missingState = new int[n];
        for (int v = 0; v < n; v++) {
            List<String> states = new ArrayList<>();
            List<Double> edges = null;
            if (binned[v]) {
                int k = o.discretize().get(names.get(v));
                edges = binEdges(table, rawBlocks, v, k, stats.min(v));
                if (edges.isEmpty()) {
                    throw oneBin(names.get(v), k, stats.min(v), stats.max(v));
                }
                states.addAll(binLabels(edges, stats.min(v), stats.max(v)));
            } else {
                states.addAll(orderStates(stats.distinct(v), stats.numeric(v)));
            }
            missingState[v] = o.missing() == MissingPolicy.AVERAGE ? Block.MISSING : -1;
            if (o.missing() == MissingPolicy.STATE && stats.missing(v) > 0) {
                missingState[v] = states.size();
                states.add(TableScan.MISSING_STATE);
            }
            if (states.size() > 256) {
                throw new UserError("variable '" + names.get(v) + "' has " + states.size() + " states; at most 256 are supported");
            }
            variables.add(new Variable(names.get(v), states, edges));
        }
        return new Encoding(fields, variables, missingState);
    }

    /**
     * A column that {@code --discretize} would leave in one bin: constant, or with at least every
     * cut point's share of its values equal to its smallest (then no cut point lies above it). One
     * state tells nothing about any other variable, so the request is refused rather than obeyed.
     */
    static UserError oneBin(String name, int k, double min, double max) {
        String head = "--discretize " + name + "=" + k + " leaves column '" + name + "' in one bin [" + num(min) + "," + num(max) + "]: ";
        if (min == max) {
            return new UserError(head + "every value is " + num(min) + "; a constant column tells nothing about the others, leave it out (--exclude " + name + ")");
        }
        return new UserError(head + "at least " + (k - 1) + "/" + k + " of its values are " + num(min)
                + ", its smallest, so no cut point lies above it; leave --discretize " + name + " out to keep its values as states");
    }

    /** States in numeric order when every value is a number (ties by text), otherwise lexicographic. */
    static List<String> orderStates(java.util.Set<String> values, boolean numeric) {
        List<String> states = new ArrayList<>(values);
        if (numeric) {
            states.sort(Comparator.comparingDouble(ColumnStats::parse).thenComparing(Comparator.naturalOrder()));
        } else {
            Collections.sort(states);
        }
        return states;
    }

    /**
     * Interior cut points of k equal-frequency bins (approximate quantiles), duplicates and ≤ min removed.
     * A line of a table of counts gives its value once per row it stands for, so the quantiles are
     * taken over exactly the values of the expanded table (this step's cost grows with the sum of
     * the weights, not the number of lines).
     */
    static List<Double> binEdges(Table table, JavaRDD<RawBlock> rawBlocks, int v, int k, double min) {
        double[] probs = new double[k - 1];
        for (int i = 1; i < k; i++) {
            probs[i - 1] = (double) i / k;
        }
        JavaRDD<Double> xs = rawBlocks.flatMap(b -> {
            if (b.weights != null) {
                return repeated(b.values[v], b.weights);
            }
            List<Double> out = new ArrayList<>(b.rows);
            for (int t = 0; t < b.rows; t++) {
                double x = b.values[v][t];
                if (!Double.isNaN(x)) {
                    out.add(x);
                }
            }
            return out.iterator();
        });
        double[] q = table.spark().createDataset(xs.rdd(), Encoders.DOUBLE()).toDF("x")
                .stat().approxQuantile("x", probs, TableScan.QUANTILE_ERROR);
        List<Double> edges = new ArrayList<>();
        for (double e : q) {
            if (e > min && (edges.isEmpty() || e > edges.get(edges.size() - 1))) {
                edges.add(e);
            }
        }
        return edges;
    }

    /** Each non-missing x[t], w[t] times, lazily (a weight may be far larger than memory). */
    private static java.util.Iterator<Double> repeated(double[] x, long[] w) {
        return new java.util.Iterator<>() {
            int t = -1;
            long left;

            @Override
            public boolean hasNext() {
                while (left == 0 && t + 1 < x.length) {
                    t++;
                    left = Double.isNaN(x[t]) ? 0 : w[t];
                }
                return left > 0;
            }

            @Override
            public Double next() {
                if (!hasNext()) {
                    throw new java.util.NoSuchElementException();
                }
                left--;
                return x[t];
            }
        };
    }

    /** Labels [lo,hi) of the bins, the last closed at the maximum: [min,e1), [e1,e2), …, [e_m,max]. */
    static List<String> binLabels(List<Double> edges, double min, double max) {
        List<String> out = new ArrayList<>();
        double lo = min;
        for (double e : edges) {
            out.add("[" + num(lo) + "," + num(e) + ")");
            lo = e;
        }
        out.add("[" + num(lo) + "," + num(max) + "]");
        return out;
    }

    static String num(double x) {
        if (x == Math.rint(x) && Math.abs(x) < 1e15) {
            return Long.toString((long) x);
        }
        return Double.toString(x);
    }
}
