package org.edgewise.driver.effect;

import java.util.Arrays;

/**
 * The columns of a unit's (an order's or a DAG's) term row for one query: the logs of the joint
 * P(y, w | ·) and of the evidence P(w | ·), intervened (the truncated factorisation) and observed
 * (the plain one), for the set value and then, with a versus value, for that; last the probability
 * that no directed path leads from the set variables to the outcome (linear, not a log).
 */
enum Term {
    JOINT, GIVEN, OBS_JOINT, OBS_GIVEN, VS_JOINT, VS_GIVEN, OBS_VS_JOINT, OBS_VS_GIVEN, NO_PATH;

    private static final int COLUMNS = values().length;

    /** The log probability of a case's states, with the set variables intervened on or only observed. */
    interface LogProbability {
        double of(boolean intervened, int[] states);
    }

    /** This column of {@code row}. */
    double in(double[] row) {
        return row[ordinal()];
    }

    /** Sets this column of {@code row}. */
    void set(double[] row, double value) {
        row[ordinal()] = value;
    }

    /**
     * The row of {@code q} under {@code p}: its log terms (the versus ones only when {@code q} has a
     * versus value, else 0), no-path 0 for the caller to set.
     */
    static double[] row(EffectQuery q, LogProbability p) {
        double[] row = new double[COLUMNS];
        logTerms(row, q, q.set(), p, JOINT, GIVEN, OBS_JOINT, OBS_GIVEN);
        if (q.versus() != null) {
            logTerms(row, q, q.versus(), p, VS_JOINT, VS_GIVEN, OBS_VS_JOINT, OBS_VS_GIVEN);
        }
        return row;
    }

    /** The row of a unit of likelihood zero: every log term −∞, no-path 0. */
    static double[] impossible() {
        double[] row = new double[COLUMNS];
        Arrays.fill(row, Double.NEGATIVE_INFINITY);
        NO_PATH.set(row, 0);
        return row;
    }

    private static void logTerms(double[] row, EffectQuery q, int[] value, LogProbability p,
                                 Term joint, Term given, Term obsJoint, Term obsGiven) {
        joint.set(row, p.of(true, q.jointCase(value)));
        given.set(row, p.of(true, q.givenCase(value)));
        obsJoint.set(row, p.of(false, q.jointCase(value)));
        obsGiven.set(row, p.of(false, q.givenCase(value)));
    }
}
