package org.edgewise.driver.posterior;

import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.UnknownOrderSettings;

/** What the two exact sums (over orders, over DAGs) report alike: exact edges, parent sets and log evidence, computed once. */
abstract sealed class ExactSum extends UnknownOrders permits ExactOrders, ExactDags {
    /** An exact sum's figures: P(a → b | D) per pair, each child's parent-set posteriors, log evidence. */
    record Figures(double[][] edgePosterior, double[][] setPosterior, double logEvidence) {
    }

    private Figures figures;

    ExactSum(LocalScores ls, UnknownOrderSettings s, ProgressListener progress) {
        super(ls, s, progress);
    }

    /** Runs the sum (with progress); called once. */
    abstract Figures compute();

    final Figures figures() {
        if (figures == null) {
            figures = compute();
        }
        return figures;
    }

    /** The cost note of a sum estimated at {@code seconds} that runs up to {@code largestN} variables. */
    final String costNote(double seconds, int largestN, Object estimate) {
        return seconds > 5 && ls.variableCount() <= largestN ? estimate.toString() : null;
    }

    @Override
    public final EdgeEstimates edges() {
        return new EdgeEstimates(figures().edgePosterior(), null, 0, figures().logEvidence(), null);
    }

    @Override
    public final double[][] setPosterior() {
        return figures().setPosterior();
    }
}
