package org.edgewise.driver.cli;

import org.edgewise.driver.Checks;
import org.edgewise.driver.analysis.Averaging;
import org.edgewise.driver.analysis.MissingValuesStore;
import org.edgewise.driver.analysis.Scoring;
import java.nio.file.Path;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;

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

    @Mixin
    public SampleOption saved = new SampleOption();

    /**
     * What to average over ({@link MethodMixin#resolve} names the job as {@code what}), refusing
     * unknown-order options given with an order and, where the command does not estimate them
     * ({@code features} false), {@code --features} (refused, not dropped: a user who gave them
     * expects them to act). {@code draws}: the command draws at random itself (so {@code --seed}
     * acts even on exact sums).
     */
    public Averaging averaging(String what, boolean features, boolean draws) {
        Path sample = saved.sample;
        if (sample != null) {
            String why = "the saved DAGs were drawn once, with the method and scoring the sample records; draw another sample to change them";
            Checks.notApplicable(method.order != null, "--order", "with --sample", why);
            Checks.notApplicable(method.method != null, "--method", "with --sample", why);
            scoring.refuseWithSample(why);
            Checks.notApplicable(!features && !unknown.features.isEmpty(), "--features", "in " + what,
                    "features are posteriors of the structure: ask edges --features for them");
            return unknown.fromSample(sample, draws);
        }
        Path own = sample == null && scoring.store != null ? MissingValuesStore.sampleOf(scoring.store) : null;
        if (own != null) {
            String on = "on a store averaged over missing values";
            String why = "its structure posterior is the DAGs its tally drew while averaging over the missing values"
                    + " (tally --missing average)";
            Checks.notApplicable(method.order != null, "--order", on, why);
            Checks.notApplicable(method.method != null, "--method", on, why);
            scoring.refuseWithSample(on, why);
            Checks.notApplicable(!features && !unknown.features.isEmpty(), "--features", "in " + what,
                    "features are posteriors of the structure: ask edges --features for them");
            return unknown.fromSample(own, draws);
        }
        String m = method.resolve(what);
        if (m.equals("order")) {
            Checks.notApplicable(!unknown.tiers.isEmpty(), "--tiers", "with --order",
                    "the order already fixes which variable comes first; give the order that respects the tiers");
            Checks.notApplicable(!unknown.features.isEmpty(), "--features", "with --order",
                    "features are estimated over unknown orders (--method exact or mcmc)");
        }
        Checks.notApplicable(!features && !unknown.features.isEmpty(), "--features", "in " + what,
                "features are posteriors of the structure: ask edges --features for them");
        return unknown.averaging(m, method.order, draws);
    }

    /** The store and scoring options. */
    public Scoring scoring() {
        return scoring.scoring();
    }
}
