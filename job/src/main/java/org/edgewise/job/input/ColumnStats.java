package org.edgewise.job.input;

import java.io.Serializable;
import java.util.Arrays;
import java.util.HashMap;
import java.util.Map;
import java.util.Set;
import java.util.LinkedHashSet;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.catalyst.InternalRow;
import org.apache.spark.unsafe.types.UTF8String;

/**
 * What the one pass over the rows learns about the selected columns, for one block of rows or
 * (merged) for the whole table: the distinct values of each column with a block-local code (at
 * most {@code cap} kept — beyond that only "too many" is known), missing counts, for discretised
 * columns whether every value is a number and the range, and the numbers of rows read, malformed
 * rows and rows dropped for missing values.
 *
 * <p>Memory: at most {@code cap} strings per column plus a few primitives — independent of the
 * number of rows.
 */
public final class ColumnStats implements Serializable {
    private static final long serialVersionUID = 2L;
    /** Block-local code of a missing value. */
    static final int MISSING_CODE = 255;

    final int[] fields;
    final boolean[] binned;
    final int cap;
    final boolean dropMissing;
    final int corruptField;
    /** Field of the weight column of a table of counts, or −1 (one row per line). */
    final int weightField;
    /** value → block-local code (UTF-8 bytes as Spark holds them: no String decoding per row). */
    final HashMap<UTF8String, Integer>[] codes;
    final boolean[] overflow;
    final long[] missing;
    /** binned columns: every value so far a number; other columns: only meaningful after overflow. */
    final boolean[] numeric;
    final double[] min;
    final double[] max;
    /** Rows read: with a weight column, the sum of the weights (malformed lines count one). */
    long rows;
    long malformed;
    /** Rows dropped for missing values (with a weight column, the sum of their weights). */
    long dropped;
    /** Lines whose weight is bad (blank, negative, a fraction, not a number, too large). */
    long badWeights;
    /** Lines of weight 0: read as if they were not there. */
    long zeroWeights;
    /** The weights add up to more than {@link Long#MAX_VALUE}. */
    boolean weightOverflow;

    /**
     * @param fields       row field index of each selected column
     * @param binned       whether each selected column is to be discretised (values kept as numbers)
     * @param cap          distinct values kept per column (at most 255)
     * @param dropMissing  rows with a missing selected value are dropped (and not counted in the states)
     * @param corruptField field holding the malformed-row text, or −1
     */
    public ColumnStats(int[] fields, boolean[] binned, int cap, boolean dropMissing, int corruptField) {
        this(fields, binned, cap, dropMissing, corruptField, -1);
    }

    /** As above, for a table of counts whose weight column is row field {@code weightField} (−1: none). */
    @SuppressWarnings("unchecked")
    public ColumnStats(int[] fields, boolean[] binned, int cap, boolean dropMissing, int corruptField, int weightField) {
        int n = fields.length;
        this.weightField = weightField;
        this.fields = fields.clone();
        this.binned = binned.clone();
        this.cap = cap;
        this.dropMissing = dropMissing;
        this.corruptField = corruptField;
        this.codes = new HashMap[n];
        for (int i = 0; i < n; i++) {
            codes[i] = new HashMap<>();
        }
        this.overflow = new boolean[n];
        this.missing = new long[n];
        this.numeric = new boolean[n];
        Arrays.fill(numeric, true);
        this.min = new double[n];
        this.max = new double[n];
        Arrays.fill(min, Double.POSITIVE_INFINITY);
        Arrays.fill(max, Double.NEGATIVE_INFINITY);
    }

    /** A fresh, empty instance with the same settings. */
    ColumnStats empty() {
        return new ColumnStats(fields, binned, cap, dropMissing, corruptField, weightField);
    }

    /**
     * Adds one row and writes its block-local codes (categorical columns, {@link #MISSING_CODE} for
     * missing) or values (discretised columns, NaN for missing or not a number) into slot t.
     *
     * With a weight column the row stands for w rows: it adds w to the rows, dropped and missing
     * counts (saturating: {@link #weightOverflow} records a sum past {@link Long#MAX_VALUE}) and its
     * weight into {@code weights[t]}; a line of weight 0 is skipped as if it were not there (its
     * values make no state), a line with a bad weight is skipped and counted for the refusal.
     *
     * @return false when the row is malformed, dropped, of weight 0 or of a bad weight (slot t not used)
     */
    boolean add(InternalRow r, byte[][] out, double[][] values, long[] weights, int t) {
        if (corruptField >= 0 && !r.isNullAt(corruptField)) {
            rows++;
            malformed++;
            return false;
        }
        long w = 1;
        if (weightField >= 0) {
            w = Weights.parse(r, weightField);
            if (w == Weights.BAD) {
                badWeights++;
                return false;
            }
            if (w == 0) {
                zeroWeights++;
                return false;
            }
            weights[t] = w;
        }
        rows = plus(rows, w);
        int n = fields.length;
        if (dropMissing) {
            for (int i = 0; i < n; i++) {
                if (isMissing(r, fields[i])) {
                    dropped = plus(dropped, w);
                    return false;
                }
            }
        }
        for (int i = 0; i < n; i++) {
            UTF8String v = r.isNullAt(fields[i]) ? null : trim(r.getUTF8String(fields[i]));
            if (v == null || v.numBytes() == 0) {
                missing[i] = plus(missing[i], w);
                if (binned[i]) {
                    values[i][t] = Double.NaN;
                } else {
                    out[i][t] = (byte) MISSING_CODE;
                }
                continue;
            }
            if (binned[i]) {
                double x = parse(v.toString());
                values[i][t] = x;
                if (Double.isNaN(x)) {
                    numeric[i] = false;
                } else {
                    min[i] = Math.min(min[i], x);
                    max[i] = Math.max(max[i], x);
                }
            } else if (!overflow[i]) {
                Integer c = codes[i].get(v);
                if (c == null) {
                    if (codes[i].size() >= cap) {
                        setOverflow(i);
                        continue;
                    }
                    c = codes[i].size();
                    // the row's bytes are reused by the reader: keep a copy as the key
                    codes[i].put(v.clone(), c);
                }
                out[i][t] = (byte) (int) c;
            } else if (numeric[i] && Double.isNaN(parse(v.toString()))) {
                numeric[i] = false;
            }
        }
        return true;
    }

