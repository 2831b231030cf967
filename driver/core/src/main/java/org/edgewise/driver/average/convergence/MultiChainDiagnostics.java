package org.edgewise.driver.average.convergence;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.stream.IntStream;
import org.edgewise.driver.average.mcmc.DrawStore;

/**
 * {@link ChainDiagnostics} of every quantity a sampler reports — per draw quantities (edge
 * posteriors, features) and the log score of the chains' states — over the stored draws of
 * several chains ({@link DrawStore}), with the run's verdict: converged when every quantity has
 * R̂ below the target ({@value ChainDiagnostics#RHAT_TARGET} by default) and bulk-ESS ≥ {@value ChainDiagnostics#ESS_TARGET},
 * and every probability a Monte Carlo standard error ≤ the MCSE target
 * ({@value ConvergenceTargets#DEFAULT_MCSE} by default; argued in {@link ConvergenceTargets}) —
 * quantities whose draws agree excepted when chains that started on both sides of them agree or
 * their other value is negligible, and counted against it when every chain started on one side
 * (a shared trap; the rules in {@link ChainDiagnostics}) — and otherwise the
 * quantities furthest from it. Any sampler whose chains fill {@link DrawStore}s (order MCMC
 * today) is diagnosed here the same way.
 *
 * <p>Cost: per quantity a sort and four FFTs over the used draws (at most 2·cap per chain), in
 * parallel over quantities; independent of how many steps the chains ran.
 */
public final class MultiChainDiagnostics {
    /** Entries listed in {@link Report#worst}. */
    public static final int WORST = 5;

    private MultiChainDiagnostics() {
    }

    /** What is diagnosed: {@code count} quantities with names, filled from the chains' stores. */
    public interface Quantities {
        int count();

        /** A name a user can read, e.g. {@code edge a -> b}. */
        String label(int q);

        /** Whether quantity {@code q} is a probability (then the settled rule applies). */
        boolean probability(int q);

        /** Fills {@code x[c][t]} with quantity {@code q} of draw {@code from[c] + t} of chain c. */
        void fill(int q, List<DrawStore> chains, int[] from, double[][] x);

        /** Quantity {@code q} at {@code chain}'s starting state; NaN when unknown (then the starts decide nothing). */
        default double start(int q, DrawStore chain) {
            return chain.startQuantity(q);
        }

        /** Whether quantity {@code q}'s draws are exact conditional probabilities (Rao-Blackwellised), not indicators. */
        default boolean raoBlackwellised(int q) {
            return false;
        }
    }

    /** The per-draw quantities of the stores themselves, named by {@code labels}: indicators, not Rao-Blackwellised. */
    public static Quantities rows(java.util.function.IntFunction<String> labels, int width) {
        return rows(labels, width, false);
    }

    /** The per-draw quantities of the stores themselves, named by {@code labels}; {@code rb}: Rao-Blackwellised. */
    public static Quantities rows(java.util.function.IntFunction<String> labels, int width, boolean rb) {
        return new Quantities() {
            @Override
            public boolean raoBlackwellised(int q) {
                return rb;
            }

            @Override
            public int count() {
                return width;
            }

            @Override
            public String label(int q) {
                return labels.apply(q);
            }

            @Override
            public boolean probability(int q) {
                return true;
            }

            @Override
            public void fill(int q, List<DrawStore> chains, int[] from, double[][] x) {
                fillStored(q, chains, from, x);
            }
        };
    }

    /** x[c][t] = the stored per-draw quantity q of chain c's draw from[c] + t. */
    public static void fillStored(int q, List<DrawStore> chains, int[] from, double[][] x) {
        for (int c = 0; c < chains.size(); c++) {
            DrawStore d = chains.get(c);
            for (int t = 0; t < x[c].length; t++) {
                x[c][t] = d.quantity(from[c] + t, q);
            }
        }
    }

    /** One of the quantities furthest from convergence; {@code mcse} NaN for one that is no probability (the log score). */
    public record Worst(String quantity, double rhat, double essBulk, double essTail, double mcse,
                        ChainDiagnostics.State state) {
    }

