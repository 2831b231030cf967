package org.edgewise.driver.result;

import com.fasterxml.jackson.annotation.JsonInclude;
import java.util.List;
import java.util.Map;

/**
 * The JSON result of {@code edges} (and the input of {@code report} and {@code compare}).
 *
 * @param method                 {@code order} (given order), {@code exact} (DP over all orders) or {@code mcmc}
 * @param variables              variable names in store order
 * @param logEvidence            log evidence (given order or exact; under {@code evidenceConvention}); null for MCMC
 * @param logEvidenceNormalized  log evidence with the prior renormalised per order (given order only)
 * @param evidenceConvention     which evidence an unknown-order method weighs orders by
 * @param order                  the given order (method {@code order}), else null
 * @param settings               score, ESS (null for K2, which has none), prior, d, constraints used
 * @param store                  where the counts came from
 * @param edges                  one entry per ordered pair of distinct variables
 * @param parentSets             per variable, its most probable parent sets
 * @param bestNetwork            the single highest-scoring network (under the order, when given)
 * @param diagnostics            MCMC diagnostics, else null
 * @param features               further features (ancestor relations, Markov-blanket membership)
 * @param sensitivity            the same edges under other ESS values, when several were asked
 * @param dagPrior               the DAG prior an unknown-order result is computed under
 *                               ({@code structure-modular} or {@code order-modular}, see
 *                               {@code average.DagPrior}); {@code "either (order given)"} given an
 *                               order, where both coincide
 * @param essentialGraph         essential-graph features per unordered pair, when asked
 * @param fragile                with an ESS sweep: the headline edges (posterior ≥ 0.5) and compelled
 *                               directions (P(compelled) ≥ 0.5) whose posterior falls below 0.5 at
 *                               another ESS of the sweep ({@link Fragility}); empty when none does,
 *                               null without a sweep. Older readers ignore it (no format-version change).
 * @param candidateBoundary      from a store tallied with pruned candidates: the children whose candidate
 *                               sets still bound the posterior (after any widening); empty when none does,
 *                               null when the store was not pruned
 * @param candidateSearch        from a pruned store: which children were widened into the store's reserve,
 *                               and which could not be checked at all ({@link CandidateSearch}); null when
 *                               the store was not pruned. Older readers ignore it.
 * @param priorComparison        with {@code edges --dag-prior both}: the same posteriors under the other DAG
 *                               prior, and the headline posteriors that cross 0.5 between the two
 *                               ({@link Fragility#acrossPriors}); null otherwise. Older readers ignore it.
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record EdgeResult(String method, List<String> variables, Double logEvidence,
                         Double logEvidenceNormalized, String evidenceConvention, List<String> order,
                         Settings settings, Provenance store, List<Edge> edges,
                         List<VariableParents> parentSets, Network bestNetwork,
                         Diagnostics diagnostics, List<Feature> features,
                         List<Sensitivity> sensitivity, String dagPrior,
                         List<EssentialPair> essentialGraph, List<Fragile> fragile, List<String> candidateBoundary,
                         CandidateSearch candidateSearch, PriorComparison priorComparison)
        implements JsonResult {
    /** A result without the {@code fragile} list (computed by {@link Fragility} once the sweep is in). */
    public EdgeResult(String method, List<String> variables, Double logEvidence,
                      Double logEvidenceNormalized, String evidenceConvention, List<String> order,
                      Settings settings, Provenance store, List<Edge> edges,
                      List<VariableParents> parentSets, Network bestNetwork,
                      Diagnostics diagnostics, List<Feature> features,
                      List<Sensitivity> sensitivity, String dagPrior,
                      List<EssentialPair> essentialGraph) {
        this(method, variables, logEvidence, logEvidenceNormalized, evidenceConvention, order, settings, store, edges,
                parentSets, bestNetwork, diagnostics, features, sensitivity, dagPrior, essentialGraph, null, null, null, null);
    }

    /** The same result with {@code fragile} as its fragility list. */
    public EdgeResult withFragile(List<Fragile> fragile) {
        return copy(fragile, candidateBoundary, candidateSearch);
    }

    /**
     * The same result with {@code boundary}: the children whose pruned candidate sets bound the
     * posterior (empty when none does; null when the store was not pruned).
     */
    public EdgeResult withCandidateBoundary(List<String> boundary) {
        return copy(fragile, boundary, candidateSearch);
    }

    /** The same result with {@code boundary} and {@code search} (see the record's description) in place of its own. */
    public EdgeResult withCandidates(List<String> boundary, CandidateSearch search) {
        return copy(fragile, boundary, search);
    }

    /** The same result with {@code fragile}, {@code boundary} and {@code search} in place of its own. */
    private EdgeResult copy(List<Fragile> fragile, List<String> boundary, CandidateSearch search) {
        return new EdgeResult(method, variables, logEvidence, logEvidenceNormalized, evidenceConvention, order, settings,
                store, edges, parentSets, bestNetwork, diagnostics, features, sensitivity, dagPrior, essentialGraph, fragile,
                boundary, search, priorComparison);
    }

    /** The same result with {@code c}, the comparison with the other DAG prior, beside it. */
    public EdgeResult withPriorComparison(PriorComparison c) {
        return new EdgeResult(method, variables, logEvidence, logEvidenceNormalized, evidenceConvention, order, settings,
                store, edges, parentSets, bestNetwork, diagnostics, features, sensitivity, dagPrior, essentialGraph, fragile,
                candidateBoundary, candidateSearch, c);
    }

    /**
     * The result's posteriors under the other DAG prior (same store, scoring, tiers and method): its
     * {@code dagPrior}, log evidence, edges and essential graph (when computed), and {@code fragile}: the
     * headline posteriors (≥ 0.5 under one prior) that fall below 0.5 under the other; empty when none does.
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record PriorComparison(String dagPrior, Double logEvidence, List<Edge> edges, List<EssentialPair> essentialGraph,
                                  List<PriorFragile> fragile) {
    }

    /**
     * A posterior that crosses 0.5 between the two DAG priors: {@code kind} {@code edge} (P(from → to)) or
     * {@code compelled}; {@code posterior} under the result's own prior ({@code dagPrior}), {@code other}
     * under the other ({@code otherDagPrior}).
     */
    public record PriorFragile(String kind, String from, String to, double posterior, String dagPrior, double other,
                               String otherDagPrior) {
    }

    /**
     * How a result from pruned candidates searched beyond them (the iterative search-space expansion of
     * Kuipers, Suter &amp; Moffa 2022, over what the store holds).
     *
     * @param reserve   true when the store kept a reserve of further candidates to widen into
     * @param widened   each widening, in the order made: the round after which it was made, the child,
     *                  the candidates added (from its reserve) and the rule that asked for it
     * @param unchecked children whose candidate sets were pruned and that no rule could check: more
     *                  candidates than the in-degree bound (so the set cannot be filled) and no stored
     *                  family with a parent beyond them; their edges may rest on a proxy of a pruned parent
     */
    public record CandidateSearch(boolean reserve, List<Widening> widened, List<String> unchecked) {
    }

    /** One child widened into its reserve after sampling round {@code round} (1 = the first). */
    public record Widening(int round, String child, List<String> added, String rule) {
    }
    @Override
    public String kind() {
        return "edges";
    }

    @Override
    public int formatVersion() {
        return ResultJson.EDGES_FORMAT_VERSION;
    }

    /**
     * Posterior features of the essential graph (CPDAG; Chickering 1995, Andersson, Madigan &amp;
     * Perlman 1997) of one unordered pair {a, b}: P(adjacent), P(a → b compelled), P(b → a
     * compelled), P(adjacent and reversible); adjacent = aToB + bToA + undirected. {@code mcse}
     * is the largest Monte Carlo standard error of the four (null when exact).
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record EssentialPair(String a, String b, double adjacent, double aToB, double bToA, double undirected,
                                Double mcse) {
    }

    /** An edge posterior; {@code mcse} and {@code rhat} only for MCMC. */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Edge(String from, String to, double posterior, Double mcse, Double rhat) {
        public Edge(String from, String to, double posterior) {
            this(from, to, posterior, null, null);
        }
    }

    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Settings(String score, Double ess, String prior, int maxParents,
                           List<String> forbid, List<String> require, List<List<String>> tiers) {
    }

    /**
     * Where the counts came from; {@code sample} (optional, absent unless the result was answered
     * from a saved posterior sample) names that sample; {@code missingValues} (optional, absent unless
     * the store's missing cells were averaged over) says how, and that missing at random is assumed.
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Provenance(String path, List<String> input, long rows, String fingerprint,
                             String createdAt, String storedScore, double storedEss,
                             Map<String, List<String>> candidates, SampleRef sample, String missingValues) {
        public Provenance(String path, List<String> input, long rows, String fingerprint, String createdAt,
                          String storedScore, double storedEss, Map<String, List<String>> candidates) {
            this(path, input, rows, fingerprint, createdAt, storedScore, storedEss, candidates, null, null);
        }

        /** The same provenance naming the saved sample the result was answered from. */
        public Provenance withSample(SampleRef s) {
            return new Provenance(path, input, rows, fingerprint, createdAt, storedScore, storedEss, candidates, s,
                    missingValues);
        }

        /** The same provenance saying how the store averaged over its missing values. */
        public Provenance withMissingValues(String words) {
            return new Provenance(path, input, rows, fingerprint, createdAt, storedScore, storedEss, candidates, sample,
                    words);
        }
    }

    /**
     * The saved posterior sample a result was answered from: its directory, how it was drawn
     * ({@code method} order, exact or mcmc; {@code sampler} for people), its chains and DAGs per
     * chain, its seed, and — drawn by MCMC — the sampler's verdict ({@code converged}; null otherwise);
     * {@code fingerprint}: the SHA-256 of its files (manifest, then DAGs), which changes with any byte of them;
     * {@code storeFingerprint}: the data fingerprint of the store it was drawn from.
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record SampleRef(String path, String method, String sampler, int chains, int dagsPerChain, long seed,
                            Boolean converged, String fingerprint, String storeFingerprint) {
    }

    public record ParentSet(List<String> parents, double posterior) {
    }

    public record VariableParents(String variable, List<ParentSet> top) {
    }

    /** A single network: each variable's parents, and its total log score (plus log prior). */
    public record Network(double logScore, Map<String, List<String>> parents) {
    }

    /**
     * MCMC diagnostics (Vehtari, Gelman, Simpson, Carpenter &amp; Bürkner 2021), over every edge, feature
     * and the log score trace: {@code rhat} the largest rank-normalised split-R̂ (max of bulk and
     * folded; +∞ when a quantity is stuck: constant within each chain, different between chains);
     * {@code bulkEffectiveSampleSize} the smallest bulk effective sample size;
     * {@code tailEffectiveSampleSize} the smallest tail effective sample size (never {@code ess}: that
     * is BDeu's equivalent sample size, {@link Settings#ess});
     * {@code converged}: every quantity has R̂ &lt; {@code rhatTarget} and bulk effective sample size ≥
     * {@code effectiveSampleSizeTarget}, and every reported edge and feature posterior a Monte Carlo
     * standard error ≤ {@code mcseTarget}. Quantities whose draws agree ({@code constant}: equal in every
     * draw; or within {@code settleSpan}) are judged by the rule the chains' dispersed starts allow, and
     * counted by it: {@code settled} (chains that started on both sides of it agree: does not block),
     * {@code negligible} (no chain started on the other side, but its Rao-Blackwellised probability is
     * within 1e-6 of 0 or 1 in every chain: does not block) and {@code traps} (every chain started on one
     * side and the other side is not negligible: blocks; such a quantity's {@code worst} state is
     * {@code trap}); {@code negligible} and {@code traps} are null in results that predate the rule;
     * {@code mcse}: the largest MCSE of a deciding probability; {@code worst}: the quantities furthest
     * from the targets;
     * {@code stopReason}: {@code steps} (a fixed run), {@code converged}, {@code max-steps} or
     * {@code max-time}; {@code burnIn}: the warm-up, steps per chain discarded before the kept ones;
     * {@code traces}: per chain (thinned), the log evidence of the current order (order MCMC) or
     * the log score of the current partition's DAG (partition MCMC), for trace plots;
     * {@code tempering}: the ladder of tempered chains behind each reported chain (null without);
     * {@code plannedMemoryBytes}: the memory planned before sampling (per-child tables, chains, draw stores).
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Diagnostics(int chains, long steps, long burnIn, long seed, double acceptance,
                              double rhat, double bulkEffectiveSampleSize, boolean converged, List<List<Double>> traces,
                              int traceThin, Double rhatTarget, Double effectiveSampleSizeTarget, Double mcseTarget,
                              Double mcse, Double tailEffectiveSampleSize, String stopReason,
                              Integer constant, Integer settled, Integer stuck, Double settleSpan, List<Worst> worst,
                              Integer drawsPerChain, Double relocateShare, Integer checks, Double checkSeconds,
                              Double samplingSeconds, Tempering tempering, Long plannedMemoryBytes, Integer negligible,
                              Integer traps) {
        /** Diagnostics without the agreement rules' counts ({@code negligible}, {@code traps}: null). */
        public Diagnostics(int chains, long steps, long burnIn, long seed, double acceptance,
                           double rhat, double bulkEffectiveSampleSize, boolean converged, List<List<Double>> traces,
                           int traceThin, Double rhatTarget, Double effectiveSampleSizeTarget, Double mcseTarget,
                           Double mcse, Double tailEffectiveSampleSize, String stopReason,
                           Integer constant, Integer settled, Integer stuck, Double settleSpan, List<Worst> worst,
                           Integer drawsPerChain, Double relocateShare, Integer checks, Double checkSeconds,
                           Double samplingSeconds, Tempering tempering, Long plannedMemoryBytes) {
            this(chains, steps, burnIn, seed, acceptance, rhat, bulkEffectiveSampleSize, converged, traces, traceThin,
                    rhatTarget, effectiveSampleSizeTarget, mcseTarget, mcse, tailEffectiveSampleSize, stopReason, constant,
                    settled, stuck, settleSpan, worst, drawsPerChain, relocateShare, checks, checkSeconds, samplingSeconds,
                    tempering, plannedMemoryBytes, null, null);
        }

        /** Diagnostics with the original fields only. */
        public Diagnostics(int chains, long steps, long burnIn, long seed, double acceptance, double rhat,
                           double bulkEffectiveSampleSize, boolean converged, List<List<Double>> traces, int traceThin) {
            this(chains, steps, burnIn, seed, acceptance, rhat, bulkEffectiveSampleSize, converged, traces, traceThin, null, null, null, null,
                    null, null, null, null, null, null, null, null, null, null, null, null, null, null, null, null);
        }

        /** The same diagnostics with another verdict, largest MCSE and worst list (e.g. after checking the reported estimates). */
        public Diagnostics withVerdict(boolean converged, Double mcse, List<Worst> worst) {
            return new Diagnostics(chains, steps, burnIn, seed, acceptance, rhat, bulkEffectiveSampleSize, converged,
                    traces, traceThin, rhatTarget, effectiveSampleSizeTarget, mcseTarget, mcse, tailEffectiveSampleSize,
                    stopReason, constant, settled, stuck, settleSpan, worst,
                    drawsPerChain, relocateShare, checks, checkSeconds, samplingSeconds, tempering, plannedMemoryBytes,
                    negligible, traps);
        }
    }

    /**
     * Metropolis-coupled chains (parallel tempering): each reported chain is a ladder of {@code rungs}
     * order chains with targets π^β, β geometric from 1 down to {@code betaMin}; only β = 1 is
     * recorded. {@code swapAcceptance}: per adjacent pair of rungs, the share of proposed exchanges
     * accepted (mean over chains).
     */
    public record Tempering(int rungs, double betaMin, List<Double> swapAcceptance) {
    }

    /**
     * A quantity far from convergence: {@code rhat} (null when infinite), {@code bulkEffectiveSampleSize},
     * {@code mcse} (Monte Carlo standard error; null for a quantity that is no reported probability,
     * such as the log score) and {@code tailEffectiveSampleSize} (null when undefined), {@code state}
     * {@code varies} or {@code stuck}.
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Worst(String quantity, Double rhat, Double bulkEffectiveSampleSize, Double mcse,
                        Double tailEffectiveSampleSize, String state) {
    }

    /** A feature beyond a single edge: {@code kind} {@code ancestor} (from ⇝ to) or {@code markov-blanket}. */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Feature(String kind, String from, String to, double posterior, Double mcse) {
    }

    /**
     * The result at another ESS of a sweep: its log evidence, edges and, when the essential graph
     * was computed, its essential-graph features (null otherwise, and in results written before).
     */
    @JsonInclude(JsonInclude.Include.NON_NULL)
    public record Sensitivity(double ess, Double logEvidence, List<Edge> edges, List<EssentialPair> essentialGraph) {
        public Sensitivity(double ess, Double logEvidence, List<Edge> edges) {
            this(ess, logEvidence, edges, null);
        }
    }

    /**
     * A headline posterior that crosses 0.5 within the ESS sweep: {@code kind} {@code edge}
     * (P(from → to)) or {@code compelled} (P(from → to compelled in the essential graph));
     * {@code posterior} at the result's own ESS ({@code ess}); {@code min} and {@code max} over
     * every ESS of the sweep (the result's own included), reached at {@code minEss} and {@code maxEss}.
     */
    public record Fragile(String kind, String from, String to, double posterior, Double ess,
                          double min, double minEss, double max, double maxEss) {
    }
}
