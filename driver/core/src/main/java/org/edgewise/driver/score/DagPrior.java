package org.edgewise.driver.score;

import java.util.Locale;
import org.edgewise.driver.UserError;

/**
 * The prior over DAGs that an unknown-order result is computed under (DESIGN.md, "DAG priors
 * over unknown orders"). Given an order the two coincide.
 * <ul>
 * <li>{@link #STRUCTURE_MODULAR}: P(G) ∝ Π_i ρ_i(U_i) — with the uniform parent-set prior, the
 * uniform prior over DAGs with in-degree ≤ d (Tian &amp; He 2009; Kuipers &amp; Moffa 2017).</li>
 * <li>{@link #ORDER_MODULAR}: P(G) ∝ Π_i ρ_i(U_i) · |{orders consistent with G}| (Koivisto &amp;
 * Sood 2004; Friedman &amp; Koller 2003) — it favours DAGs with many linear extensions, which tilts
 * edge directions inside a Markov equivalence class.</li>
 * </ul>
 */
public enum DagPrior {
    STRUCTURE_MODULAR("structure-modular"),
    ORDER_MODULAR("order-modular");

    private final String label;

    DagPrior(String label) {
        this.label = label;
    }

    /** The name used in options and in result JSON ({@code "dagPrior"}). */
    public String label() {
        return label;
    }

    /** Parses a label; {@code option} names the option in the message. */
    public static DagPrior parse(String text, String option) {
        String t = text == null ? "" : text.trim().toLowerCase(Locale.ROOT);
        for (DagPrior p : values()) {
            if (p.label.equals(t)) {
                return p;
            }
        }
        throw new UserError(option + " must be structure-modular or order-modular, got '" + text + "'");
    }
}
