package org.edgewise.driver.cli;

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
}
