package org.edgewise.driver.average;

import org.edgewise.driver.Checks;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import org.edgewise.driver.UserError;

/**
 * Order MCMC (Friedman &amp; Koller 2003, "Being Bayesian about network structure", Machine
 * Learning 50): several chains over variable orders ({@link OrderChain}), each from its own
 * random start on its own thread ({@link ChainRunner}), with Rao-Blackwellised edge estimates —
 * the exact P(j → i | D, ≺) of each stored order, averaged over the draws of all chains — and,
 * per edge, feature and for the log score trace, rank-normalised split-R̂, bulk- and tail-ESS and
 * Monte Carlo standard error across chains ({@link MultiChainDiagnostics}).
 *
 * <p>The target is the order-modular posterior P(≺ | D) ∝ Σ_{G ⊆ ≺} Π_i ρ_i(U_i) P(D | G) under
 * the uniform prior over the allowed orders: the same posterior {@link ExactOrderSum} sums
 * exactly, so the two agree up to Monte Carlo error.
 *
 * <p>Reproducible: chain c draws from the c-th {@link SplittableRandom#split()} of
 * {@code new SplittableRandom(seed)}, made on the calling thread before any chain starts, and
 * chains only meet at round boundaries fixed by step counts — so a seed gives the same result
 * whatever the thread timing, unless a time budget stops the run.
 *
 * <p>On wide tables each reported chain is a ladder of tempered chains (Metropolis-coupled MCMC,
 * {@link TemperedOrderChain}; rungs by width, {@link Settings#rungsFor}): measured at n = 200, it
 * takes chains out of inferior modes of the order posterior that single chains do not leave in
 * minutes (docs/unknown-order.md, "Tempering").
 *
 * <p>Memory: {@link ChildTables} (8·2^K bytes per tabulated child with K candidates, at most
 * {@code tableBudget} in all), plus per chain at most 2·draws stored draws of 4 bytes per
 * candidate edge and 4n bytes of order (2,000 draws × 1,200 candidate edges ≈ 10 MB), plus per
 * rung 84n bytes of state and 69,632 bytes of cache per non-tabulated child; planned and
 * checked against the heap before anything is built ({@link McmcMemory}).
 */
public final class OrderMcmc {
    private OrderMcmc() {
    }

    /**
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
    public record Settings(int chains, long steps, long burnIn, long seed, int draws, boolean untilConverged,
                           long maxSteps, double maxSeconds, boolean features, long tableBudget, double relocate,
                           double rhatTarget, double mcseTarget, int rungs, double betaMin) {
        /** Share of relocation moves in the default settings (measured: docs/unknown-order.md, "Mixing"). */
        public static final double DEFAULT_RELOCATE = 0.1;
        /** Tempered chains per reported chain in the default settings: 0, chosen by width ({@link #rungsFor}). */
        public static final int DEFAULT_RUNGS = 0;
        /** Smallest inverse temperature of a tempered ladder by default. */
        public static final double DEFAULT_BETA_MIN = 0.3;

