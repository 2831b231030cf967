package org.edgewise.driver.score;

import org.edgewise.driver.UserError;
import java.util.Locale;
import org.apache.commons.math3.util.CombinatoricsUtils;

/**
 * Modular structure prior ρ_i(U) on parent sets, in log space.
 *
 * <ul>
 *   <li>{@link #UNIFORM}: ρ_i(U) = 1 for every allowed set; with a fixed order this is the uniform
 *       prior over the DAGs consistent with it.</li>
 *   <li>{@link #SIZE}: ρ_i(U) = 1 / C(n−1, |U|) — Koivisto &amp; Sood (2004), "Exact Bayesian
 *       structure discovery in Bayesian networks", JMLR 5: every parent-set size equally likely.</li>
 * </ul>
 */
public enum StructurePrior {
    UNIFORM, SIZE;

    public static StructurePrior parse(String text) {
        try {
            return valueOf(text.trim().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            throw new UserError("unknown prior '" + text + "' (valid: uniform, size)");
        }
    }

    public String label() {
        return name().toLowerCase(Locale.ROOT);
    }

    /** log ρ_i(U) for a parent set of {@code size} members in a network of {@code n} variables. */
    public double logWeight(int n, int size) {
        if (this == UNIFORM) {
            return 0.0;
        }
        return -CombinatoricsUtils.binomialCoefficientLog(n - 1, size);
    }
}