    /** a + b for non-negative counts, saturating at {@link Long#MAX_VALUE} (and noting it). */
    private long plus(long a, long b) {
        if (a > Long.MAX_VALUE - b) {
            weightOverflow = true;
            return Long.MAX_VALUE;
        }
        return a + b;
    }

    private void setOverflow(int i) {
        overflow[i] = true;
        numeric[i] = allNumeric(codes[i].keySet());
        codes[i].clear();
    }

    static boolean allNumeric(Set<UTF8String> values) {
        for (UTF8String s : values) {
            if (Double.isNaN(parse(s.toString()))) {
                return false;
            }
        }
        return true;
    }

    static boolean isMissing(Row r, int field) {
        return r.isNullAt(field) || r.getString(field).trim().isEmpty();
    }

    static boolean isMissing(InternalRow r, int field) {
        return r.isNullAt(field) || trim(r.getUTF8String(field)).numBytes() == 0;
    }

    /**
     * The one whitespace rule, the same as the driver's ({@link String#trim}): characters up to
     * U+0020 (space, tab, CR …) at either end are not part of a value. UTF-8 bytes of other
     * characters are never in 0x00–0x20, so trimming bytes is trimming characters.
     */
    static UTF8String trim(UTF8String v) {
        int n = v.numBytes();
        int from = 0;
        int to = n;
        while (from < to && isBlank(byteAt(v, from))) {
            from++;
        }
        while (to > from && isBlank(byteAt(v, to - 1))) {
            to--;
        }
        return from == 0 && to == n ? v : UTF8String.fromBytes(v.getBytes(), from, to - from);
    }

    private static byte byteAt(UTF8String v, int i) {
        return org.apache.spark.unsafe.Platform.getByte(v.getBaseObject(), v.getBaseOffset() + i);
    }

    private static boolean isBlank(byte b) {
        return b >= 0 && b <= 0x20;
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

    /** Merges {@code o} into this (codes are renumbered: only the distinct values matter) and returns this. */
    public ColumnStats merge(ColumnStats o) {
        rows = plus(rows, o.rows);
        malformed += o.malformed;
        dropped = plus(dropped, o.dropped);
        badWeights += o.badWeights;
        zeroWeights += o.zeroWeights;
        weightOverflow |= o.weightOverflow;
        for (int i = 0; i < fields.length; i++) {
            missing[i] = plus(missing[i], o.missing[i]);
            min[i] = Math.min(min[i], o.min[i]);
            max[i] = Math.max(max[i], o.max[i]);
            if (binned[i]) {
                numeric[i] &= o.numeric[i];
                continue;
            }
            boolean otherNumeric = o.overflow[i] ? o.numeric[i] : allNumeric(o.codes[i].keySet());
            if (!overflow[i]) {
                if (o.overflow[i]) {
                    setOverflow(i);
                } else {
                    for (UTF8String s : o.codes[i].keySet()) {
                        if (!codes[i].containsKey(s)) {
                            if (codes[i].size() >= cap) {
                                setOverflow(i);
                                break;
                            }
                            codes[i].put(s, codes[i].size());
                        }
                    }
                }
            }
            if (overflow[i]) {
                numeric[i] &= otherNumeric;
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

    /** Lines with a bad weight (table of counts). */
    public long badWeights() {
        return badWeights;
    }

    /** Lines of weight 0 (table of counts). */
    public long zeroWeights() {
        return zeroWeights;
    }

    /** True when the weights add up to more than {@link Long#MAX_VALUE} rows. */
    public boolean weightOverflow() {
        return weightOverflow;
    }

    public long missing(int i) {
        return missing[i];
    }

    public boolean overflow(int i) {
        return overflow[i];
    }

    /** Distinct values of a categorical column (empty after overflow). */
    public Set<String> distinct(int i) {
        Set<String> out = new LinkedHashSet<>();
        for (UTF8String s : codes[i].keySet()) {
            out.add(s.toString());
        }
        return out;
    }

    /** Block-local codes of a categorical column's values. */
    Map<UTF8String, Integer> codes(int i) {
        return codes[i];
    }

    /** True when every non-missing value of column i is a finite number (and there is at least one). */
    public boolean numeric(int i) {
        if (binned[i]) {
            return numeric[i] && min[i] <= max[i];
        }
        if (overflow[i]) {
            return numeric[i];
        }
        return !codes[i].isEmpty() && allNumeric(codes[i].keySet());
    }

    public double min(int i) {
        return min[i];
    }

    public double max(int i) {
        return max[i];
    }
}
