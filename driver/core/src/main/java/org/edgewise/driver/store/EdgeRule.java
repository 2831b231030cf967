package org.edgewise.driver.store;

import org.edgewise.driver.UserError;

/** A directed edge named by variable names, as given to {@code --forbid} / {@code --require} ({@code a->b}). */
public record EdgeRule(String from, String to) {
    /** Parses {@code a->b}; {@code option} names the option in the error message. */
    public static EdgeRule parse(String text, String option) {
        int at = text.indexOf("->");
        if (at <= 0 || at + 2 >= text.length()) {
            throw new UserError(option + ": '" + text + "' is not an edge; write it as from->to, e.g. a->b");
        }
        return new EdgeRule(text.substring(0, at).trim(), text.substring(at + 2).trim());
    }

    @Override
    public String toString() {
        return from + "->" + to;
    }
}
