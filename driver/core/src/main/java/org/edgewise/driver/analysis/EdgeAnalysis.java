package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Consumer;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.dag.DrawnDags;
import org.edgewise.driver.average.CandidateBoundary;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.convergence.McseBound;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.VariableOrder;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.posterior.SavedSample;
import org.edgewise.driver.posterior.StructurePosterior;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.Fragility;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.mcmc.McmcResult;

/**
 * The {@code edges} service: asks a {@link StructurePosterior} for its edge and parent-set
 * posteriors, features and diagnostics and assembles the {@link EdgeResult} — the same assembly
 * whatever the source of structures. With several scoring options (in practice several ESS values,
 * to which BDeu results are known to be sensitive — Silander, Kontkanen &amp; Myllymäki 2007) the
 * first gives the result and every further one a {@link EdgeResult.Sensitivity} entry beside it,
 * and the headline posteriors that cross 0.5 within the sweep are listed as fragile ({@link Fragility}).
 * A Monte Carlo estimate of exactly 0 or 1 reports the rule-of-three bound 3/K as its error
 * ({@link McseBound}), not 0; pairs that cannot be edges at all (no candidate) are exactly 0 with error 0.
 */
public final class EdgeAnalysis {
    private EdgeAnalysis() {
    }

    /**
     * The averaged edges of a request: the store and scoring of {@code scoring} (several ESS values
     * make a sensitivity sweep), averaged over what {@code averaging} asks for.
     */
    public static EdgeResult run(Scoring scoring, Averaging averaging, int topParents, ProgressListener progress,
                                 Consumer<EdgeResult> eachRun) {
        Inputs in = Inputs.of(scoring, averaging, false);
        return run(in.store(), scoring.store(), in.saved(), in.options(), in.order(), in.settings(topParents), topParents,
                progress, eachRun);
    }

    /**
     * The averaged edges under both DAG priors over unknown orders (DESIGN.md, "DAG priors over unknown
     * orders"): the result under the structure-modular prior (with its ESS sweep, if any), and beside it
     * ({@link EdgeResult#priorComparison}) the same request under the order-modular prior at the first ESS,
     * with the headline posteriors that cross 0.5 between the two ({@link Fragility#acrossPriors}).
     * A request answered from a saved sample (its DAGs drawn once, under one prior) is refused.
     */
    public static EdgeResult runBothPriors(Scoring scoring, Averaging averaging, int topParents, ProgressListener progress,
                                           Consumer<EdgeResult> eachRun) {
        Inputs in = Inputs.of(scoring, averaging.withDagPrior(DagPrior.ORDER_MODULAR));
        if (in.saved() != null || in.order() != null) {
            throw new UserError(in.order() != null ? "given an order both DAG priors coincide: there is nothing to compare"
                    : "both DAG priors need the structures averaged under each; this request answers from a saved sample of DAGs "
                    + "drawn once, under one prior");
        }
        EdgeResult primary = run(scoring, averaging.withDagPrior(DagPrior.STRUCTURE_MODULAR), topParents, progress, eachRun);
        EdgeResult other = run(in.store(), scoring.store(), null, List.of(in.options().get(0)), null, in.settings(topParents),
                topParents, progress, eachRun);
        return primary.withPriorComparison(comparison(primary, other));
    }

    /** {@code other} (the same request under the other DAG prior) as the comparison beside {@code r}. */
    static EdgeResult.PriorComparison comparison(EdgeResult r, EdgeResult other) {
        return new EdgeResult.PriorComparison(other.dagPrior(), other.logEvidence(), other.edges(), other.essentialGraph(),
                Fragility.acrossPriors(r, other.dagPrior(), other.edges(), other.essentialGraph()));
    }

    /** As {@link #run(ScoreStore, Path, SampleFile.Loaded, List, int[], UnknownOrderSettings, int, ProgressListener, Consumer)} without a saved sample. */
    public static EdgeResult run(ScoreStore store, Path storePath, List<ScoringOptions> options, int[] order,
                                 UnknownOrderSettings settings, int topParents, ProgressListener progress,
                                 Consumer<EdgeResult> eachRun) {
        return run(store, storePath, null, options, order, settings, topParents, progress, eachRun);
    }

