package org.edgewise.driver.average;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.Manifest;

/** Parsing and checking of a variable order given by name ({@code a,b,c}). */
public final class VariableOrder {
    private VariableOrder() {
    }

    /**
     * The order as variable indices. Refuses, naming the variable, an order that invents a name,
     * repeats one or misses one (it must list every variable of the store exactly once).
     *
     * @param what how the caller names the order in messages (the CLI: its option)
     */
    public static int[] parse(Manifest m, String text, String what) {
        List<String> names = new ArrayList<>();
        for (String t : text.split(",", -1)) {
            names.add(t.trim());
        }
        return of(m, names, what);
    }

    /** As {@link #parse} from a list of names. */
    public static int[] of(Manifest m, List<String> names, String what) {
        int n = m.variableCount();
        boolean[] seen = new boolean[n];
        int[] order = new int[names.size()];
        for (int p = 0; p < names.size(); p++) {
            String name = names.get(p);
            if (name.isEmpty()) {
                throw new UserError(what + ": empty variable name at position " + (p + 1));
            }
            int v = m.variableIndex(name);
            if (v < 0) {
                throw new UserError(what + ": unknown variable '" + name + "' (variables: " + allNames(m) + ")");
            }
            if (seen[v]) {
                throw new UserError(what + ": variable '" + name + "' appears more than once");
            }
            seen[v] = true;
            order[p] = v;
        }
        List<String> missing = new ArrayList<>();
        for (int v = 0; v < n; v++) {
            if (!seen[v]) {
                missing.add(m.variables().get(v).name());
            }
        }
        if (!missing.isEmpty()) {
            throw new UserError(what + " misses " + (missing.size() == 1 ? "variable " : "variables ")
                    + String.join(", ", missing) + "; it must list every variable of the store exactly once");
        }
        return order;
    }

    /** Variable names of {@code order}. */
    public static List<String> names(Manifest m, int[] order) {
        List<String> out = new ArrayList<>(order.length);
        for (int v : order) {
            out.add(m.variables().get(v).name());
        }
        return out;
    }

    static String allNames(Manifest m) {
        List<String> out = new ArrayList<>();
        for (var v : m.variables()) {
            out.add(v.name());
        }
        return String.join(", ", out);
    }
}
