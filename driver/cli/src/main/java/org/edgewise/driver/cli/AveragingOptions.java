package org.edgewise.driver.cli;

import org.edgewise.driver.Checks;
import picocli.CommandLine.Mixin;

/**
 * The options of every command that averages over structures ({@code edges}, {@code predict}):
 * the store and scoring, the method (given order or unknown orders), and the unknown-order
 * settings. One mixin, so the commands declare them once.
 */
public final class AveragingOptions {
    @Mixin
    public ScoringMixin scoring = new ScoringMixin();

    @Mixin
    public MethodMixin method = new MethodMixin();

    @Mixin
    public UnknownOrderOptions unknown = new UnknownOrderOptions();

    /**
     * The method ({@link MethodMixin#resolve}), refusing unknown-order options given with an order
     * (refused, not dropped: a user who gave them expects them to act).
     */
    public String method(String what) {
        String m = method.resolve(what);
        if (m.equals("order")) {
            Checks.notApplicable(!unknown.tiers.isEmpty(), "--tiers", "with --order",
                    "the order already fixes which variable comes first; give the order that respects the tiers");
            Checks.notApplicable(!unknown.features.isEmpty(), "--features", "with --order",
                    "features are estimated over unknown orders (--method exact or mcmc)");
        }
        return m;
    }
}
