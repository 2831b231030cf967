package org.edgewise.driver.average;

/** The subset transforms of {@link ExactOrderSum}, opened for the benchmark only. */
public final class ZetaAccess {
    private ZetaAccess() {
    }

    public static void full(double[] a, int bits) {
        ExactOrderSum.supersetZeta(a, bits);
    }

    public static void upTo(double[] a, int bits, int d) {
        ExactOrderSum.supersetZetaUpTo(a, bits, d);
    }
}
