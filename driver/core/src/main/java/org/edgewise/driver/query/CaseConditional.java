package org.edgewise.driver.query;

import org.edgewise.driver.UserError;

/** The conditional of a case from two joint probabilities, the one place every {@link CaseProbability} takes it. */
final class CaseConditional {
    private CaseConditional() {
    }

    /**
     * log P(target | given) = log P(target ∪ given) − log P(given) (the definition of a conditional
     * probability); −∞ when the two disagree on a variable. Throws a {@link UserError} with
     * {@code zeroEvidence} when P(given) = 0.
     */
    static double of(CaseProbability p, int[] target, int[] given, String zeroEvidence) {
        double lg = p.logProbability(given);
        if (lg == Double.NEGATIVE_INFINITY) {
            throw new UserError(zeroEvidence);
        }
        int[] joint = joint(target, given);
        if (joint == null) {
            return Double.NEGATIVE_INFINITY;
        }
        return p.logProbability(joint) - lg;
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
