package org.edgewise.driver.result;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Locale;

/**
 * Which headline posteriors of an {@link EdgeResult} are fragile under its ESS sweep: an edge
 * with P(a → b) ≥ {@value #HEADLINE} in the result, or a compelled direction with P(a → b
 * compelled) ≥ {@value #HEADLINE}, whose posterior falls below {@value #HEADLINE} at another ESS
 * of the sweep ({@link EdgeResult#sensitivity()}). Such a posterior is settled by the choice of
 * ESS rather than by the data, and says so wherever the result is shown. Like every edge
 * posterior it is evidence of statistical dependence under stated assumptions, not proof of causation.
 */
public final class Fragility {
    /** A posterior at or above this is a headline; one that falls below it within the sweep is fragile. */
    public static final double HEADLINE = 0.5;

    private Fragility() {
    }

    /**
     * The fragile headline posteriors of {@code r}: edges first, then compelled directions, each
     * most probable first; empty when none crosses; null when {@code r} has no sweep (or no ESS of its own).
     */
    public static List<EdgeResult.Fragile> of(EdgeResult r) {
        if (r.sensitivity() == null || r.sensitivity().isEmpty() || r.settings() == null || r.settings().ess() == null) {
            return null;
        }
        double own = r.settings().ess();
        List<EdgeResult.Fragile> out = new ArrayList<>();
        List<Map<String, Double>> edgeRuns = new ArrayList<>();
        List<Double> edgeEss = new ArrayList<>();
        edgeRuns.add(edges(r.edges()));
        edgeEss.add(own);
        for (EdgeResult.Sensitivity s : r.sensitivity()) {
            edgeRuns.add(edges(s.edges()));
            edgeEss.add(s.ess());
        }
        for (EdgeResult.Edge e : r.edges()) {
            if (e.posterior() >= HEADLINE) {
                add(out, "edge", e.from(), e.to(), e.posterior(), own, edgeRuns, edgeEss);
            }
        }
        if (r.essentialGraph() != null) {
            List<Map<String, Double>> runs = new ArrayList<>();
            List<Double> ess = new ArrayList<>();
            runs.add(compelled(r.essentialGraph()));
            ess.add(own);
            for (EdgeResult.Sensitivity s : r.sensitivity()) {
                if (s.essentialGraph() != null) {
                    runs.add(compelled(s.essentialGraph()));
                    ess.add(s.ess());
                }
            }
            if (runs.size() > 1) {
                for (EdgeResult.EssentialPair p : r.essentialGraph()) {
                    if (p.aToB() >= HEADLINE) {
                        add(out, "compelled", p.a(), p.b(), p.aToB(), own, runs, ess);
                    }
                    if (p.bToA() >= HEADLINE) {
                        add(out, "compelled", p.b(), p.a(), p.bToA(), own, runs, ess);
                    }
                }
            }
        }
        out.sort(Comparator.comparing((EdgeResult.Fragile f) -> f.kind().equals("edge") ? 0 : 1)
                .thenComparing(Comparator.comparingDouble(EdgeResult.Fragile::posterior).reversed())
                .thenComparing(EdgeResult.Fragile::from).thenComparing(EdgeResult.Fragile::to));
        return out;
    }

    /**
     * The headline posteriors of {@code r} that cross {@value #HEADLINE} between its DAG prior and
     * {@code other}'s (the same request under the other prior): an edge or compelled direction at or
     * above {@value #HEADLINE} under one prior and below it under the other — the choice of DAG prior,
     * not the data, decides whether it is drawn. Edges first, then compelled directions (when both
     * results carry the essential graph), each by the larger of its two posteriors.
     */
    public static List<EdgeResult.PriorFragile> acrossPriors(EdgeResult r, String otherPrior, List<EdgeResult.Edge> otherEdges,
                                                             List<EdgeResult.EssentialPair> otherEssential) {
        List<EdgeResult.PriorFragile> out = new ArrayList<>();
        Map<String, Double> o = edges(otherEdges);
        for (EdgeResult.Edge e : r.edges()) {
            crossing(out, "edge", e.from(), e.to(), e.posterior(), o.get(e.from() + "\u0000" + e.to()), r.dagPrior(), otherPrior);
        }
        if (r.essentialGraph() != null && otherEssential != null) {
            Map<String, Double> oc = compelled(otherEssential);
            for (EdgeResult.EssentialPair p : r.essentialGraph()) {
                crossing(out, "compelled", p.a(), p.b(), p.aToB(), oc.get(p.a() + "\u0000" + p.b()), r.dagPrior(), otherPrior);
                crossing(out, "compelled", p.b(), p.a(), p.bToA(), oc.get(p.b() + "\u0000" + p.a()), r.dagPrior(), otherPrior);
            }
        }
        out.sort(Comparator.comparing((EdgeResult.PriorFragile f) -> f.kind().equals("edge") ? 0 : 1)
                .thenComparing(Comparator.comparingDouble((EdgeResult.PriorFragile f) -> Math.max(f.posterior(), f.other())).reversed())
                .thenComparing(EdgeResult.PriorFragile::from).thenComparing(EdgeResult.PriorFragile::to));
        return out;
    }

