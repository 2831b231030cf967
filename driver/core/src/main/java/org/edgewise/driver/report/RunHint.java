package org.edgewise.driver.report;

/**
 * How a reader of an unconverged sampled result runs it differently, in the words of the front end
 * that made it: the convergence advice ({@link ConvergenceAdvice}) names these settings. The CLI
 * passes its options; {@link #API} names the Java API's settings.
 *
 * @param maxTime        the time budget of a run until converged
 * @param maxSteps       the cap on steps per chain
 * @param steps          the steps per chain of a fixed run
 * @param untilConverged how to run until converged instead of a fixed number of steps
 * @param mcseTarget     the MCSE target of the reported posteriors
 * @param chains         the number of chains
 * @param exact          the exact method
 */
public record RunHint(String maxTime, String maxSteps, String steps, String untilConverged, String mcseTarget,
                      String chains, String exact) {
    /** The Java API: the fields of {@code UnknownOrderSettings}. */
    public static final RunHint API = new RunHint("maxSeconds", "maxSteps", "steps", "steps = null", "mcseTarget", "chains",
            "method EXACT");
}
