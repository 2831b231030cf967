package org.edgewise.driver.query;

import java.util.Locale;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.WordedError;

/**
 * An exact structure-modular prediction whose planned work is above the budget: one forward pass
 * of the recursion over all DAGs (3^n terms) per joint state of the hidden variables. It carries
 * the figures so a front end can name the sampled method in its own words; decided before any
 * pass runs.
 */
public final class TooSlowForExact extends WordedError {
    private final double jointStates;
    private final int variables;
    private final double terms;
    private final double budget;

    public TooSlowForExact(double jointStates, int variables, double budget) {
        super(text(jointStates, variables, budget) + "; observe more of the hidden variables, or average over sampled"
                + " structures");
        this.jointStates = jointStates;
        this.variables = variables;
        this.terms = jointStates * Math.pow(3, variables);
        this.budget = budget;
    }

    private static String text(double jointStates, int variables, double budget) {
        double perPass = Math.pow(3, variables);
        return String.format(Locale.ROOT, "an exact prediction over all DAGs would sum %.1e terms (%,.0f hidden joint"
                        + " states × one sum of 3^%d = %,.0f terms each), more than the budget of %.0e terms",
                jointStates * perPass, jointStates, variables, perPass, budget);
    }

    @Override
    public String worded(InputNames names, String heapSetting) {
        return text(jointStates, variables, budget) + "; observe more of the hidden variables, or use "
                + names.methodMcmc() + ", which answers it by sampling";
    }

    /** Joint states of the hidden variables summed over (both sums of a conditional together). */
    public double jointStates() {
        return jointStates;
    }

    /** The planned terms: joint states × 3^n. */
    public double terms() {
        return terms;
    }
}
