package org.edgewise.driver;

/**
 * A mistake in the user's input (a file, an option, a store) — reported as one line, never with a
 * stack trace, and the command exits non-zero. The message names the file, line, column or variable.
 */
public class UserError extends RuntimeException {
    public UserError(String message) {
        super(message);
    }

    public UserError(String message, Throwable cause) {
        super(message, cause);
    }
}
