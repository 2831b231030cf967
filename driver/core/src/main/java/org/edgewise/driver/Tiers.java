package org.edgewise.driver;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Tiers of variables, earliest first: the one reading of a tiers option's values and the one
 * resolution of tier names against the variables, shared by the tally (candidate parents) and the
 * queries ({@code average.OrderConstraints}), so that both spell a tier alike and refuse alike.
 *
 * <p>One meaning everywhere: {@code ;} separates tiers within one value, {@code ,} the variables of
 * a tier, and each further value appends its tiers — {@code ["a,b;c"]} and {@code ["a,b", "c"]} are
 * the same two tiers. The caller names the option in messages ({@code what}); the core never spells
 * a command-line word.
 */
public final class Tiers {
    private Tiers() {
    }

    /** The tiers of the values, in order; a blank variable name (an empty tier included) is a {@link UserError}. */
    public static List<List<String>> parse(List<String> values, String what) {
        List<List<String>> out = new ArrayList<>();
        for (String value : values) {
            for (String tier : value.split(";", -1)) {
                List<String> names = new ArrayList<>();
                for (String name : tier.split(",", -1)) {
                    if (name.isBlank()) {
                        throw emptyName(what, value);
                    }
                    names.add(name.trim());
                }
                out.add(List.copyOf(names));
            }
        }
        return List.copyOf(out);
    }

    /**
     * The tier of every variable ({@code -1}: in none), {@code variables} in the store's order. A blank
     * name, an unknown name, or a name given twice is a {@link UserError} naming it.
     */
    public static int[] resolve(List<String> variables, List<List<String>> tiers, String what) {
        Map<String, Integer> index = new HashMap<>();
        for (int v = 0; v < variables.size(); v++) {
            index.put(variables.get(v), v);
        }
        int[] tierOf = new int[variables.size()];
        java.util.Arrays.fill(tierOf, -1);
        for (int t = 0; t < tiers.size(); t++) {
            for (String raw : tiers.get(t)) {
                String name = raw.trim();
                if (name.isEmpty()) {
                    throw emptyName(what, String.join(",", tiers.get(t)));
                }
                Integer v = index.get(name);
                if (v == null) {
                    throw new UserError(what + ": unknown variable '" + name + "' (variables: "
                            + String.join(", ", variables) + ")");
                }
                if (tierOf[v] == t) {
                    throw new UserError(what + ": variable '" + name + "' is named twice in tier " + (t + 1));
                }
                if (tierOf[v] >= 0) {
                    throw new UserError(what + ": variable '" + name + "' is in tiers " + (tierOf[v] + 1) + " and " + (t + 1));
                }
                tierOf[v] = t;
            }
        }
        return tierOf;
    }

    private static UserError emptyName(String what, String value) {
        return new UserError(what + ": empty variable name in '" + value + "'");
    }
}
