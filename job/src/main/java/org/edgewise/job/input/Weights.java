package org.edgewise.job.input;

import java.math.BigDecimal;
import org.apache.spark.sql.catalyst.InternalRow;
import org.apache.spark.unsafe.Platform;
import org.apache.spark.unsafe.types.UTF8String;

/**
 * The weight column of a table of counts ({@code --weight COL}): each line stands for that many
 * rows. A weight is a whole number from 0 to {@link Long#MAX_VALUE}, written as digits ({@code 12})
 * or as a number whose fraction is zero ({@code 12.0}, {@code 1.2E3} — how Spark writes a
 * floating-point Parquet column as text). Anything else (blank, negative, a fraction, not a number,
 * too large) is a bad weight, refused in {@link InputRefusals} with its line.
 *
 * <p>The hot path reads plain digits straight from the UTF-8 bytes (no String, no boxing); only
 * other spellings go through {@link BigDecimal}.
 */
final class Weights {
    /** What {@link #parse} returns for a bad weight. */
    static final long BAD = -1;

    private Weights() {
    }

    /** The weight in field {@code field} of {@code r}, or {@link #BAD}. */
    static long parse(InternalRow r, int field) {
        if (r.isNullAt(field)) {
            return BAD;
        }
        UTF8String v = ColumnStats.trim(r.getUTF8String(field));
        int n = v.numBytes();
        if (n == 0) {
            return BAD;
        }
        Object base = v.getBaseObject();
        long offset = v.getBaseOffset();
        long x = 0;
        for (int i = 0; i < n; i++) {
            int d = Platform.getByte(base, offset + i) - '0';
            if (d < 0 || d > 9) {
                return slow(v.toString());
            }
            if (x > (Long.MAX_VALUE - d) / 10) {
                return BAD;
            }
            x = x * 10 + d;
        }
        return x;
    }

    private static long slow(String s) {
        try {
            BigDecimal x = new BigDecimal(s);
            if (x.signum() < 0) {
                return BAD;
            }
            return x.signum() == 0 ? 0 : x.longValueExact();
        } catch (NumberFormatException | ArithmeticException e) {
            return BAD;
        }
    }

    /** True when {@code text} is a good weight of 0 (a line that stands for no row). */
    static boolean isZero(String text) {
        return problem(text) == null && new BigDecimal(text.trim()).signum() == 0;
    }

    /**
     * Why a weight's text is bad, for the refusal ({@code missing weight}, {@code '2.5' is not a whole
     * number} …), or null when it is a good weight.
     */
    static String problem(String text) {
        String s = text == null ? "" : text.trim();
        if (s.isEmpty()) {
            return "missing weight";
        }
        BigDecimal x;
        try {
            x = new BigDecimal(s);
        } catch (NumberFormatException e) {
            return "'" + s + "' is not a whole number";
        }
        if (x.signum() < 0) {
            return "'" + s + "' is negative";
        }
        if (x.signum() == 0) {
            return null;
        }
        if (x.precision() - x.scale() <= 19 && x.stripTrailingZeros().scale() > 0) {
            return "'" + s + "' is not a whole number";
        }
        return x.compareTo(BigDecimal.valueOf(Long.MAX_VALUE)) > 0 ? "'" + s + "' is more than " + Long.MAX_VALUE : null;
    }
}