    /**
     * @param quantities   the summary of every quantity, index as in {@link Quantities}
     * @param logScore     the summary of the chains' log score trace
     * @param maxRhat      largest R̂ over the quantities that decide (varying or stuck) and the log score
     * @param minEssBulk   smallest bulk-ESS over the same
     * @param minEssTail   smallest tail-ESS over the same
     * @param maxMcse      largest MCSE over the deciding probabilities (NaN when none varies)
     * @param constant     quantities equal in every draw (whichever rule then judged them)
     * @param settled      probabilities whose draws span less than {@value ChainDiagnostics#SETTLE_SPAN}
     *                     (and, when the starts are known, chains that started on both sides agree)
     * @param stuck        quantities constant within each chain but different between chains
     * @param negligible   agreeing probabilities whose other value is out of every chain's reach
     *                     ({@link ChainDiagnostics.State#NEGLIGIBLE}: they do not block)
     * @param traps        agreeing quantities every chain started on one side of, the other side not
     *                     negligible ({@link ChainDiagnostics.State#TRAP}: they block)
     * @param worst        at most {@value #WORST} quantities, furthest from the targets first
     * @param drawsPerChain draws per chain used
     * @param targets      the targets the verdict used
     */
    public record Report(ChainDiagnostics.Summary[] quantities, ChainDiagnostics.Summary logScore, double maxRhat,
                         double minEssBulk, double minEssTail, double maxMcse, int constant, int settled, int stuck,
                         int negligible, int traps, List<Worst> worst, boolean converged, int drawsPerChain,
                         ConvergenceTargets targets) {
    }

    /**
     * How far a summary is from the targets: ≥ 1 fails — the largest of R̂'s, ESS's and (for a
     * probability) MCSE's shortfall, each as a ratio to its target.
     */
    static double badness(ChainDiagnostics.Summary s, ConvergenceTargets t, boolean probability) {
        return switch (s.state()) {
            case CONSTANT, SETTLED, NEGLIGIBLE -> 0;
            case STUCK, TRAP -> Double.POSITIVE_INFINITY;
            case VARIES -> Math.max(Math.max((s.rhat() - 1) / (t.rhat() - 1),
                    Double.isNaN(s.essBulk()) ? 0 : t.ess() / s.essBulk()),
                    probability && !Double.isNaN(s.mcse()) ? s.mcse() / t.mcse() : 0);
        };
    }

    /**
     * Too few draws per chain after burn-in to diagnose (fewer than 4): carries the count, so a
     * front end can name its own option for the draws stored ({@link #message}).
     */
    public static final class TooFewDraws extends org.edgewise.driver.WordedError {
        private final int perChain;

        TooFewDraws(int perChain) {
            super(text(perChain, org.edgewise.driver.InputNames.API.draws()));
            this.perChain = perChain;
        }

        /** The message with the draws stored per chain named as {@code drawsName}. */
        public String message(String drawsName) {
            return text(perChain, drawsName);
        }

        @Override
        public String worded(org.edgewise.driver.InputNames names, String heapSetting) {
            return message(names.draws());
        }

        private static String text(int perChain, String drawsName) {
            return "only " + perChain + " draws per chain were stored after the warm-up; run more steps or store more draws ("
                    + drawsName + ")";
        }
    }

    /** {@link #evaluate(List, long, Quantities, ConvergenceTargets)} with the default targets but R̂ target {@code rhatTarget}. */
    public static Report evaluate(List<DrawStore> chains, long discardUpTo, Quantities q, double rhatTarget) {
        return evaluate(chains, discardUpTo, q, ConvergenceTargets.withRhat(rhatTarget));
    }