    /**
     * The averaged edges under each of {@code options} (the first is the result, the rest its
     * sensitivity list): given {@code order} when it is not null, else as {@code settings} say;
     * {@code eachRun} sees every run's result (e.g. to warn about chains that disagree).
     */
    public static EdgeResult run(ScoreStore store, Path storePath, SampleFile.Loaded saved, List<ScoringOptions> options,
                                 int[] order, UnknownOrderSettings settings, int topParents, ProgressListener progress,
                                 Consumer<EdgeResult> eachRun) {
        EdgeResult primary = null;
        List<EdgeResult.Sensitivity> sens = new ArrayList<>();
        for (ScoringOptions so : options) {
            CandidateWidening.Outcome o = CandidateWidening.run(store, so, saved, order, settings, progress);
            StructurePosterior p = o.posterior();
            LocalScores ls = p.scores();
            if (primary == null && p.cost() != null) {
                progress.note(p.cost() + (options.size() > 1 ? " (for each of the " + options.size() + " ESS values)" : ""));
            }
            EdgeResult r = result(p, settings, storePath, topParents).withCandidates(o.boundary(), o.search());
            eachRun.accept(r);
            if (primary == null) {
                primary = r;
            } else {
                sens.add(new EdgeResult.Sensitivity(ls.familyScore().ess(), r.logEvidence(), r.edges(), r.essentialGraph()));
            }
        }
        if (sens.isEmpty()) {
            return primary;
        }
        EdgeResult swept = new EdgeResult(primary.method(), primary.variables(), primary.logEvidence(), primary.logEvidenceNormalized(),
                primary.evidenceConvention(), primary.order(), primary.settings(), primary.store(), primary.edges(),
                primary.parentSets(), primary.bestNetwork(), primary.diagnostics(), primary.features(), sens,
                primary.dagPrior(), primary.essentialGraph());
        return swept.withFragile(Fragility.of(swept)).withCandidates(primary.candidateBoundary(), primary.candidateSearch());
    }

    /** The edges of {@code ls} over unknown orders as {@code s} says (the Java API's one-call form). */
    public static EdgeResult edges(LocalScores ls, Path storePath, UnknownOrderSettings s, ProgressListener progress) {
        StructurePosterior p = StructurePosterior.of(ls, null, s, progress);
        return result(p, s, storePath, s.topParents()).withCandidateBoundary(candidateBoundary(ls, p.setPosterior()));
    }

    /** The result of one posterior; {@code s} (null given an order) says which features were asked for. */
    static EdgeResult result(StructurePosterior p, UnknownOrderSettings s, Path storePath, int topParents) {
        LocalScores ls = p.scores();
        List<String> names = names(ls);
        StructurePosterior.Labels l = p.labels();
        StructurePosterior.EdgeEstimates e = p.edges();
        EdgeResult.Settings base = ResultBuilder.settings(ls);
        EdgeResult.Settings settings = new EdgeResult.Settings(base.score(), base.ess(), base.prior(), base.maxParents(),
                base.forbid(), base.require(), p.tiers());
        int[] order = p.order();
        McmcResult chains = p.chains();
        DrawnDags essential = p.essentialDraws();
        EdgeResult r = new EdgeResult(l.method(), names, e.logEvidence(), e.logEvidenceNormalized(),
                l.dagPriorLabel(ResultBuilder.ORDER_MODULAR), order == null ? null : VariableOrder.names(ls.store().manifest(), order),
                settings, provenance(p, storePath),
                e.sampled() == null ? ResultBuilder.edges(names, e.posterior()) : sampledEdges(names, e),
                ResultBuilder.topParents(ls, p.setPosterior(), topParents),
                p.bestSets() == null ? null : ResultBuilder.network(ls, p.bestSets()),
                chains != null ? ChainReport.diagnostics(chains, s)
                        : p instanceof SavedSample ss ? ChainReport.fromSample(ss, e) : null, features(names, s, p.features()), null,
                l.dagPriorLabel(ResultBuilder.EITHER_GIVEN_ORDER), essential == null ? null : essential(names, essential));
        return ReportedMcse.check(r);
    }

    /** The store's provenance, naming the saved sample when the result was answered from one. */
    static EdgeResult.Provenance provenance(StructurePosterior p, Path storePath) {
        EdgeResult.Provenance base = ResultBuilder.provenance(p.scores().store(), storePath);
        return p instanceof SavedSample ss ? base.withSample(sampleRef(ss)) : base;
    }

