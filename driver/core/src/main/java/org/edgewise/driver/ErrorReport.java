package org.edgewise.driver;

import java.io.PrintWriter;

/**
 * How every Edgewise program reports a failure, in one place (the driver's CLI and the job's
 * {@code tally} both call it): a {@link UserError} anywhere in the cause chain is the user's
 * mistake — one line, exit status {@link #USER_MISTAKE}; anything else is a bug — a request to
 * report it, the stack trace, exit status {@link #BUG}. Nothing is guessed from an exception's
 * type: an {@code IllegalArgumentException} from library code is a bug unless it was turned into a
 * {@link UserError} where the user's input was checked. A sampled run that ended without converging
 * is neither: its result is written and warned about, and its status is {@link #NOT_CONVERGED}
 * unless the caller accepted an unconverged run ({@link #finished}).
 */
public final class ErrorReport {
    /** Exit status for a user mistake (bad option, bad file, damaged store). */
    public static final int USER_MISTAKE = 2;
    /** Exit status for a bug. */
    public static final int BUG = 1;
    /**
     * Exit status of an MCMC run that wrote its result but ended unconverged (its posteriors are not
     * yet reliable), so that a script cannot take it for a finished one by its status.
     */
    public static final int NOT_CONVERGED = 3;
    /** Exit status of a finished run. */
    public static final int OK = 0;

    private ErrorReport() {
    }

    /**
     * The exit status of a command that wrote its result: {@link #NOT_CONVERGED} when a sampler's
     * verdict was not converged ({@code converged} false; null: nothing was sampled by MCMC) and the
     * caller did not accept that ({@code allowUnconverged}), else {@link #OK}.
     */
    public static int finished(Boolean converged, boolean allowUnconverged) {
        return Boolean.FALSE.equals(converged) && !allowUnconverged ? NOT_CONVERGED : OK;
    }

    /** The {@link UserError} behind {@code t}, or null when there is none (then it is a bug). */
    public static UserError userError(Throwable t) {
        for (Throwable c = t; c != null; c = c.getCause() == c ? null : c.getCause()) {
            if (c instanceof UserError u) {
                return u;
            }
        }
        return null;
    }

    /** Prints {@code t} as {@code command: message} (user mistake) or as a bug report; returns the exit status. */
    public static int report(String command, Throwable t, PrintWriter err) {
        UserError u = userError(t);
        if (u != null) {
            err.println(command + ": " + u.getMessage());
            err.flush();
            return USER_MISTAKE;
        }
        err.println(command + ": internal error (please report, with the command line and this trace): " + t);
        t.printStackTrace(err);
        err.flush();
        return BUG;
    }
}
