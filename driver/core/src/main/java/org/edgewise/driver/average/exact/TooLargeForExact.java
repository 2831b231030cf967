package org.edgewise.driver.average.exact;



/**
 * The exact sum over orders does not fit this JVM: it carries the numbers (the estimate with the
 * bytes needed and the largest n that fits, and the heap) so a front end can say how to get
 * more memory or which other method to use, in its own words.
 */
public final class TooLargeForExact extends org.edgewise.driver.WordedError {
    private final ExactOrderSum.Estimate estimate;
    private final long heapBytes;

    public TooLargeForExact(ExactOrderSum.Estimate estimate, long heapBytes) {
        super(estimate + " (heap " + (heapBytes >> 20) + " MiB; give the JVM more heap, or average over sampled orders)");
        this.estimate = estimate;
        this.heapBytes = heapBytes;
    }

    @Override
    public String worded(org.edgewise.driver.InputNames names, String heapSetting) {
        return estimate + " (heap " + (heapBytes >> 20) + " MiB; raise it with " + heapSetting + ", or use " + names.methodMcmc() + ")";
    }

    /** The estimate: variables, bytes needed, seconds, largest n this JVM allows. */
    public ExactOrderSum.Estimate estimate() {
        return estimate;
    }

    /** The JVM's maximum heap in bytes. */
    public long heapBytes() {
        return heapBytes;
    }
}
