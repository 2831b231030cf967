package org.edgewise.driver.average.mcmc;

import org.edgewise.driver.Checks;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.average.convergence.ConvergenceTargets;
import org.edgewise.driver.average.ordermcmc.TemperedOrderChain;

/**
 * The settings every sampler shares (order MCMC, partition MCMC): chains, steps, warm-up, seed,
 * stored draws, the stopping rule and its targets, the table budget and tempering.
 *
 * @param chains      number of chains (default 4)
 * @param steps       fixed run: steps per chain after burn-in; until converged: steps before the first check
 * @param burnIn      fixed run: steps per chain discarded first (until converged: the first half)
 * @param seed        seed of all randomness
 * @param draws       draws stored per chain (fixed run: thinning = steps / draws; until converged:
 *                    between {@link ConvergenceTargets#drawsPerChain} and twice that are kept, the
 *                    thinning doubling as needed)
 * @param untilConverged run until R̂ &lt; 1.01, bulk-ESS ≥ 400 and MCSE ≤ the target for every quantity, or a cap
 * @param maxSteps    until converged: cap on steps per chain
 * @param maxSeconds  until converged: wall-clock budget of the sampling (≤ 0: none)
 * @param features    also sample a DAG per draw for ancestor and Markov-blanket features
 * @param tableBudget bytes allowed for the per-child tables
 * @param relocate    share of steps that are position (Gibbs) moves of one variable; the rest are swaps
 * @param rhatTarget  R̂ below which a quantity counts as converged ({@link ChainDiagnostics#RHAT_TARGET})
 * @param mcseTarget  MCSE at or below which an edge or feature posterior counts as converged
 *                    ({@link ConvergenceTargets#DEFAULT_MCSE}; until converged, at least
 *                    {@link ConvergenceTargets#drawsPerChain} draws are kept per chain)
 * @param rungs       tempered chains per reported chain (1: no tempering; {@link TemperedOrderChain});
 *                    0: {@link #rungsFor chosen by the number of variables}
 * @param betaMin     the smallest inverse temperature of the geometric ladder (used when rungs &gt; 1)
 */
