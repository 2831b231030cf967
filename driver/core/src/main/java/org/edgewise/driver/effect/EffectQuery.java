package org.edgewise.driver.effect;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.UserError;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.store.Manifest;

/**
 * One interventional question: P(target | do(set), given) and optionally the same under a
 * reference intervention {@code versus} on the same variables. Every array is a state vector over
 * the store's variables ({@link CaseParser#HIDDEN} where the part leaves a variable out).
 *
 * @param set    the intervention do(x = a): at least one variable, never all of them
 * @param target the outcome y = b (one or more variables, none of them set)
 * @param given  evidence w = e observed after the intervention (all HIDDEN when none)
 * @param versus the reference intervention do(x = a0) on the same variables, or null
 */
public record EffectQuery(int[] set, int[] target, int[] given, int[] versus) {

    /**
     * Parses the four option texts; {@code where} prefixes every message (e.g. a file and line of
     * a batch, or empty). Refusals, word for word: an empty {@code --do} or {@code --target}; an
     * unknown variable or state (the {@link CaseParser} messages); the same variable in two of
     * {@code --do}, {@code --target}, {@code --given}; every variable set; a {@code --versus} that
     * sets other variables than {@code --do}. {@code in} names the four parts as the caller's user
     * knows them (the CLI: {@code --do}, {@code --target}, {@code --given}, {@code --versus}).
     */
    public static EffectQuery parse(Manifest m, String doText, String targetText, String givenText,
                                    String versusText, String where, InputNames in) {
        String doName = in.intervention();
        if (doText == null || doText.isBlank()) {
            throw new UserError(where + doName + " is empty: name at least one variable to set, e.g. " + doName + " \"x=a\"");
        }
        if (targetText == null || targetText.isBlank()) {
            throw new UserError(where + in.target() + " is empty: name the outcome, e.g. " + in.target() + " \"y=b\"");
        }
        int[] set = CaseParser.parse(m, doText, where + doName);
        int n = m.variableCount();
        if (count(set) == n) {
            throw new UserError(where + doName + " sets every variable (" + n + " of " + n
                    + "): nothing is left to be an outcome");
        }
        int[] target = CaseParser.parse(m, targetText, where + in.target());
        int[] given = CaseParser.parse(m, givenText, where + in.given());
        disjoint(m, set, target, where + doName + " and " + in.target() + " both name ", ": a variable that is set cannot be the outcome");
        disjoint(m, set, given, where + doName + " and " + in.given() + " both name ", ": a variable that is set is not evidence");
        disjoint(m, target, given, where + in.target() + " and " + in.given() + " both name ", ": the outcome cannot also be the evidence");
        int[] versus = null;
        if (versusText != null && !versusText.isBlank()) {
            versus = CaseParser.parse(m, versusText, where + in.versus());
            for (int v = 0; v < n; v++) {
                if ((set[v] == CaseParser.HIDDEN) != (versus[v] == CaseParser.HIDDEN)) {
                    throw new UserError(where + in.versus() + " must set the same variables as " + doName + " (" + names(m, set)
                            + "), got " + names(m, versus));
                }
            }
        }
        return new EffectQuery(set, target, given, versus);
    }

    /** The intervened variables, in index order. */
    public int[] setVariables() {
        return indices(set);
    }

    /** The case fixing the intervention, the target and the evidence: the numerator's cells. */
    public int[] jointCase(int[] intervention) {
        int[] x = intervention.clone();
        for (int v = 0; v < x.length; v++) {
            if (target[v] != CaseParser.HIDDEN) {
                x[v] = target[v];
            }
            if (given[v] != CaseParser.HIDDEN) {
                x[v] = given[v];
            }
        }
        return x;
    }

    /** The case fixing the intervention and the evidence only: the denominator's cells. */
    public int[] givenCase(int[] intervention) {
        int[] x = intervention.clone();
        for (int v = 0; v < x.length; v++) {
            if (given[v] != CaseParser.HIDDEN) {
                x[v] = given[v];
            }
        }
        return x;
    }

    /** Whether evidence is given. */
    public boolean hasGiven() {
        return count(given) > 0;
    }

    static int count(int[] states) {
        int c = 0;
        for (int s : states) {
            c += s == CaseParser.HIDDEN ? 0 : 1;
        }
        return c;
    }

    static int[] indices(int[] states) {
        return java.util.stream.IntStream.range(0, states.length).filter(v -> states[v] != CaseParser.HIDDEN).toArray();
    }

    private static void disjoint(Manifest m, int[] a, int[] b, String prefix, String suffix) {
        for (int v = 0; v < a.length; v++) {
            if (a[v] != CaseParser.HIDDEN && b[v] != CaseParser.HIDDEN) {
                throw new UserError(prefix + "variable '" + m.variables().get(v).name() + "'" + suffix);
            }
        }
    }

    private static String names(Manifest m, int[] states) {
        List<String> out = new ArrayList<>();
        for (int v : indices(states)) {
            out.add(m.variables().get(v).name());
        }
        return String.join(", ", out);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof EffectQuery q && Arrays.equals(set, q.set) && Arrays.equals(target, q.target)
                && Arrays.equals(given, q.given) && Arrays.equals(versus, q.versus);
    }

    @Override
    public int hashCode() {
        return Arrays.hashCode(set) * 31 + Arrays.hashCode(target);
    }

    @Override
    public String toString() {
        return "EffectQuery" + Arrays.toString(set) + Arrays.toString(target);
    }
}
