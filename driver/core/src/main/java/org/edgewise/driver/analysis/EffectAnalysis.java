package org.edgewise.driver.analysis;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.UserError;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.VariableOrder;
import org.edgewise.driver.effect.Effect;
import org.edgewise.driver.effect.EffectEngine;
import org.edgewise.driver.effect.EffectMeasures;
import org.edgewise.driver.effect.EffectQuery;
import org.edgewise.driver.effect.ObservedCounts;
import org.edgewise.driver.effect.SamplingDesign;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.posterior.StructurePosterior;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.store.Manifest;

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

    /** The second assumption under a case-control design on {@code outcome} (replaces "no selection on effects"). */
    static String caseControlAssumption(String outcome) {
        return "selection on the outcome only: cases and controls were sampled on " + outcome
                + " alone, independently of every other variable given " + outcome;
    }

    /**
     * A case-control design as the user wrote it: the outcome the sample was drawn on and, or null,
     * its population prevalence ({@code y=state:p}, or {@code y=p} for a binary outcome);
     * {@code outcomeWhat} and {@code prevalenceWhat} name the two inputs in messages.
     */
    public record CaseControl(String outcome, String prevalence, String outcomeWhat, String prevalenceWhat) {
    }

    /** The measures, as a user names them, and their JSON names. */
    public static final List<String> MEASURE_WORDS = List.of("risk-difference", "risk-ratio", "odds-ratio");

    /**
     * @param order    the given order, or null for unknown orders
     * @param settings unknown orders: the method and its settings, else null
     * @param design   a case-control design, or null (a sample of the population)
     * @param measure  the measure the text leads with ({@link #MEASURE_WORDS}), or null for the default
     */
    public record Request(LocalScores scores, int[] order, UnknownOrderSettings settings,
                          List<Question> questions, EffectEngine.Settings engine, CaseControl design, String measure,
                          SampleFile.Loaded saved) {
        public Request(LocalScores scores, int[] order, UnknownOrderSettings settings, List<Question> questions,
                       EffectEngine.Settings engine) {
            this(scores, order, settings, questions, engine, null, null, null);
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
        return run(scoring, averaging, questions, draws, maxHiddenStates, null, null, progress);
    }

    /** As above, under a case-control {@code design} (or null), leading with {@code measure} (or null). */
    public static List<EffectResult> run(Scoring scoring, Averaging averaging, List<Question> questions, int draws,
                                         long maxHiddenStates, CaseControl design, String measure, ProgressListener progress) {
        Inputs in = Inputs.of(scoring, averaging);
        return run(new Request(in.scores(), in.order(), in.settings(0), questions,
                new EffectEngine.Settings(draws, averaging.seed(), maxHiddenStates), design, measure, in.saved()), progress);
    }

    public static List<EffectResult> run(Request r, ProgressListener progress) {
        LocalScores ls = r.scores();
        Manifest m = ls.store().manifest();
        List<EffectQuery> qs = new ArrayList<>();
        for (Question q : r.questions()) {
            qs.add(EffectQuery.parse(m, q.doText(), q.targetText(), q.givenText(), q.versusText(), q.where(), ls.options().names()));
        }
        CaseControl cc = r.design();
        SamplingDesign sd = cc == null ? null : SamplingDesign.parse(m, cc.outcome(), cc.prevalence(), cc.outcomeWhat(), cc.prevalenceWhat());
        double[] oddsFactor = new double[qs.size()];
        for (int i = 0; i < qs.size(); i++) {
            oddsFactor[i] = sd == null ? 1 : oddsFactor(ls, sd, qs.get(i), r.questions().get(i).where(), cc.prevalenceWhat());
        }
        StructurePosterior p = StructurePosterior.of(ls, r.saved(), r.order(), r.settings(), progress);
        StructurePosterior.EffectSource src = p.effectSource();
        if (src instanceof StructurePosterior.OverOrders o) {
            double states = EffectEngine.orderEnumeration(ls, o.orders(), qs);
            if (states > r.engine().maxHiddenStates()) {
                src = sampledDags(p, src, states, r.engine());
            }
        }
        List<Effect> effects = src instanceof StructurePosterior.OverDags d
                ? EffectEngine.overDags(ls, d.dags(), qs, r.engine())
                : EffectEngine.overOrders(ls, ((StructurePosterior.OverOrders) src).orders(), qs, r.engine());
        StructurePosterior.Labels l = p.labels();
        List<EffectResult> out = new ArrayList<>();
        for (int i = 0; i < qs.size(); i++) {
            EffectResult one = result(m, ls, qs.get(i), effects.get(i), l.method(), l.dagPriorLabel(null), src.over(), r.order(),
                    src.converged(), src.maxRhat(), sd, oddsFactor[i], r.measure(), r.engine().draws());
            out.add(one.withSplit(split(m, ls, src, qs.get(i), one, effects.get(i))));
        }
        return out;
    }

    /**
     * Where the gap between conditioning and setting comes from ({@link EffectSplit}): on the risk
     * difference where risks are estimable, else (a case-control sample drawn on the outcome) on the log
     * odds ratio, which sampling on the outcome leaves unchanged; null without a reference intervention.
     */
    private static EffectResult.Split split(Manifest m, LocalScores ls, StructurePosterior.EffectSource src, EffectQuery q,
                                            EffectResult one, Effect e) {
        if (q.versus() == null) {
            return null;
        }
        Double association = one.observational().difference();
        Double setting = one.difference();
        String scale = EffectSplit.RISK_DIFFERENCE;
        if (association == null || setting == null) {
            association = finite(EffectMeasures.logOddsRatio(e.observational(), e.observationalVersus()));
            setting = finite(EffectMeasures.logOddsRatio(e.probability(), e.versusProbability()));
            scale = EffectSplit.LOG_ODDS_RATIO;
        }
        if (association == null || setting == null) {
            return null;
        }
        return EffectSplit.of(m, q.set(), q.target(), one.noPathProbability(), association, setting,
                EffectSplit.parents(ls, src, q.set()), scale);
    }

    /**
     * Where the closed-form sum over the DAGs of an order would enumerate more hidden joint states than
     * the limit: DAGs drawn from the same posterior ({@link StructurePosterior#sampleDags}: given an order,
     * independently, its parent sets being independent; from chains, one per kept order, in chain order),
     * each answered by exact inference on its mutilated graph, averaged with a Monte Carlo error.
     */
    private static StructurePosterior.OverDags sampledDags(StructurePosterior p, StructurePosterior.EffectSource exact,
                                                           double states, EffectEngine.Settings s) {
        StructurePosterior.Sampled d = p.sampleDags(s.draws(), s.seed());
        String over = String.format(Locale.ROOT, "%s, each by exact inference on its mutilated graph (sampled; see mcse); "
                + "the closed-form sum over the DAGs of an order would enumerate %.0f hidden joint states (limit %d)",
                d.sampler(), states, s.maxHiddenStates());
        return new StructurePosterior.OverDags(d.dags().forEffects(), over, exact.converged(), exact.maxRhat());
    }

    /**
     * The factor k on the odds of the target under a case-control design (1 when the target is not
     * the outcome): k = [π/(1 − π)] / [π̂/(1 − π̂)] with a prevalence π, NaN without one (risks not
     * estimable). Refuses a target that names other variables beside the outcome, and an absolute
     * risk (no reference intervention) without a prevalence.
     */
    private static double oddsFactor(LocalScores ls, SamplingDesign sd, EffectQuery q, String where, String prevalenceWhat) {
        Manifest m = ls.store().manifest();
        if (!sd.names(q.target())) {
            return 1;
        }
        String y = m.variables().get(sd.outcome()).name();
        if (Arrays.stream(q.target()).filter(s -> s != CaseParser.HIDDEN).count() > 1) {
            throw new UserError(where + "the sample was drawn on " + y + ": the target must be " + y + " alone, got "
                    + CaseParser.format(m, q.target()));
        }
        if (!sd.hasPrevalence()) {
            if (q.versus() == null) {
                throw new UserError(where + "the risk of " + y + " is not estimable from a case-control sample drawn on " + y
                        + ": give its population prevalence, or a reference intervention for an odds ratio");
            }
            return Double.NaN;
        }
        double pi = sd.prevalenceOf(m, q.target()[sd.outcome()], prevalenceWhat);
        double share = sampleShare(ls, sd, q);
        return Math.exp(Math.log(pi) - Math.log1p(-pi) - Math.log(share) + Math.log1p(-share));
    }

    /** π̂: the share of the target's state of the outcome in the store's counts. */
    private static double sampleShare(LocalScores ls, SamplingDesign sd, EffectQuery q) {
        int n = q.target().length;
        int[] none = new int[n];
        Arrays.fill(none, CaseParser.HIDDEN);
        int[] t = none.clone();
        t[sd.outcome()] = q.target()[sd.outcome()];
        return ObservedCounts.of(ls.store(), t, none).frequency();
    }

    private static EffectResult result(Manifest m, LocalScores ls, EffectQuery q, Effect e, String method,
                                       String dagPrior, String over, int[] order, Boolean converged, Double maxRhat,
                                       SamplingDesign sd, double k, String measure, int draws) {
        boolean vs = q.versus() != null;
        boolean onOutcome = sd != null && sd.names(q.target());
        boolean risks = !Double.isNaN(k);
        String est = e.exact() ? "exact" : "sampled";
        Double p = risks ? EffectMeasures.scaleOdds(e.probability(), k) : null;
        Double pv = risks && vs ? EffectMeasures.scaleOdds(e.versusProbability(), k) : null;
        EffectResult.Versus versus = vs ? new EffectResult.Versus(CaseParser.named(m, q.versus()), pv,
                risks ? scaledMcse(e.versusProbability(), e.versusMcse(), k) : Double.NaN) : null;
        double level = EffectEngine.LEVEL;
        EffectResult.Measure rd = null;
        EffectResult.Measure rr = null;
        EffectResult.Measure or = null;
        if (vs) {
            or = measure(EffectMeasures.of(EffectMeasures.Kind.ODDS_RATIO, e.probability(), e.versusProbability(), e.pairs(),
                    risks ? k : 1, level));
            if (risks) {
                rd = measure(EffectMeasures.of(EffectMeasures.Kind.RISK_DIFFERENCE, e.probability(), e.versusProbability(),
                        e.pairs(), k, level));
                rr = measure(EffectMeasures.of(EffectMeasures.Kind.RISK_RATIO, e.probability(), e.versusProbability(),
                        e.pairs(), k, level));
            }
        }
        var d = e.draws();
        EffectResult.Interval interval;
        if (vs) {
            interval = rd != null ? rd.interval() : or.interval();
        } else {
            interval = new EffectResult.Interval(d.level(), EffectMeasures.scaleOdds(d.lower(), k),
                    EffectMeasures.scaleOdds(d.upper(), k), d.of());
        }
        // the histogram is of the unweighted draws: shown only when it is what the figures are of
        EffectResult.Posterior posterior = k != 1 && !Double.isNaN(k) || onOutcome ? null
                : new EffectResult.Posterior(d.of(), d.count(), d.mean(), d.binLow(), d.binHigh(), d.counts(), d.noPathShare());
        Double obs = risks ? EffectMeasures.scaleOdds(e.observational(), k) : null;
        Double obsV = risks && vs ? EffectMeasures.scaleOdds(e.observationalVersus(), k) : null;
        EffectResult.Observational model = new EffectResult.Observational(obs, obsV, obs != null && obsV != null ? obs - obsV : null,
                risks ? "the model's conditional P(target | x = a" + (q.hasGiven() ? ", given" : "") + "): conditioning, not setting; "
                        + "averaged over structures and parameters like the effect, not the raw frequency"
                        + (k != 1 ? "; re-weighted to the prevalence" : "")
                        : "the model's conditional odds ratio only (conditioning, not setting): the probabilities are not "
                        + "estimable, the sample was drawn on the outcome",
                vs ? finite(EffectMeasures.Kind.ODDS_RATIO.of(e.observational(), e.observationalVersus())) : null);
        String lead = leading(measure, rd != null, vs);
        String measures = !vs ? null
                : "the model's estimates: each measure of P(target | do(x = a), D) and P(target | do(x = a0), D), averaged over "
                + "structures and parameters, with a " + Math.round(100 * level) + "% central credible interval over " + draws
                + " draws of a network and its parameters" + (risks ? "" : "; odds ratio only (case-control sample drawn on the outcome)");
        List<String> assumptions = sd == null ? ASSUMPTIONS
                : List.of(ASSUMPTIONS.get(0), caseControlAssumption(m.variables().get(sd.outcome()).name()), ASSUMPTIONS.get(2));
        return new EffectResult(CaseParser.named(m, q.set()), CaseParser.named(m, q.target()), q.hasGiven() ? CaseParser.named(m, q.given()) : null,
                p, risks ? scaledMcse(e.probability(), e.mcse(), k) : Double.NaN, est, versus,
                vs && risks ? p - pv : null, vs && risks && k == 1 ? e.differenceMcse() : null,
                vs && risks ? p / pv : null,
                e.noPath(), e.noPathMcse(), e.noPathExact() ? "exact" : "sampled",
                interval, posterior, model, rd, rr, or, lead, measures, observed(ls, q, sd, k),
                sd == null ? null : design(ls, sd, q, k),
                method, dagPrior, over, order == null ? null : VariableOrder.names(m, order), ResultBuilder.settings(ls),
                converged, maxRhat, assumptions, NOTE, null);
    }

    private static EffectResult.Measure measure(EffectMeasures.Measure x) {
        return new EffectResult.Measure(x.estimate(), new EffectResult.Interval(x.level(), x.lower(), x.upper(), x.intervalOf()),
                x.estimateOf(), x.noEffectProbability(), x.overallEstimate());
    }

    /** The JSON name of the measure the text leads with: the one asked, else the risk difference where estimable. */
    private static String leading(String measure, boolean risks, boolean vs) {
        if (!vs) {
            return null;
        }
        if (measure == null) {
            return risks ? "riskDifference" : "oddsRatio";
        }
        int i = MEASURE_WORDS.indexOf(measure);
        String json = EffectMeasures.Kind.values()[i].json();
        return risks || json.equals("oddsRatio") ? json : "oddsRatio";
    }

    /** The MCSE of p after scaling its odds by k: the delta method, dp'/dp = k / (1 − p + kp)². */
    private static double scaledMcse(double p, double mcse, double k) {
        double den = 1 - p + k * p;
        return k == 1 ? mcse : mcse * k / (den * den);
    }

    private static EffectResult.Observed observed(LocalScores ls, EffectQuery q, SamplingDesign sd, double k) {
        Manifest m = ls.store().manifest();
        ObservedCounts.Count a = ObservedCounts.of(ls.store(), q.target(), condition(q.set(), q.given()));
        ObservedCounts.Count b = q.versus() == null ? null : ObservedCounts.of(ls.store(), q.target(), condition(q.versus(), q.given()));
        if (a == null || q.versus() != null && b == null) {
            return new EffectResult.Observed(null, null, null, null, null, null, null, null, null, null,
                    "not available from the stored counts: no stored family contains "
                            + String.join(", ", variables(m, q)) + " together (a larger maximum number of parents would hold it)");
        }
        Double fa = finite(a.frequency());
        Double fb = b == null ? null : finite(b.frequency());
        Double crude = null;
        if (b != null && a.events() > 0 && b.events() > 0 && a.rows() > a.events() && b.rows() > b.events()) {
            // (ad)/(bc) in logs: a events, c non-events among x = a; b events, d non-events among x = a0
            crude = Math.exp(Math.log(a.events()) + Math.log(b.rows() - b.events())
                    - Math.log(b.events()) - Math.log(a.rows() - a.events()));
        }
        boolean weigh = sd != null && sd.names(q.target()) && !Double.isNaN(k);
        String label = "raw frequencies from the store's counts (rows of the stored family " + a.family()
                + "; no model, no averaging)" + (q.hasGiven() ? ", within the given stratum" : "");
        if (sd != null && sd.names(q.target())) {
            label += weigh ? "; shares in the case-control sample, and re-weighted to the population prevalence"
                    : "; shares in the case-control sample, not risks in the population";
        }
        return new EffectResult.Observed(fa, fb, a.events(), a.rows(), b == null ? null : b.events(), b == null ? null : b.rows(),
                crude, weigh && fa != null ? EffectMeasures.scaleOdds(fa, k) : null,
                weigh && fb != null ? EffectMeasures.scaleOdds(fb, k) : null, a.family(), label);
    }

    private static Double finite(double x) {
        return Double.isFinite(x) ? x : null;
    }

    private static int[] condition(int[] set, int[] given) {
        int[] c = set.clone();
        for (int v = 0; v < c.length; v++) {
            if (given[v] != CaseParser.HIDDEN) {
                c[v] = given[v];
            }
        }
        return c;
    }

    private static List<String> variables(Manifest m, EffectQuery q) {
        List<String> out = new ArrayList<>();
        for (int v = 0; v < q.set().length; v++) {
            if (q.set()[v] != CaseParser.HIDDEN || q.target()[v] != CaseParser.HIDDEN || q.given()[v] != CaseParser.HIDDEN) {
                out.add(m.variables().get(v).name());
            }
        }
        return out;
    }

    private static EffectResult.Design design(LocalScores ls, SamplingDesign sd, EffectQuery q, double k) {
        Manifest m = ls.store().manifest();
        String y = m.variables().get(sd.outcome()).name();
        if (!sd.names(q.target())) {
            return new EffectResult.Design("case-control", y, null, null, null,
                    "case-control sample drawn on " + y + "; the target is not " + y + ", so no re-weighting applies");
        }
        String state = m.variables().get(sd.outcome()).states().get(q.target()[sd.outcome()]);
        double share = sampleShare(ls, sd, q);
        if (Double.isNaN(k)) {
            return new EffectResult.Design("case-control", y, state, share, null,
                    "case-control sample drawn on " + y + ": only the odds ratio is reported for effects on " + y
                            + ", because risks, risk differences and risk ratios are not estimable when the sample was drawn on the "
                            + "outcome (its share of cases was chosen by design), while sampling on the outcome leaves the odds ratio unchanged");
        }
        double pi = EffectMeasures.scaleOdds(share, k);
        return new EffectResult.Design("case-control", y, state, share, pi, String.format(Locale.ROOT,
                "case-control sample drawn on %s, re-weighted to the population prevalence %.4g of %s=%s: cases weighted by "
                        + "pi/pi^ = %.4g and controls by (1 - pi)/(1 - pi^) = %.4g (sample share pi^ = %.4f); the odds ratio is "
                        + "unchanged by the weighting; the re-weighted effect is exact when nothing confounds the intervention and "
                        + "%s in the network, an approximation otherwise",
                y, pi, y, state, pi / share, (1 - pi) / (1 - share), share, y));
    }
}
