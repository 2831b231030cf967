package org.edgewise.driver.report;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Set;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.EffectResult;

/**
 * The neighbourhood of the variables a report's effects ask about: the variables each effect sets,
 * targets or is given, and every variable the consensus graph joins to one of them (a drawn pair,
 * posterior above the report's threshold). At many variables the whole consensus graph is tall and
 * its labels small once it shrinks to the page; the report then draws this neighbourhood first, at
 * full size, and folds the whole graph below it.
 */
final class Neighbourhood {
    /** The neighbourhood view is drawn for results of more variables than this. */
    static final int FROM_VARIABLES = 20;

    private Neighbourhood() {
    }

    /** The names of the variables the effects set, target or are given, in the order met. */
    static Set<String> queried(List<EffectResult> effects) {
        Set<String> out = new LinkedHashSet<>();
        if (effects != null) {
            for (EffectResult e : effects) {
                out.addAll(e.intervention().keySet());
                out.addAll(e.target().keySet());
                if (e.given() != null) {
                    out.addAll(e.given().keySet());
                }
            }
        }
        return out;
    }

    /**
     * The variables of the neighbourhood (the queried ones the result lists, and every variable a drawn
     * pair joins to one of them), in the result's order; null when there is nothing to ask about.
     */
    static List<String> of(EdgeMatrix m, List<ConsensusEdges.Drawn> shown, Set<String> queried) {
        Set<Integer> q = new HashSet<>();
        for (int v = 0; v < m.size(); v++) {
            if (queried.contains(m.variables().get(v))) {
                q.add(v);
            }
        }
        if (q.isEmpty()) {
            return null;
        }
        boolean[] keep = new boolean[m.size()];
        for (int v : q) {
            keep[v] = true;
        }
        for (ConsensusEdges.Drawn d : shown) {
            if (q.contains(d.from()) || q.contains(d.to())) {
                keep[d.from()] = true;
                keep[d.to()] = true;
            }
        }
        List<String> out = new ArrayList<>();
        for (int v = 0; v < m.size(); v++) {
            if (keep[v]) {
                out.add(m.variables().get(v));
            }
        }
        return out;
    }

    /** {@code r} restricted to the variables {@code keep}: its edges and essential-graph pairs among them, its order, settings and method. */
    static EdgeResult restrict(EdgeResult r, List<String> keep) {
        Set<String> k = new HashSet<>(keep);
        List<EdgeResult.Edge> edges = new ArrayList<>();
        for (EdgeResult.Edge e : r.edges()) {
            if (k.contains(e.from()) && k.contains(e.to())) {
                edges.add(e);
            }
        }
        List<EdgeResult.EssentialPair> essential = null;
        if (r.essentialGraph() != null) {
            essential = new ArrayList<>();
            for (EdgeResult.EssentialPair p : r.essentialGraph()) {
                if (k.contains(p.a()) && k.contains(p.b())) {
                    essential.add(p);
                }
            }
        }
        List<String> order = r.order() == null ? null : r.order().stream().filter(k::contains).toList();
        return new EdgeResult(r.method(), keep, null, null, null, order, r.settings(), r.store(), edges, null, null, null, null,
                null, r.dagPrior(), essential);
    }
}