    /** How a result names the saved sample it was answered from. */
    static EdgeResult.SampleRef sampleRef(SavedSample ss) {
        SampleFile.Info i = ss.saved().info();
        return new EdgeResult.SampleRef(ss.saved().path().toString(), i.method(), i.sampler(), i.chains(), i.dagsPerChain(),
                i.seed(), i.diagnostics() == null ? null : i.diagnostics().converged(), SampleFile.fingerprint(ss.saved().path()),
                i.store().fingerprint());
    }

    /**
     * The children whose pruned candidate sets bound the posterior ({@link CandidateBoundary}):
     * names, empty when none does; null when the store was tallied without pruning.
     */
    static List<String> candidateBoundary(LocalScores ls, double[][] setPosterior) {
        List<CandidateBoundary.Finding> found = CandidateBoundary.find(ls, setPosterior);
        if (found == null) {
            return null;
        }
        List<String> out = new ArrayList<>();
        for (CandidateBoundary.Finding f : found) {
            out.add(ls.store().variables().get(f.child()).name());
        }
        return out;
    }

    private static List<EdgeResult.Edge> sampledEdges(List<String> names, StructurePosterior.EdgeEstimates est) {
        int n = names.size();
        List<EdgeResult.Edge> edges = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a == b) {
                    continue;
                }
                Estimate e = est.sampled()[a][b];
                edges.add(e == null ? new EdgeResult.Edge(names.get(a), names.get(b), 0.0, 0.0, null)
                        : new EdgeResult.Edge(names.get(a), names.get(b), clamp(e.mean()),
                        finite(McseBound.reported(clamp(e.mean()), e.mcse(), est.draws())), finite(e.rhat())));
            }
        }
        return edges;
    }

    /**
     * The {@code features} of a result: with {@code s.ancestors()} a ⇝ b for every ordered pair
     * a ≠ b, with {@code s.markovBlanket()} a — b for every a &lt; b; posteriors clamped to [0, 1].
     */
    private static List<EdgeResult.Feature> features(List<String> names, UnknownOrderSettings s, StructurePosterior.Features f) {
        if (f == null) {
            return null;
        }
        int n = names.size();
        List<EdgeResult.Feature> out = new ArrayList<>();
        if (s.ancestors()) {
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (a != b) {
                        out.add(new EdgeResult.Feature("ancestor", names.get(a), names.get(b), clamp(f.ancestor()[a][b]),
                                finite(f.ancestorMcse()[a][b])));
                    }
                }
            }
        }
        if (s.markovBlanket()) {
            for (int a = 0; a < n; a++) {
                for (int b = a + 1; b < n; b++) {
                    out.add(new EdgeResult.Feature("markov-blanket", names.get(a), names.get(b), clamp(f.blanket()[a][b]),
                            finite(f.blanketMcse()[a][b])));
                }
            }
        }
        return out;
    }

    /** Essential-graph features of every unordered pair: adjacent, compelled either way, reversible. */
    static List<EdgeResult.EssentialPair> essential(List<String> names, DrawnDags d) {
        int n = names.size();
        List<EdgeResult.EssentialPair> out = new ArrayList<>();
        for (int a = 0; a < n; a++) {
            for (int b = a + 1; b < n; b++) {
                Estimate adj = d.estimate(d.adjacent(a, b));
                Estimate ab = d.estimate(d.compelled(a, b));
                Estimate ba = d.estimate(d.compelled(b, a));
                Estimate un = d.estimate(d.reversible(a, b));
                double mcse = Math.max(Math.max(adj.mcse(), ab.mcse()), Math.max(ba.mcse(), un.mcse()));
                out.add(new EdgeResult.EssentialPair(names.get(a), names.get(b), clamp(adj.mean()), clamp(ab.mean()),
                        clamp(ba.mean()), clamp(un.mean()), finite(mcse)));
            }
        }
        return out;
    }

    static Double finite(double x) {
        return Double.isFinite(x) ? x : null;
    }

    static double clamp(double p) {
        return p < 0 ? 0 : Math.min(p, 1.0);
    }

    static List<String> names(LocalScores ls) {
        List<String> out = new ArrayList<>();
        for (var v : ls.store().variables()) {
            out.add(v.name());
        }
        return out;
    }
}