    /** Diagnoses the draws taken after step {@code discardUpTo} (the same window length in every chain) against {@code t}. */
    public static Report evaluate(List<DrawStore> chains, long discardUpTo, Quantities q, ConvergenceTargets targets) {
        int m = chains.size();
        int[] from = new int[m];
        int len = Integer.MAX_VALUE;
        for (int c = 0; c < m; c++) {
            from[c] = chains.get(c).firstAfter(discardUpTo);
            len = Math.min(len, chains.get(c).size() - from[c]);
        }
        if (len < 4) {
            throw new TooFewDraws(Math.max(len, 0));
        }
        int draws = len;
        ChainDiagnostics.Summary[] out = IntStream.range(0, q.count()).parallel().mapToObj(k -> {
            double[][] x = new double[m][draws];
            q.fill(k, chains, from, x);
            double[] starts = new double[m];
            for (int c = 0; c < m; c++) {
                starts[c] = q.start(k, chains.get(c));
            }
            return ChainDiagnostics.summary(x, q.probability(k) ? ChainDiagnostics.SETTLE_SPAN : 0,
                    q.probability(k) ? starts : null, q.raoBlackwellised(k));
        }).toArray(ChainDiagnostics.Summary[]::new);
        double[][] tr = new double[m][draws];
        for (int c = 0; c < m; c++) {
            for (int t = 0; t < draws; t++) {
                tr[c][t] = chains.get(c).logScore(from[c] + t);
            }
        }
        ChainDiagnostics.Summary ls = ChainDiagnostics.summary(tr);
        double maxRhat = 1;
        double minBulk = Double.POSITIVE_INFINITY;
        double minTail = Double.POSITIVE_INFINITY;
        double maxMcse = Double.NaN;
        int constant = 0;
        int settled = 0;
        int stuck = 0;
        int negligible = 0;
        int traps = 0;
        boolean converged = ls.converged(targets, false);
        List<Integer> order = new ArrayList<>();
        for (int k = 0; k <= out.length; k++) {
            ChainDiagnostics.Summary s = k < out.length ? out[k] : ls;
            if (s.equalDraws()) {
                constant++;
            }
            switch (s.state()) {
                case SETTLED -> settled++;
                case STUCK -> stuck++;
                case NEGLIGIBLE -> negligible++;
                case TRAP -> traps++;
                default -> { }
            }
            if (s.state() == ChainDiagnostics.State.VARIES || s.state() == ChainDiagnostics.State.STUCK) {
                maxRhat = Math.max(maxRhat, s.rhat());
                if (!Double.isNaN(s.essBulk())) {
                    minBulk = Math.min(minBulk, s.essBulk());
                }
                if (!Double.isNaN(s.essTail())) {
                    minTail = Math.min(minTail, s.essTail());
                }
            }
            boolean prob = k < out.length && q.probability(k);
            if (prob && s.state() == ChainDiagnostics.State.VARIES && !(s.mcse() <= maxMcse)) {
                maxMcse = Double.isNaN(s.mcse()) ? Double.POSITIVE_INFINITY : s.mcse();
            }
            converged &= s.converged(targets, prob);
            if (badness(s, targets, prob) > 0) {
                order.add(k);
            }
        }
        order.sort(Comparator.comparingDouble((Integer k) -> -badness(k < out.length ? out[k] : ls, targets,
                        k < out.length && q.probability(k)))
                .thenComparingInt(k -> k));
        List<Worst> worst = new ArrayList<>();
        for (int k : order.subList(0, Math.min(WORST, order.size()))) {
            ChainDiagnostics.Summary s = k < out.length ? out[k] : ls;
            boolean prob = k < out.length && q.probability(k);
            worst.add(new Worst(k < out.length ? q.label(k) : "log score", s.rhat(), s.essBulk(), s.essTail(),
                    prob ? s.mcse() : Double.NaN, s.state()));
        }
        return new Report(out, ls, maxRhat, minBulk == Double.POSITIVE_INFINITY ? Double.NaN : minBulk,
                minTail == Double.POSITIVE_INFINITY ? Double.NaN : minTail, maxMcse, constant, settled, stuck, negligible, traps, worst,
                converged, draws, targets);
    }
}