    private static void crossing(List<EdgeResult.PriorFragile> out, String kind, String from, String to, double p, Double other,
                                 String prior, String otherPrior) {
        double q = other == null ? 0 : other;
        if (p >= HEADLINE != q >= HEADLINE) {
            out.add(new EdgeResult.PriorFragile(kind, from, to, p, prior, q, otherPrior));
        }
    }

    /**
     * One posterior fragile between the DAG priors in words, e.g. {@code a -> b 0.56 under the
     * structure-modular DAG prior, 0.41 under the order-modular}; {@code arrow} is how to draw the arrow.
     */
    public static String words(EdgeResult.PriorFragile f, String arrow) {
        return String.format(Locale.ROOT, "%s %s %s%s %.2f under the %s DAG prior, %.2f under the %s", f.from(), arrow, f.to(),
                f.kind().equals("compelled") ? " compelled" : "", f.posterior(), f.dagPrior(), f.other(), f.otherDagPrior());
    }

    /**
     * One fragile posterior in words, e.g. {@code a -> b 0.78 (0.92 at ESS 0.1, 0.00 at ESS 10)};
     * a compelled direction reads {@code a -> b compelled 0.78 (…)}. {@code arrow} is how to draw the arrow.
     */
    public static String words(EdgeResult.Fragile f, String arrow) {
        return String.format(Locale.ROOT, "%s %s %s%s %.2f (%.2f at ESS %s, %.2f at ESS %s)", f.from(), arrow, f.to(),
                f.kind().equals("compelled") ? " compelled" : "", f.posterior(), f.max(), num(f.maxEss()), f.min(), num(f.minEss()));
    }

    /** An ESS as the user typed it: 10, not 10.0; 0.1. */
    public static String num(double x) {
        return x == Math.rint(x) && Math.abs(x) < 1e15 ? Long.toString((long) x) : Double.toString(x);
    }

    private static void add(List<EdgeResult.Fragile> out, String kind, String from, String to, double posterior, double own,
                            List<Map<String, Double>> runs, List<Double> ess) {
        String key = from + "\u0000" + to;
        double min = Double.POSITIVE_INFINITY;
        double max = Double.NEGATIVE_INFINITY;
        double minEss = own;
        double maxEss = own;
        for (int k = 0; k < runs.size(); k++) {
            Double v = runs.get(k).get(key);
            if (v == null) {
                continue;
            }
            double e = ess.get(k);
            if (v < min || v == min && e < minEss) {
                min = v;
                minEss = e;
            }
            if (v > max || v == max && e < maxEss) {
                max = v;
                maxEss = e;
            }
        }
        if (min < HEADLINE) {
            out.add(new EdgeResult.Fragile(kind, from, to, posterior, own, min, minEss, max, maxEss));
        }
    }

    private static Map<String, Double> edges(List<EdgeResult.Edge> edges) {
        Map<String, Double> m = new HashMap<>();
        if (edges != null) {
            for (EdgeResult.Edge e : edges) {
                m.put(e.from() + "\u0000" + e.to(), e.posterior());
            }
        }
        return m;
    }

    private static Map<String, Double> compelled(List<EdgeResult.EssentialPair> pairs) {
        Map<String, Double> m = new HashMap<>();
        for (EdgeResult.EssentialPair p : pairs) {
            m.put(p.a() + "\u0000" + p.b(), p.aToB());
            m.put(p.b() + "\u0000" + p.a(), p.bToA());
        }
        return m;
    }
}
