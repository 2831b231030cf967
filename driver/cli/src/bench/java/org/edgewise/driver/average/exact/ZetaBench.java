package org.edgewise.driver.average.exact;
import org.edgewise.driver.average.exact.ExactOrderSum;

/**
 * The subset transforms of {@link ExactOrderSum} for {@code UnknownOrderBench}: in the core's
 * package but in the benchmark source set, so the shipped jar keeps them package-private.
 */
public final class ZetaBench {
    private ZetaBench() {
    }

    public static void full(double[] a, int bits) {
        ExactOrderSum.supersetZeta(a, bits);
    }

    public static void upTo(double[] a, int bits, int d) {
        ExactOrderSum.supersetZetaUpTo(a, bits, d);
    }
}