public record McmcSettings(int chains, long steps, long burnIn, long seed, int draws, boolean untilConverged,
                       long maxSteps, double maxSeconds, boolean features, long tableBudget, double relocate,
                       double rhatTarget, double mcseTarget, int rungs, double betaMin) {
    /** Share of relocation moves in the default settings (measured: docs/unknown-order.md, "Mixing"). */
    public static final double DEFAULT_RELOCATE = 0.1;
    /** Tempered chains per reported chain in the default settings: 0, chosen by width ({@link #rungsFor}). */
    public static final int DEFAULT_RUNGS = 0;
    /** Smallest inverse temperature of a tempered ladder by default. */
    public static final double DEFAULT_BETA_MIN = 0.3;

    public McmcSettings {
        Checks.atLeast(chains, 1, "the number of chains");
        Checks.atLeast(steps, 1, "the steps per chain");
        Checks.notNegative(burnIn, "the burn-in");
        if (draws < 4) {
            throw new UserError("at least 4 stored draws per chain are needed for split-R̂, got " + draws);
        }
        if (!(rhatTarget > 1)) {
            throw new UserError("the split-R-hat target must be above 1 (e.g. 1.01), got " + rhatTarget);
        }
        if (!(relocate >= 0 && relocate <= 1)) {
            throw new IllegalArgumentException("relocation share " + relocate);
        }
        Checks.zeroOrMore(rungs, "the tempered chains per chain");
        if (!(betaMin > 0 && betaMin < 1)) {
            throw new IllegalArgumentException("smallest inverse temperature " + betaMin);
        }
        ConvergenceTargets.mcse(mcseTarget, "the Monte Carlo standard error target");
    }

    /** The targets of the convergence verdict. */
    public ConvergenceTargets targets() {
        return ConvergenceTargets.withRhat(rhatTarget).withMcse(mcseTarget);
    }

    /**
     * The rungs of the ladders for {@code n} variables: as set, or when 0, R = max(1, round(4·√(n/200)))
     * up to n = 200 — 1 (no tempering) up to n = 28, 2 up to 78, 3 up to 153, 4 at 200 — and
     * R = round(n/50) beyond (10 at n = 500). Why: the swap acceptance between fixed β's falls as
     * the variance of the log target grows (about ∝ n, so the spacing of ln β must shrink ∝ 1/√n);
     * 4 rungs down to β = 0.3 measured best at n = 200 (swap acceptance 0.25–0.38); beyond, the
     * ladder must also reach hotter ({@link #betaMinFor}), and 10 rungs down to 0.1 is the ladder
     * measured to bring every chain out of its trap at n = 500 (docs/unknown-order.md, "Tempering").
     */
    public int rungsFor(int n) {
        if (rungs > 0) {
            return rungs;
        }
        return n <= 200 ? Math.max(1, (int) Math.round(4 * Math.sqrt(n / 200.0))) : (int) Math.round(n / 50.0);
    }

    /**
     * The smallest inverse temperature for {@code n} variables: as set when the rungs are set, else
     * {@code betaMin} up to n = 200 and betaMin·(200/n)^1.2 beyond (0.3 → 0.10 at n = 500) — fitted
     * to the two ladders measured to work (n = 200: 0.3; n = 500: 0.1), not derived.
     */
    public double betaMinFor(int n) {
        return rungs > 0 || n <= 200 ? betaMin : betaMin * Math.pow(200.0 / n, 1.2);
    }

    /** The default settings (4 chains of 200,000 steps after 50,000 of burn-in, 1,000 draws each) with this seed. */
    public static McmcSettings defaults(long seed) {
        Draft d = new Draft();
        d.seed = seed;
        return d.settings();
    }

    /** {@code s} steps per chain ({@link #steps}) after {@code b} of burn-in. */
    public McmcSettings withSteps(long s, long b) {
        return edit(d -> {
            d.steps = s;
            d.burnIn = b;
        });
    }

    /** Until converged, checking first after {@link #steps}, at most {@code max} steps and {@code seconds} seconds. */
    public McmcSettings untilConverged(long max, double seconds) {
        return withStopping(true, max, seconds);
    }

    /** Until converged or not; the cap on steps and seconds apply only until converged. */
    public McmcSettings withStopping(boolean until, long max, double seconds) {
        return edit(d -> {
            d.untilConverged = until;
            d.maxSteps = max;
            d.maxSeconds = seconds;
        });
    }

    /** A ladder of {@code r} tempered chains per reported chain, β from 1 down to {@code bMin}. */
    public McmcSettings withTempering(int r, double bMin) {
        return edit(d -> {
            d.rungs = r;
            d.betaMin = bMin;
        });
    }

    /** {@code c} chains, each storing {@code dr} draws (at least 4). */
    public McmcSettings withChains(int c, int dr) {
        return edit(d -> {
            d.chains = c;
            d.draws = dr;
        });
    }

    /**
     * The R̂ below which, and the MCSE at or below which, a quantity counts as converged: those of
     * {@code t} (the bulk-ESS target is always {@link ChainDiagnostics#ESS_TARGET}).
     */
    public McmcSettings withTargets(ConvergenceTargets t) {
        return edit(d -> {
            d.rhatTarget = t.rhat();
            d.mcseTarget = t.mcse();
        });
    }

    /** Whether a DAG is drawn per draw for ancestor and Markov-blanket features. */
    public McmcSettings withFeatures(boolean f) {
        return edit(d -> d.features = f);
    }

    /** Bytes allowed for the per-child tables. */
    public McmcSettings withTableBudget(long bytes) {
        return edit(d -> d.tableBudget = bytes);
    }

    /** The share of steps that are relocation (Gibbs) moves of one variable. */
    public McmcSettings withRelocate(double r) {
        return edit(d -> d.relocate = r);
    }

    /** A copy with {@code change} applied, checked again by the canonical constructor. */
    private McmcSettings edit(java.util.function.Consumer<Draft> change) {
        Draft d = new Draft(this);
        change.accept(d);
        return d.settings();
    }

    /**
     * The one place that lists every setting (with its default) besides the record header: the
     * {@code with…} methods change a draft copied from a settings object.
     */
    private static final class Draft {
        int chains = 4;
        long steps = 200_000;
        long burnIn = 50_000;
        long seed;
        int draws = 1000;
        boolean untilConverged;
        long maxSteps;
        double maxSeconds;
        boolean features;
        long tableBudget = 1L << 30;
        double relocate = DEFAULT_RELOCATE;
        double rhatTarget = ChainDiagnostics.RHAT_TARGET;
        double mcseTarget = ConvergenceTargets.DEFAULT_MCSE;
        int rungs = DEFAULT_RUNGS;
        double betaMin = DEFAULT_BETA_MIN;

        Draft() {
        }

        Draft(McmcSettings s) {
            chains = s.chains;
            steps = s.steps;
            burnIn = s.burnIn;
            seed = s.seed;
            draws = s.draws;
            untilConverged = s.untilConverged;
            maxSteps = s.maxSteps;
            maxSeconds = s.maxSeconds;
            features = s.features;
            tableBudget = s.tableBudget;
            relocate = s.relocate;
            rhatTarget = s.rhatTarget;
            mcseTarget = s.mcseTarget;
            rungs = s.rungs;
            betaMin = s.betaMin;
        }

        McmcSettings settings() {
            return new McmcSettings(chains, steps, burnIn, seed, draws, untilConverged, maxSteps, maxSeconds, features,
                    tableBudget, relocate, rhatTarget, mcseTarget, rungs, betaMin);
        }
    }
}
