package org.edgewise.driver.analysis;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.DagPrior;
import org.edgewise.driver.average.ExactOrderSum;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.OrderMcmc;
import org.edgewise.driver.average.OrderPosterior;
import org.edgewise.driver.average.OrderSampling;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.VariableOrder;
import org.edgewise.driver.effect.Effect;
import org.edgewise.driver.effect.EffectEngine;
import org.edgewise.driver.effect.EffectOrders;
import org.edgewise.driver.effect.EffectQuery;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.query.UnknownOrderPrediction;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.result.ResultBuilder;
import org.edgewise.driver.store.Manifest;

/**
 * The {@code effect} service: parses the questions, picks the orders to average over, runs the
 * {@link EffectEngine} and assembles {@link EffectResult}s.
 * <ul>
 * <li>given an order: exact;</li>
 * <li>over unknown orders, order-modular prior, {@code exact}: every allowed order with its exact
 * weight when n ≤ {@value #ENUMERATE_MAX} (at most 40,320 orders), else at most
 * {@value #MAX_SAMPLED_ORDERS} orders drawn from the exact order posterior (Koivisto &amp; Sood
 * 2004), with MCSE;</li>
 * <li>{@code mcmc}: the orders kept by the chains, at most {@value #MAX_ORDERS_PER_CHAIN} per chain
 * evenly spaced, with an autocorrelation-aware MCSE;</li>
 * <li>structure-modular prior: DAGs drawn from the structure-modular posterior ({@link StructureDraws}:
 * exact draws for {@code exact}, partition-MCMC DAGs for {@code mcmc}) fed to
 * {@link EffectEngine#overDags}, with MCSE (sampled).</li>
 * </ul>
 */
public final class EffectAnalysis {
    /** Largest n for which every allowed order is enumerated. */
    public static final int ENUMERATE_MAX = 8;
    /** Orders drawn from the exact order posterior beyond {@link #ENUMERATE_MAX}. */
    public static final int MAX_SAMPLED_ORDERS = 2000;
    /** Orders kept per MCMC chain. */
    public static final int MAX_ORDERS_PER_CHAIN = 500;

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
     * @param dagPrior unknown orders: the DAG prior asked for
     */
    public record Request(LocalScores scores, int[] order, UnknownOrderSettings settings, DagPrior dagPrior,
                          List<Question> questions, EffectEngine.Settings engine) {
    }

    private EffectAnalysis() {
    }

    /** DAGs drawn under the structure-modular prior (exact draws, or spread over the MCMC chains' orders). */
    public static final int DAG_DRAWS = 20_000;

