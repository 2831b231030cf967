package org.edgewise.driver.cli;

import org.edgewise.driver.ErrorReport;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.UserError;
import org.edgewise.driver.WordedError;
import org.edgewise.driver.report.AssessHint;
import org.edgewise.driver.report.RunHint;

/** The command line's names of the inputs the core names in its messages ({@link InputNames}). */
final class CliNames {
    /** Every driver command's option names. */
    static final InputNames NAMES = new InputNames("--ess", "--forbid", "--require", "--tiers", "--given",
            "--max-hidden-states", "--exact-cases", "--candidates K", "--draws", "--samples", "--method mcmc",
            "--dag-prior order-modular", "--dag-prior structure-modular",
            "--features essential-graph, ancestors or markov-blanket", "--do", "--target", "--versus",
            "--order", "--case", "--cases", "--chains");

    /** How a report tells the reader to get essential-graph features. */
    static final AssessHint ASSESS = new AssessHint("edges", "--features essential-graph");

    /** The option that sets the MCSE target of a run until converged. */
    static final String MCSE_TARGET = "--mcse-target";

    /** How the convergence advice names the ways to run differently. */
    static final RunHint RUN = new RunHint("--max-time", "--max-steps", "--steps", "no --steps, or --rhat-target", MCSE_TARGET,
            "--chains", "--method exact");

    private CliNames() {
    }

    /** How the launcher's maximum heap is set, in a refusal for too little heap. */
    static final String HEAP_SETTING = "EDGEWISE_JAVA_OPTS=-Xmx…";

    /**
     * A failure with the user errors the core words neutrally (they carry the facts,
     * {@link WordedError}) worded with the command line's names; anything else as it is.
     */
    static Throwable worded(Throwable t) {
        if (ErrorReport.userError(t) instanceof WordedError w) {
            return new UserError(w.worded(NAMES, HEAP_SETTING), t);
        }
        return t;
    }
}
