package org.edgewise.driver.analysis;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.VariableOrder;
import org.edgewise.driver.effect.Effect;
import org.edgewise.driver.effect.EffectEngine;
import org.edgewise.driver.effect.EffectQuery;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.posterior.StructurePosterior;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;

/**
 * The {@code effect} service: parses the questions, asks the request's {@link StructurePosterior}
 * what to average over — weighted orders (each summed over its DAGs in closed form) or weighted DAGs
 * — runs the {@link EffectEngine} over it and assembles {@link EffectResult}s. Which orders or DAGs,
 * exact or sampled, is the posterior's to say ({@link StructurePosterior#effectSource}).
 */
public final class EffectAnalysis {
    /** Printed with every result (DESIGN.md, "Interventions"). */
    public static final List<String> ASSUMPTIONS = List.of(
            "causal sufficiency: the variables include every common cause of the ones involved (no hidden confounders)",
            "no selection on effects: the data were not selected on an outcome or a consequence of one",
            "causal reading of the DAG: each arrow is a direct causal influence, so an intervention cuts only the arrows into the variables it sets");

    public static final String NOTE = "A model-based estimate of what setting the variables would do, under the assumptions listed; "
            + "evidence to weigh with domain experts and local practice, not proof of causation and never a substitute for an experiment where one is possible.";

    /**
     * One question as the user wrote it.
     *
     * @param where prefix of every message about it (e.g. "cases.csv: line 3: "), or ""
     */
    public record Question(String doText, String targetText, String givenText, String versusText, String where) {
    }

    /**
     * @param order    the given order, or null for unknown orders
     * @param settings unknown orders: the method and its settings, else null
     */
    public record Request(LocalScores scores, int[] order, UnknownOrderSettings settings,
                          List<Question> questions, EffectEngine.Settings engine, SampleFile.Loaded saved) {
        public Request(LocalScores scores, int[] order, UnknownOrderSettings settings, List<Question> questions,
                       EffectEngine.Settings engine) {
            this(scores, order, settings, questions, engine, null);
        }
    }

    private EffectAnalysis() {
    }

    /** Draws of (DAG, parameters) for an effect's credible interval and histogram by default. */
    public static final int DEFAULT_DRAWS = EffectEngine.DEFAULT_DRAWS;

    /**
     * The effects of {@code questions} on the store and scoring of {@code scoring}, averaged over
     * what {@code averaging} asks for, with {@code draws} (DAG, parameter) draws for each interval.
     */
    public static List<EffectResult> run(Scoring scoring, Averaging averaging, List<Question> questions, int draws,
                                         long maxHiddenStates, ProgressListener progress) {
        ScoreStore store = scoring.read();
        int[] order = averaging.order() == null ? null
                : VariableOrder.parse(store.manifest(), averaging.order(), scoring.names().order());
        SampleFile.Loaded saved = averaging.saved(store, scoring.store());
        LocalScores ls = LocalScores.build(store, saved == null ? scoring.first() : saved.info().scoring().options(scoring.names()));
        return run(new Request(ls, order, averaging.settings(0), questions,
                new EffectEngine.Settings(draws, averaging.seed(), maxHiddenStates), saved), progress);
    }

    public static List<EffectResult> run(Request r, ProgressListener progress) {
        LocalScores ls = r.scores();
        Manifest m = ls.store().manifest();
        List<EffectQuery> qs = new ArrayList<>();
        for (Question q : r.questions()) {
            qs.add(EffectQuery.parse(m, q.doText(), q.targetText(), q.givenText(), q.versusText(), q.where(), ls.options().names()));
        }
        StructurePosterior p = StructurePosterior.of(ls, r.saved(), r.order(), r.settings(), progress);
        StructurePosterior.EffectSource src = p.effectSource();
        List<Effect> effects = src instanceof StructurePosterior.OverDags d
                ? EffectEngine.overDags(ls, d.dags(), qs, r.engine())
                : EffectEngine.overOrders(ls, ((StructurePosterior.OverOrders) src).orders(), qs, r.engine());
        StructurePosterior.Labels l = p.labels();
        List<EffectResult> out = new ArrayList<>();
        for (int i = 0; i < qs.size(); i++) {
            out.add(result(m, ls, qs.get(i), effects.get(i), l.method(), l.dagPriorLabel(null), src.over(), r.order(),
                    src.converged(), src.maxRhat()));
        }
        return out;
    }

    private static EffectResult result(Manifest m, LocalScores ls, EffectQuery q, Effect e, String method,
                                       String dagPrior, String over, int[] order, Boolean converged, Double maxRhat) {
        boolean vs = q.versus() != null;
        String est = e.exact() ? "exact" : "sampled";
        EffectResult.Versus versus = vs ? new EffectResult.Versus(CaseParser.named(m, q.versus()), e.versusProbability(), e.versusMcse()) : null;
        var d = e.draws();
        return new EffectResult(CaseParser.named(m, q.set()), CaseParser.named(m, q.target()), q.hasGiven() ? CaseParser.named(m, q.given()) : null,
                e.probability(), e.mcse(), est, versus, vs ? e.difference() : null, vs ? e.differenceMcse() : null,
                vs ? e.ratio() : null, e.noPath(), e.noPathMcse(), e.noPathExact() ? "exact" : "sampled",
                new EffectResult.Interval(d.level(), d.lower(), d.upper(), d.of()),
                new EffectResult.Posterior(d.of(), d.count(), d.mean(), d.binLow(), d.binHigh(), d.counts(), d.noPathShare()),
                new EffectResult.Observational(e.observational(), vs ? e.observationalVersus() : null,
                        vs ? e.observational() - e.observationalVersus() : null),
                method, dagPrior, over, order == null ? null : VariableOrder.names(m, order), ResultBuilder.settings(ls),
                converged, maxRhat, ASSUMPTIONS, NOTE);
    }

}
