package org.edgewise.driver.effect;

import java.util.Locale;
import org.edgewise.driver.UserError;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.Variable;

/**
 * A case-control design: the rows were sampled on the outcome y (cases and controls in chosen
 * numbers), so the sample's share of cases says nothing about the population's and no absolute risk
 * of y — hence no risk difference or risk ratio — is estimable from it; the odds ratio is, because
 * sampling on y multiplies the odds of y by the same factor whatever x is (Cornfield 1951;
 * Breslow 1996, JASA 91 — from memory). Given the population prevalence π of a state of y, the
 * sample is re-weighted to the population ({@link EffectMeasures}).
 *
 * @param outcome    the variable the sample was drawn on
 * @param state      the state whose prevalence is given; −2 for the binary shorthand y=p (the target's
 *                   state); −1 when no prevalence is given
 * @param prevalence its population prevalence π in (0, 1), or NaN when none is given
 */
public record SamplingDesign(int outcome, int state, double prevalence) {

    /** Whether the population prevalence is known. */
    public boolean hasPrevalence() {
        return !Double.isNaN(prevalence);
    }

    /**
     * Parses the outcome's name and, when not null, the prevalence {@code y=state:p} (or {@code y=p} for
     * a binary outcome: the prevalence of the state the target names, see {@link #prevalenceOf}).
     * {@code outcomeWhat} and {@code prevalenceWhat} name the two inputs in messages.
     */
    public static SamplingDesign parse(Manifest m, String outcomeText, String prevalenceText, String outcomeWhat,
                                       String prevalenceWhat) {
        if (outcomeText == null || outcomeText.isBlank()) {
            throw new UserError(outcomeWhat + " is empty: name the variable the cases and controls were sampled on");
        }
        int y = CaseParser.variable(m, outcomeText.trim(), outcomeWhat);
        if (prevalenceText == null) {
            return new SamplingDesign(y, -1, Double.NaN);
        }
        Variable v = m.variables().get(y);
        int eq = prevalenceText.indexOf('=');
        if (eq < 0) {
            throw new UserError(prevalenceWhat + ": expected " + v.name() + "=state:p or, for a binary outcome, " + v.name()
                    + "=p, got '" + prevalenceText + "'");
        }
        String name = prevalenceText.substring(0, eq).trim();
        if (!name.equals(v.name())) {
            throw new UserError(prevalenceWhat + " names '" + name + "', but the outcome is '" + v.name() + "'");
        }
        String rest = prevalenceText.substring(eq + 1).trim();
        int colon = rest.lastIndexOf(':');
        int state = -2; // binary shorthand: resolved against the target's state
        if (colon >= 0) {
            state = CaseParser.state(v, rest.substring(0, colon).trim(), prevalenceWhat);
            rest = rest.substring(colon + 1).trim();
        } else if (v.states().size() != 2) {
            throw new UserError(prevalenceWhat + ": '" + v.name() + "' has " + v.states().size() + " states: name one, e.g. "
                    + v.name() + "=" + v.states().get(v.states().size() - 1) + ":0.01");
        }
        double p;
        try {
            p = Double.parseDouble(rest);
        } catch (NumberFormatException e) {
            throw new UserError(prevalenceWhat + ": '" + rest + "' is not a number");
        }
        if (!(p > 0 && p < 1)) {
            throw new UserError(prevalenceWhat + ": the prevalence must lie strictly between 0 and 1, got "
                    + String.format(Locale.ROOT, "%s", rest));
        }
        return new SamplingDesign(y, state, p);
    }

    /**
     * The population prevalence of {@code targetState} of the outcome: the one given, its complement
     * for the other state of a binary outcome, or that of the target's state for the shorthand
     * {@code y=p}; {@code what} names the prevalence in a refusal.
     */
    public double prevalenceOf(Manifest m, int targetState, String what) {
        if (state == -2 || state == targetState) {
            return prevalence;
        }
        Variable v = m.variables().get(outcome);
        if (v.states().size() == 2) {
            return 1 - prevalence;
        }
        throw new UserError(what + " gives the prevalence of " + v.name() + "=" + v.states().get(state) + ", but the target asks for "
                + v.name() + "=" + v.states().get(targetState) + ": give that state's prevalence");
    }

    /** Whether state vector {@code states} names the outcome. */
    public boolean names(int[] states) {
        return states[outcome] != CaseParser.HIDDEN;
    }
}
