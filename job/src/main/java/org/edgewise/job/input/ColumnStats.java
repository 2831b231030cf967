package org.edgewise.job.input;

import java.io.Serializable;
import java.util.HashSet;
import java.util.Iterator;
import java.util.Set;
import org.apache.spark.sql.Row;

/**
 * What one pass over the rows learns about the selected columns: distinct values (at most
 * {@code cap} kept per column — beyond that only "too many" is known), missing counts, whether
 * every value parses as a number (and the range), and the number of rows, malformed rows and rows
 * dropped for missing values. One instance per partition, merged on the driver.
 *
 * <p>Memory: at most {@code cap} strings per column plus a few primitives — independent of the
 * number of rows.
 */
public final class ColumnStats implements Serializable {
    private static final long serialVersionUID = 1L;

    final int[] fields;
    final boolean[] binned;
    final int cap;
    final boolean dropMissing;
    final int corruptField;
    final HashSet<String>[] distinct;
    final boolean[] overflow;
    final long[] missing;
    final boolean[] numeric;
    final double[] min;
    final double[] max;
    long rows;
    long malformed;
    long dropped;

    /**
     * @param fields       row field index of each selected column
     * @param binned       whether each selected column is to be discretised (distinct values not kept)
     * @param cap          distinct values kept per column
     * @param dropMissing  rows with a missing selected value are dropped (and not counted in the states)
     * @param corruptField field holding the malformed-row text, or −1
     */
    @SuppressWarnings("unchecked")
    public ColumnStats(int[] fields, boolean[] binned, int cap, boolean dropMissing, int corruptField) {
        int n = fields.length;
        this.fields = fields.clone();
        this.binned = binned.clone();
        this.cap = cap;
        this.dropMissing = dropMissing;
        this.corruptField = corruptField;
        this.distinct = new HashSet[n];
        for (int i = 0; i < n; i++) {
            distinct[i] = new HashSet<>();
        }
        this.overflow = new boolean[n];
        this.missing = new long[n];
        this.numeric = new boolean[n];
        java.util.Arrays.fill(numeric, true);
        this.min = new double[n];
        this.max = new double[n];
        java.util.Arrays.fill(min, Double.POSITIVE_INFINITY);
        java.util.Arrays.fill(max, Double.NEGATIVE_INFINITY);
    }

    /** Adds every row of a partition and returns {@code this}. */
    public ColumnStats addAll(Iterator<Row> it) {
        while (it.hasNext()) {
            add(it.next());
        }
        return this;
    }

    void add(Row r) {
        rows++;
        if (corruptField >= 0 && !r.isNullAt(corruptField)) {
            malformed++;
            return;
        }
        int n = fields.length;
        if (dropMissing) {
            for (int i = 0; i < n; i++) {
                if (isMissing(r, fields[i])) {
                    dropped++;
                    return;
                }
            }
        }
        for (int i = 0; i < n; i++) {
            String v = r.isNullAt(fields[i]) ? null : r.getString(fields[i]);
            if (v == null || v.isEmpty()) {
                missing[i]++;
                continue;
            }
            if (numeric[i]) {
                double x = parse(v);
                if (Double.isNaN(x)) {
                    numeric[i] = false;
                } else {
                    min[i] = Math.min(min[i], x);
                    max[i] = Math.max(max[i], x);
                }
            }
            if (!binned[i] && !overflow[i]) {
                distinct[i].add(v);
                if (distinct[i].size() > cap) {
                    overflow[i] = true;
                    distinct[i].clear();
                }
            }
        }
    }

    static boolean isMissing(Row r, int field) {
        return r.isNullAt(field) || r.getString(field).isEmpty();
    }

    /** The value as a finite number, or NaN when it is not one. */
    public static double parse(String v) {
        char c = v.charAt(0);
        if (!(c >= '0' && c <= '9') && c != '-' && c != '+' && c != '.') {
            return Double.NaN;
        }
        try {
            double x = Double.parseDouble(v.trim());
            return Double.isFinite(x) ? x : Double.NaN;
        } catch (NumberFormatException e) {
            return Double.NaN;
        }
    }

    /** Merges {@code o} into this and returns this. */
    public ColumnStats merge(ColumnStats o) {
        rows += o.rows;
        malformed += o.malformed;
        dropped += o.dropped;
        for (int i = 0; i < fields.length; i++) {
            missing[i] += o.missing[i];
            numeric[i] &= o.numeric[i];
            min[i] = Math.min(min[i], o.min[i]);
            max[i] = Math.max(max[i], o.max[i]);
            if (!overflow[i]) {
                if (o.overflow[i]) {
                    overflow[i] = true;
                    distinct[i].clear();
                } else {
                    distinct[i].addAll(o.distinct[i]);
                    if (distinct[i].size() > cap) {
                        overflow[i] = true;
                        distinct[i].clear();
                    }
                }
            }
        }
        return this;
    }

    public long rows() {
        return rows;
    }

    public long malformed() {
        return malformed;
    }

    public long dropped() {
        return dropped;
    }

    public long missing(int i) {
        return missing[i];
    }

    public boolean overflow(int i) {
        return overflow[i];
    }

    public Set<String> distinct(int i) {
        return distinct[i];
    }

    /** True when every non-missing value of column i is a finite number (and there is at least one). */
    public boolean numeric(int i) {
        return numeric[i] && min[i] <= max[i];
    }

    public double min(int i) {
        return min[i];
    }

    public double max(int i) {
        return max[i];
    }
}
