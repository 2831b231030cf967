package org.edgewise.driver.average.convergence;

/**
 * One quantity estimated from draws (a posterior probability or mean) with its diagnostics: Monte
 * Carlo standard error, split-R̂, bulk and tail effective sample sizes, and whether it varies.
 */
public record Estimate(double mean, double mcse, double rhat, double ess, double essTail, ChainDiagnostics.State state) {
    public static Estimate of(double mean, ChainDiagnostics.Summary s) {
        return new Estimate(mean, s.mcse(), s.rhat(), s.essBulk(), s.essTail(), s.state());
    }
}
