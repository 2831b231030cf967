package org.edgewise.driver.query;

import org.edgewise.driver.UserError;

/** The conditional of a case from two joint probabilities, the one place every {@link CaseProbability} takes it. */
final class CaseConditional {
    private CaseConditional() {
    }

    /**
     * log P(target | given) = log P(target ∪ given) − log P(given) (the definition of a conditional
     * probability). Throws a {@link UserError} with {@code zeroEvidence} when P(given) = 0, and
     * one naming {@code givenName} when the case and the evidence fix different states of one
     * variable (the answer would be 0 by definition, not from the data: a mistake in the question).
     */
    static double of(CaseProbability p, int[] target, int[] given, String zeroEvidence, String givenName,
                     java.util.List<org.edgewise.driver.store.Variable> variables) {
        int[] joint = joint(target, given);
        if (joint == null) {
            int i = contradicted(target, given);
            org.edgewise.driver.store.Variable v = variables.get(i);
            throw new UserError("the case has " + v.name() + "=" + v.states().get(target[i])
                    + " but " + givenName + " has " + v.name() + "=" + v.states().get(given[i])
                    + "; a probability given evidence the case contradicts is 0 by definition, not from the data:"
                    + " leave " + v.name() + " out of one of them");
        }
        double lg = p.logProbability(given);
        if (lg == Double.NEGATIVE_INFINITY) {
            throw new UserError(zeroEvidence);
        }
        return p.logProbability(joint) - lg;
    }

    /** The first variable the two fix at different states, or −1. */
    static int contradicted(int[] target, int[] given) {
        for (int v = 0; v < target.length; v++) {
            if (target[v] != CaseParser.HIDDEN && given[v] != CaseParser.HIDDEN && target[v] != given[v]) {
                return v;
            }
        }
        return -1;
    }

    /** The case with the states of both; null when they disagree on a variable (a joint of probability 0). */
    static int[] joint(int[] target, int[] given) {
        int[] joint = given.clone();
        for (int v = 0; v < joint.length; v++) {
            if (target[v] != CaseParser.HIDDEN) {
                if (joint[v] != CaseParser.HIDDEN && joint[v] != target[v]) {
                    return null;
                }
                joint[v] = target[v];
            }
        }
        return joint;
    }
}
