package org.edgewise.driver.query;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.CsvFields;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.Variable;

/**
 * Parses a case written {@code name=state,name=state} into a state vector: {@code states[v]} the
 * state index of variable v, or {@link #HIDDEN} when the case leaves v out.
 */
public final class CaseParser {
    /** Marks a variable the case does not observe. */
    public static final int HIDDEN = -1;

    private CaseParser() {
    }

    /** {@code option} names the option in messages (e.g. {@code --case}). */
    public static int[] parse(Manifest m, String text, String option) {
        int[] states = new int[m.variableCount()];
        Arrays.fill(states, HIDDEN);
        if (text == null) {
            return states;
        }
        if (text.isBlank()) {
            throw new UserError(option + " is empty; give name=state pairs, e.g. " + m.variables().get(0).name() + "="
                    + m.variables().get(0).states().get(0));
        }
        List<String> parts;
        try {
            parts = CsvFields.split(text, ','); // "name=a,b" in quotes names a state holding a comma
        } catch (CsvFields.Malformed e) {
            throw new UserError(option + ": unterminated quote in '" + text + "'");
        }
        for (String part : parts) {
            int eq = part.indexOf('=');
            if (eq <= 0) {
                throw new UserError(option + ": '" + part.trim() + "' is not name=state, e.g. "
                        + m.variables().get(0).name() + "=" + m.variables().get(0).states().get(0));
            }
            String name = part.substring(0, eq).trim();
            String label = part.substring(eq + 1).trim();
            int v = variable(m, name, option);
            if (states[v] != HIDDEN) {
                throw new UserError(option + ": variable '" + name + "' is given more than once");
            }
            states[v] = state(m.variables().get(v), label, option);
        }
        return states;
    }

    /** Index of a variable by name, or a one-line error listing the valid names. */
    public static int variable(Manifest m, String name, String where) {
        int v = m.variableIndex(name);
        if (v < 0) {
            List<String> names = new ArrayList<>();
            for (Variable x : m.variables()) {
                names.add(x.name());
            }
            throw new UserError(where + ": unknown variable '" + name + "' (variables: " + String.join(", ", names) + ")");
        }
        return v;
    }

    /** Index of a state label of {@code v}, or a one-line error listing its valid states. */
    public static int state(Variable v, String label, String where) {
        int k = v.stateIndex(label);
        if (k < 0) {
            throw new UserError(where + ": variable '" + v.name() + "' has no state '" + label
                    + "' (valid states: " + String.join(", ", v.states()) + ")");
        }
        return k;
    }

    /** The case as {@code name=state,…} in store order (hidden variables left out). */
    public static String format(Manifest m, int[] states) {
        List<String> parts = new ArrayList<>();
        for (int v = 0; v < states.length; v++) {
            if (states[v] != HIDDEN) {
                Variable x = m.variables().get(v);
                parts.add(x.name() + "=" + x.states().get(states[v]));
            }
        }
        return String.join(",", parts);
    }

    /** The observed cells of {@code states} as variable → state, in store order. */
    public static java.util.Map<String, String> named(Manifest m, int[] states) {
        java.util.Map<String, String> out = new java.util.LinkedHashMap<>();
        for (int v = 0; v < states.length; v++) {
            if (states[v] != HIDDEN) {
                out.put(m.variables().get(v).name(), m.variables().get(v).states().get(states[v]));
            }
        }
        return out;
    }
}
