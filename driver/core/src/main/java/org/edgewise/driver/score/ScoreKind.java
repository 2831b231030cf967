package org.edgewise.driver.score;

import java.util.Locale;
import org.edgewise.driver.Checks;
import org.edgewise.driver.UserError;

/**
 * The Dirichlet prior a family score uses.
 *
 * <ul>
 *   <li>{@link #BDEU}: α_ijk = ESS/(q_i r_i) — Heckerman, Geiger &amp; Chickering (1995),
 *       "Learning Bayesian networks: the combination of knowledge and statistical data",
 *       Machine Learning 20. Score-equivalent.</li>
 *   <li>{@link #K2}: α_ijk = 1 — Cooper &amp; Herskovits (1992), "A Bayesian method for the
 *       induction of probabilistic networks from data", Machine Learning 9. Not
 *       score-equivalent; ignores the ESS.</li>
 * </ul>
 */
public enum ScoreKind {
    BDEU, K2;

    /** Parses {@code bdeu} or {@code k2} (any case); throws with the valid names otherwise. */
    public static ScoreKind parse(String text) {
        try {
            return valueOf(text.trim().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new UserError("unknown score '" + text + "' (valid: bdeu, k2)");
        }
    }

    /** Lower-case name as written in manifests and JSON. */
    public String label() {
        return name().toLowerCase(Locale.ROOT);
    }

    /** The per-cell pseudo-count α_ijk for a child with {@code r} states and {@code q} parent configurations. */
    public double cellAlpha(double ess, int r, double q) {
        return usesEss() ? ess / (q * r) : 1.0;
    }

    /**
     * Whether the score has an equivalent sample size: BDeu does; K2 has none (every α_ijk is 1),
     * so an ESS neither changes its scores nor is reported with them. The one place that says so.
     */
    public boolean usesEss() {
        return this == BDEU;
    }

    /** The ESS to report with scores of this kind: {@code ess}, or null when the kind has none (K2). */
    public Double reportedEss(double ess) {
        return usesEss() ? ess : null;
    }

    /** Refuses an ESS given ({@code given}) for a kind that has none; {@code what} names the ESS input. */
    public void checkEss(boolean given, String what) {
        Checks.notApplicable(given && !usesEss(), what, "to score " + label(),
                "K2 has no equivalent sample size (every Dirichlet parameter is 1)");
    }

    /** Whether scores of this kind under {@code ess} differ from stored ones of kind {@code stored} under {@code storedEss}. */
    public boolean rescores(ScoreKind stored, double storedEss, double ess) {
        return this != stored || (usesEss() && ess != storedEss);
    }
}
