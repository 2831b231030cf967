package org.edgewise.driver.analysis;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import org.edgewise.driver.average.convergence.ConvergenceTargets;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;
import org.edgewise.driver.result.EdgeResult;

/**
 * The MCSE target applied to the figures a sampled result reports: every edge and feature posterior
 * must have a Monte Carlo standard error of at most {@code mcseTarget} ({@link ConvergenceTargets}
 * argues the default) for the result to say converged. The chains' own diagnostics already hold the
 * quantities they sample to it; this check covers the figures as reported — an estimate of exactly 0
 * or 1 reports the rule-of-three bound ({@code McseBound}) rather than the chains' MCSE — so that
 * {@code converged} always speaks of the figures the reader sees.
 * {@code diagnostics.mcse} becomes the largest MCSE of a reported posterior.
 */
final class ReportedMcse {
    private ReportedMcse() {
    }

    /** A reported posterior and its error. */
    private record Figure(String label, double mcse, Double rhat) {
    }

    /** {@code r} with its verdict over its reported figures (unchanged when it carries no MCSE target). */
    static EdgeResult check(EdgeResult r) {
        EdgeResult.Diagnostics d = r.diagnostics();
        if (d == null || d.mcseTarget() == null) {
            return r;
        }
        List<Figure> figures = new ArrayList<>();
        for (EdgeResult.Edge e : r.edges()) {
            if (e.mcse() != null) {
                figures.add(new Figure("edge " + e.from() + " -> " + e.to(), e.mcse(), e.rhat()));
            }
        }
        if (r.features() != null) {
            for (EdgeResult.Feature f : r.features()) {
                if (f.mcse() != null) {
                    figures.add(new Figure(f.kind() + " " + f.from() + (f.kind().equals("ancestor") ? " ~> " : " -- ")
                            + f.to(), f.mcse(), null));
                }
            }
        }
        double largest = d.mcse() == null ? 0 : d.mcse();
        List<Figure> over = new ArrayList<>();
        for (Figure f : figures) {
            largest = Math.max(largest, f.mcse());
            if (f.mcse() > d.mcseTarget()) {
                over.add(f);
            }
        }
        Double mcse = figures.isEmpty() && d.mcse() == null ? null : largest;
        if (over.isEmpty() || !d.converged()) {
            return with(r, d.withVerdict(d.converged(), mcse, d.worst()));
        }
        over.sort(Comparator.comparingDouble((Figure f) -> -f.mcse()).thenComparing(Figure::label));
        List<EdgeResult.Worst> worst = new ArrayList<>();
        for (Figure f : over.subList(0, Math.min(MultiChainDiagnostics.WORST, over.size()))) {
            worst.add(new EdgeResult.Worst(f.label(), f.rhat(), null, f.mcse(), null, "varies"));
        }
        return with(r, d.withVerdict(false, mcse, worst));
    }

    static EdgeResult withDiagnostics(EdgeResult r, EdgeResult.Diagnostics d) {
        return with(r, d);
    }

    private static EdgeResult with(EdgeResult r, EdgeResult.Diagnostics d) {
        return new EdgeResult(r.method(), r.variables(), r.logEvidence(), r.logEvidenceNormalized(), r.evidenceConvention(),
                r.order(), r.settings(), r.store(), r.edges(), r.parentSets(), r.bestNetwork(), d, r.features(),
                r.sensitivity(), r.dagPrior(), r.essentialGraph());
    }
}