        public Settings {
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
        public static Settings defaults(long seed) {
            Draft d = new Draft();
            d.seed = seed;
            return d.settings();
        }

        /** {@code s} steps per chain ({@link #steps}) after {@code b} of burn-in. */
        public Settings withSteps(long s, long b) {
            return edit(d -> {
                d.steps = s;
                d.burnIn = b;
            });
        }

        /** Until converged, checking first after {@link #steps}, at most {@code max} steps and {@code seconds} seconds. */
        public Settings untilConverged(long max, double seconds) {
            return withStopping(true, max, seconds);
        }

        /** Until converged or not; the cap on steps and seconds apply only until converged. */
        public Settings withStopping(boolean until, long max, double seconds) {
            return edit(d -> {
                d.untilConverged = until;
                d.maxSteps = max;
                d.maxSeconds = seconds;
            });
        }

        /** A ladder of {@code r} tempered chains per reported chain, β from 1 down to {@code bMin}. */
        public Settings withTempering(int r, double bMin) {
            return edit(d -> {
                d.rungs = r;
                d.betaMin = bMin;
            });
        }

        /** {@code c} chains. */
        public Settings withChains(int c) {
            return edit(d -> d.chains = c);
        }

        /** Draws stored per chain (at least 4). */
        public Settings withDraws(int dr) {
            return edit(d -> d.draws = dr);
        }

        /** The seed of all randomness. */
        public Settings withSeed(long sd) {
            return edit(d -> d.seed = sd);
        }

        /** Whether a DAG is drawn per draw for ancestor and Markov-blanket features. */
        public Settings withFeatures(boolean f) {
            return edit(d -> d.features = f);
        }

        /** Bytes allowed for the per-child tables. */
        public Settings withTableBudget(long bytes) {
            return edit(d -> d.tableBudget = bytes);
        }

        /** The share of steps that are relocation (Gibbs) moves of one variable. */
        public Settings withRelocate(double r) {
            return edit(d -> d.relocate = r);
        }

        /** The R̂ below which a quantity counts as converged. */
        public Settings withRhatTarget(double t) {
            return edit(d -> d.rhatTarget = t);
        }

        /** The MCSE at or below which an edge or feature posterior counts as converged. */
        public Settings withMcseTarget(double t) {
            return edit(d -> d.mcseTarget = t);
        }

        /** A copy with {@code change} applied, checked again by the canonical constructor. */
        private Settings edit(java.util.function.Consumer<Draft> change) {
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

            Draft(Settings s) {
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

            Settings settings() {
                return new Settings(chains, steps, burnIn, seed, draws, untilConverged, maxSteps, maxSeconds, features,
                        tableBudget, relocate, rhatTarget, mcseTarget, rungs, betaMin);
            }
        }
    }

    /** One estimated quantity with its diagnostics. */
    public record Estimate(double mean, double mcse, double rhat, double ess, double essTail, ChainDiagnostics.State state) {
        static Estimate of(double mean, ChainDiagnostics.Summary s) {
            return new Estimate(mean, s.mcse(), s.rhat(), s.essBulk(), s.essTail(), s.state());
        }
    }

    /**
     * @param edges       {@code [from][to]}; null for pairs where {@code from} is no candidate of {@code to} (posterior 0)
     * @param ancestors   {@code [a][b]} for a ⇝ b when features were asked, else null
     * @param blanket     {@code [a][b]} (a &lt; b filled, symmetric) when features were asked, else null
     * @param report      the diagnostics of every quantity and the log score
     * @param outcome     why the run stopped, steps done and discarded, time in checks
     * @param traces      per chain, the log evidence of the draws used
     * @param orders      the orders of the draws used (chain by chain), for averaging predictions
     * @param thin        steps between the draws used
     * @param chainCpuSeconds CPU time of the chains' steps (incl. stored draws), summed over chains
     * @param swapAcceptance  tempering: per adjacent pair of rungs (β_r, β_{r+1}), the share of
     *                        proposed exchanges accepted, over all chains; empty without tempering
     * @param betaMin         tempering: the smallest inverse temperature of the ladders
     * @param memory          the memory planned before the run (and checked against the heap)
     */
    public record Result(Estimate[][] edges, Estimate[][] ancestors, Estimate[][] blanket,
                         MultiChainDiagnostics.Report report, ChainRunner.Outcome outcome, double acceptance, long thin,
                         List<double[]> traces, List<int[]> orders, double setupSeconds, double chainCpuSeconds,
                         double[] swapAcceptance, double betaMin, McmcMemory memory) {
        public double maxRhat() {
            return report.maxRhat();
        }

        public double minEss() {
            return report.minEssBulk();
        }

        public boolean converged() {
            return report.converged();
        }

        public long stepsPerChain() {
            return outcome.stepsPerChain() - outcome.discarded();
        }

        public long burnIn() {
            return outcome.discarded();
        }

        public double samplingSeconds() {
            return outcome.samplingSeconds();
        }
    }

    /** Runs the chains. {@code listener} may be null. */
    public static Result run(LocalScores ls, OrderConstraints oc, Settings s, ChainRunner.Listener listener) {
        int[][] cpos = candidatePositions(ls);
        int[] offset = edgeOffsets(ls);
        int rungs = s.rungsFor(ls.variableCount());
        if (rungs == 1) {
            return runChains(ls, offset, s, 1, 0, listener, (tables, rng, store) ->
                    new OrderChain(ls, tables, oc, cpos, offset, s.features(), rng, store, s.relocate())).result();
        }
        double[] beta = TemperedOrderChain.geometricLadder(rungs, s.betaMinFor(ls.variableCount()));
        return runChains(ls, offset, s, rungs, 0, listener, (tables, rng, store) -> {
            OrderChain[] ladder = new OrderChain[beta.length];
            for (int r = 0; r < ladder.length; r++) {
                ladder[r] = new OrderChain(ls, tables, oc, cpos, offset, s.features(), rng.split(), null, s.relocate());
            }
            return new TemperedOrderChain(ladder, beta, rng.split(), store);
        }).result();
    }

    /** cpos[i][j]: the index of j among i's candidates, −1 when j is none (n² ints, shared by all chains). */
    static int[][] candidatePositions(LocalScores ls) {
        int n = ls.variableCount();
        int[][] cpos = new int[n][n];
        for (int i = 0; i < n; i++) {
            java.util.Arrays.fill(cpos[i], -1);
            int[] cand = ls.candidates(i);
            for (int k = 0; k < cand.length; k++) {
                cpos[i][cand[k]] = k;
            }
        }
        return cpos;
    }

    /** Per child i, where its candidate edges start in the flat edge arrays: offset[i+1] − offset[i] = |candidates(i)|. */
    static int[] edgeOffsets(LocalScores ls) {
        int n = ls.variableCount();
        int[] offset = new int[n + 1];
        for (int i = 0; i < n; i++) {
            offset[i + 1] = offset[i] + ls.candidates(i).length;
        }
        return offset;
    }

    /** Makes one chain over the shared zeta tables, with its own random stream and draw store. */
    interface ChainFactory<C extends ChainRunner.Chain> {
        C make(ChildTables tables, SplittableRandom rng, DrawStore store);
    }

    /** The chains as they ended, the runner's outcome and the summary of their draws. */
    record Run<C extends ChainRunner.Chain>(List<C> chains, ChainRunner.Outcome outcome, Result result) {
    }

    /**
     * What order and partition MCMC share: the zeta tables, one draw store and random stream per
     * chain (split from the seed), the runner (fixed length or until converged, diagnostics over the
     * candidate edges) and {@link #summarise}.
     */
    static <C extends ChainRunner.Chain> Run<C> runChains(LocalScores ls, int[] offset, Settings s,
                                                          ChainRunner.Listener listener, ChainFactory<C> factory) {
        return runChains(ls, offset, s, 1, 0, listener, factory);
    }

    /**
     * As above, each reported chain a ladder of {@code rungs} chains, each chain holding
     * {@code extraChainBytes} beyond an order chain's state (for the memory plan).
     */
    static <C extends ChainRunner.Chain> Run<C> runChains(LocalScores ls, int[] offset, Settings s, int rungs,
                                                          long extraChainBytes, ChainRunner.Listener listener,
                                                          ChainFactory<C> factory) {
        int n = ls.variableCount();
        int[] edgeFrom = new int[offset[n]];
        int[] edgeTo = new int[offset[n]];
        for (int i = 0; i < n; i++) {
            int[] cand = ls.candidates(i);
            for (int k = 0; k < cand.length; k++) {
                edgeFrom[offset[i] + k] = cand[k];
                edgeTo[offset[i] + k] = i;
            }
        }
        long t0 = System.nanoTime();
        McmcMemory memory = McmcMemory.plan(ls, s, rungs, extraChainBytes);
        memory.checkHere();
        ChildTables tables = new ChildTables(ls, s.tableBudget());
        SplittableRandom root = new SplittableRandom(s.seed());
        List<C> chains = new ArrayList<>();
        for (int c = 0; c < s.chains(); c++) {
            DrawStore store = s.untilConverged() ? new DrawStore(offset[n], s.targets().drawsPerChain(s.draws(), s.chains()), 1, 0)
                    : new DrawStore(offset[n], s.draws(), Math.max(1, s.steps() / s.draws()), s.burnIn());
            chains.add(factory.make(tables, root.split(), store));
        }
        double setup = (System.nanoTime() - t0) / 1e9;
        List<String> names = new ArrayList<>();
        for (var v : ls.store().variables()) {
            names.add(v.name());
        }
        MultiChainDiagnostics.Quantities q = OrderQuantities.of(names, edgeFrom, edgeTo, s.features());
        ChainRunner.Outcome out = ChainRunner.run(chains, new ChainRunner.Plan(s.steps(), s.burnIn(), s.untilConverged(),
                Math.max(s.maxSteps(), s.steps()), s.maxSeconds(), s.targets()), q, listener);
        return new Run<>(chains, out, summarise(ls, chains, offset, s, out, setup, edgeFrom.length, memory));
    }

    static Result summarise(LocalScores ls, List<? extends ChainRunner.Chain> chains, int[] offset, Settings s,
                            ChainRunner.Outcome out, double setup, int edgeCount, McmcMemory memory) {
        int n = ls.variableCount();
        MultiChainDiagnostics.Report rep = out.report();
        List<DrawStore> stores = new ArrayList<>();
        int[] from = new int[chains.size()];
        for (int c = 0; c < chains.size(); c++) {
            stores.add(chains.get(c).draws());
            from[c] = stores.get(c).firstAfter(out.discarded());
        }
        int draws = rep.drawsPerChain();
        Estimate[][] edges = new Estimate[n][n];
        for (int i = 0; i < n; i++) {
            int[] cand = ls.candidates(i);
            for (int k = 0; k < cand.length; k++) {
                int e = offset[i] + k;
                double sum = 0;
                for (int c = 0; c < stores.size(); c++) {
                    for (int t = 0; t < draws; t++) {
                        sum += stores.get(c).quantity(from[c] + t, e);
                    }
                }
                edges[cand[k]][i] = Estimate.of(sum / (draws * stores.size()), rep.quantities()[e]);
            }
        }
        Estimate[][] anc = null;
        Estimate[][] mb = null;
        if (s.features()) {
            anc = new Estimate[n][n];
            mb = new Estimate[n][n];
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (a == b) {
                        continue;
                    }
                    int qa = edgeCount + OrderQuantities.ancestorIndex(a, b, n);
                    anc[a][b] = Estimate.of(rep.quantities()[qa].mean(), rep.quantities()[qa]);
                    if (a < b) {
                        int qb = edgeCount + OrderQuantities.blanketIndex(a, b, n);
                        mb[a][b] = Estimate.of(rep.quantities()[qb].mean(), rep.quantities()[qb]);
                        mb[b][a] = mb[a][b];
                    }
                }
            }
        }
        List<double[]> traces = new ArrayList<>();
        List<int[]> orders = new ArrayList<>();
        long thin = stores.get(0).thin();
        for (int c = 0; c < stores.size(); c++) {
            double[] tr = new double[draws];
            for (int t = 0; t < draws; t++) {
                tr[t] = stores.get(c).logScore(from[c] + t);
                orders.add(((DrawStore.Drawn) stores.get(c).state(from[c] + t)).order());
            }
            traces.add(tr);
            thin = Math.min(thin, stores.get(c).thin());
        }
        double cpu = 0;
        double[] swaps = new double[0];
        for (ChainRunner.Chain c : chains) {
            cpu += c.cpuSeconds();
            if (c instanceof TemperedOrderChain t) {
                double[] a = t.swapAcceptance();
                swaps = swaps.length == 0 ? new double[a.length] : swaps;
                for (int r = 0; r < a.length; r++) {
                    swaps[r] += a[r] / chains.size();
                }
            }
        }
        return new Result(edges, anc, mb, rep, out, ChainRunner.acceptance(chains), thin, traces, orders, setup, cpu,
                swaps, s.betaMinFor(n), memory);
    }
}