    public static List<EffectResult> run(Request r, ProgressListener progress) {
        LocalScores ls = r.scores();
        Manifest m = ls.store().manifest();
        List<EffectQuery> qs = new ArrayList<>();
        for (Question q : r.questions()) {
            qs.add(EffectQuery.parse(m, q.doText(), q.targetText(), q.givenText(), q.versusText(), q.where(), ls.options().names()));
        }
        int n = ls.variableCount();
        EffectOrders src;
        String method;
        String over;
        Boolean converged = null;
        Double maxRhat = null;
        if (r.order() != null) {
            OrderPosterior.of(ls, r.order()); // refuses a required edge against the order, naming it
            src = EffectOrders.given(r.order());
            method = "order";
            over = "every DAG consistent with the given order (exact; both DAG priors coincide given an order)";
        } else if (r.dagPrior() == DagPrior.STRUCTURE_MODULAR) {
            src = null; // DAG draws below
            method = null;
            over = null;
        } else {
            UnknownOrderSettings s = r.settings();
            OrderConstraints oc = s.constraints(ls);
            if (s.method() == UnknownOrderSettings.Method.EXACT) {
                method = "exact";
                if (n <= ENUMERATE_MAX) {
                    List<int[]> all = UnknownOrderPrediction.allowedOrders(oc, n);
                    src = EffectOrders.enumerated(all);
                    over = "every allowed order (" + all.size() + ") with its exact posterior weight, and every DAG consistent with each (exact)";
                } else {
                    ExactOrderSum.Result er = ExactOrderSum.run(ls, oc, MAX_SAMPLED_ORDERS, s.seed(), null);
                    src = EffectOrders.independent(Arrays.asList(er.sampledOrders()));
                    over = MAX_SAMPLED_ORDERS + " orders drawn from the exact order posterior, and every DAG consistent with each (sampled; see mcse)";
                }
            } else {
                method = "mcmc";
                OrderMcmc.Result mr = OrderSampling.runMcmc(ls, oc, s, false, progress);
                List<int[]> kept = perChain(mr.orders(), s.chains());
                src = EffectOrders.chains(kept, s.chains());
                converged = mr.converged();
                maxRhat = mr.maxRhat();
                over = kept.size() + " orders kept by " + s.chains() + " order-MCMC chains, and every DAG consistent with each (sampled; see mcse)";
            }
        }
        List<Effect> effects;
        if (r.order() == null && r.dagPrior() == DagPrior.STRUCTURE_MODULAR) {
            UnknownOrderSettings s = r.settings();
            StructureDraws d = StructureDraws.of(ls, s, progress);
            effects = EffectEngine.overDags(ls, d, qs, r.engine());
            method = s.method().label();
            over = d.description();
            converged = d.converged();
            maxRhat = d.maxRhat();
        } else {
            effects = EffectEngine.overOrders(ls, src, qs, r.engine());
        }
        List<EffectResult> out = new ArrayList<>();
        for (int i = 0; i < qs.size(); i++) {
            out.add(result(m, ls, qs.get(i), effects.get(i), method, r.order() == null ? r.dagPrior().label() : null,
                    over, r.order(), converged, maxRhat));
        }
        return out;
    }

    /** At most {@link #MAX_ORDERS_PER_CHAIN} evenly spaced orders of each chain, chains kept apart and equally long. */
    static List<int[]> perChain(List<int[]> orders, int chains) {
        int per = orders.size() / chains;
        int every = Math.max(1, (per + MAX_ORDERS_PER_CHAIN - 1) / MAX_ORDERS_PER_CHAIN);
        int keep = per / every;
        List<int[]> out = new ArrayList<>();
        for (int c = 0; c < chains; c++) {
            for (int t = 0; t < keep; t++) {
                out.add(orders.get(c * per + t * every));
            }
        }
        return out;
    }

    private static EffectResult result(Manifest m, LocalScores ls, EffectQuery q, Effect e, String method,
                                       String dagPrior, String over, int[] order, Boolean converged, Double maxRhat) {
        boolean vs = q.versus() != null;
        String est = e.exact() ? "exact" : "sampled";
        EffectResult.Versus versus = vs ? new EffectResult.Versus(named(m, q.versus()), e.versusProbability(), e.versusMcse()) : null;
        var d = e.draws();
        return new EffectResult(named(m, q.set()), named(m, q.target()), q.hasGiven() ? named(m, q.given()) : null,
                e.probability(), e.mcse(), est, versus, vs ? e.difference() : null, vs ? e.differenceMcse() : null,
                vs ? e.ratio() : null, e.noPath(), e.noPathMcse(), e.noPathExact() ? "exact" : "sampled",
                new EffectResult.Interval(d.level(), d.lower(), d.upper(), d.of()),
                new EffectResult.Posterior(d.of(), d.count(), d.mean(), d.binLow(), d.binHigh(), d.counts(), d.noPathShare()),
                new EffectResult.Observational(e.observational(), vs ? e.observationalVersus() : null,
                        vs ? e.observational() - e.observationalVersus() : null),
                method, dagPrior, over, order == null ? null : VariableOrder.names(m, order), ResultBuilder.settings(ls),
                converged, maxRhat, ASSUMPTIONS, NOTE);
    }

    static Map<String, String> named(Manifest m, int[] states) {
        Map<String, String> out = new LinkedHashMap<>();
        for (int v = 0; v < states.length; v++) {
            if (states[v] != CaseParser.HIDDEN) {
                out.put(m.variables().get(v).name(), m.variables().get(v).states().get(states[v]));
            }
        }
        return out;
    }
}
