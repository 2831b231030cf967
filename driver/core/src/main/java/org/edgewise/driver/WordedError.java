package org.edgewise.driver;

/**
 * A user's mistake or a limit of this machine that the core states in neutral words while it
 * carries the facts, so that a front end can word it with its own names for inputs and its own
 * way of raising the heap (the command line: {@code --draws}, an environment variable; the Java
 * API: field names, {@code -Xmx}). The CLI words every such error in one place.
 */
public abstract class WordedError extends UserError {
    protected WordedError(String message) {
        super(message);
    }

    /**
     * The message in a front end's words.
     *
     * @param names       how the front end names its inputs
     * @param heapSetting how the front end sets the maximum heap (e.g. {@code -Xmx…})
     */
    public abstract String worded(InputNames names, String heapSetting);
}
