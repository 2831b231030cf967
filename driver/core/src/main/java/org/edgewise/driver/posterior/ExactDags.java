package org.edgewise.driver.posterior;

import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.givenorder.BestDagOrder;
import org.edgewise.driver.average.dag.DagDraws;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.average.exact.ExactDagSampler;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.exact.StructureSum;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.query.StructureCasePrediction;

/**
 * Every DAG with in-degree ≤ d, summed exactly under the structure-modular DAG prior
 * P(G) ∝ Π_i ρ_i(U_i) (Tian &amp; He 2009, {@link StructureSum}): exact edges, parent sets and
 * log P(D); features and effects from DAGs drawn exactly ({@link ExactDagSampler}); a case's
 * probability exactly as Z(D + case) / Z(D).
 */
public final class ExactDags extends ExactSum {
    /** DAGs drawn for an effect. */
    public static final int EFFECT_DAG_DRAWS = 20_000;
    /** Importance-weighted exact draws per asked sample, when rejection would take too long. */
    static final int WEIGHTED_FACTOR = 4;

    private StructureSum.Result sum;
    private DagDraws draws;

    ExactDags(LocalScores ls, UnknownOrderSettings s, ProgressListener progress) {
        super(ls, s, progress);
    }

    @Override
    Figures compute() {
        progress.start("exact structure-modular sum", 1_000_000);
        try {
            sum = StructureSum.run(ls, oc, progress.partsPerMillion());
        } finally {
            progress.finish();
        }
        return new Figures(sum.edgePosterior(), sum.setPosterior(), sum.logEvidence());
    }

    /** DAGs drawn exactly, or 4× as many importance-weighted ones; {@code weighted} says which. */
    record Drawn(DagDraws dags, boolean weighted) {
    }

    /**
     * {@code count} DAGs drawn exactly from the structure-modular posterior by rejection, or, when
     * rejection would take too long, {@value #WEIGHTED_FACTOR}× as many drawn under the
     * order-modular prior and weighted by 1/ext(G) (Ellis &amp; Wong 2008).
     */
    static Drawn draw(LocalScores ls, OrderConstraints oc, int count, long seed, double logDagSum) {
        ExactDagSampler sampler = ExactDagSampler.of(ls, oc);
        if (sampler.expectedTrials(count, logDagSum) <= ExactDagSampler.MAX_TRIALS) {
            return new Drawn(new DagDraws(ls.variableCount(), List.of(sampler.draw(DagPrior.STRUCTURE_MODULAR, count, seed,
                    logDagSum)), 1, null), false);
        }
        return new Drawn(sampler.drawWeighted(WEIGHTED_FACTOR * count, seed), true);
    }

    private double logDagSum() {
        figures();
        return sum.logDagSum();
    }

    /** The DAGs behind features and the essential graph, drawn once. */
    private DagDraws draws() {
        if (draws == null) {
            draws = draw(ls, oc, s.orderSamples(), s.seed() + 2, logDagSum()).dags();
        }
        return draws;
    }

    @Override
    public String cost() {
        StructureSum.Estimate e = StructureSum.estimateHere(ls.variableCount());
        return costNote(e.seconds(), e.largestN(), e);
    }

    @Override
    public Labels labels() {
        return new Labels("exact", DagPrior.STRUCTURE_MODULAR, null);
    }

    @Override
    public Features features() {
        return s.features() ? DagLists.features(s, draws()) : null;
    }

    @Override
    public DagDraws essentialDraws() {
        return s.essentialGraph() ? DagLists.knowing(draws(), ls, oc) : null;
    }

    @Override
    public Cases cases(double tailMass, long maxHiddenStates) {
        StructureCasePrediction p;
        try {
            p = new StructureCasePrediction(ls, oc, maxHiddenStates);
        } catch (StructureSum.TooLarge e) {
            throw new UserError("an exact prediction under the structure-modular prior runs the exact sum once per "
                    + "case and hidden joint state: " + e.getMessage(), e);
        }
        String over = "exact: all DAGs, as Z(D + case) / Z(D)";
        return new Cases(p, BestDagOrder.of(ls, oc), over, "all DAGs", null,
                "averaged over every DAG (" + over + "; structure-modular DAG prior):", "under the single highest-scoring network:", true);
    }

    @Override
    public EffectSource effectSource() {
        StructureDraws d = StructureDraws.exact(ls, oc, EFFECT_DAG_DRAWS, s.seed() + 2);
        return new OverDags(d, d.description(), null, null);
    }

    /**
     * DAGs drawn as an effect draws them ({@link #draw}: with the effect's {@code seed + 2} they are
     * the very DAGs {@code effectSource} averages over): {@code count} exact draws from the
     * structure-modular posterior, or 4× as many weighted by 1/ext(G).
     */
    @Override
    public Sampled sampleDags(int count, long seed) {
        DagLists.checkDrawable(ls);
        Drawn d = draw(ls, oc, count, seed, logDagSum());
        DagDraws dd = d.dags();
        List<int[]> masks = new java.util.ArrayList<>();
        double[] w = d.weighted() ? new double[dd.chainLength(0)] : null;
        int n = ls.variableCount();
        for (int k = 0; k < dd.chainLength(0); k++) {
            int[] m = new int[n];
            for (int v = 0; v < n; v++) {
                m[v] = dd.parentsOf(0, k, v);
            }
            masks.add(m);
            if (w != null) {
                w[k] = dd.weight(0, k);
            }
        }
        return new Sampled(DagSample.fromMasks(n, masks, w), d.weighted()
                ? masks.size() + " DAGs drawn exactly under the order-modular prior and weighted by 1/ext(G) to the structure-modular posterior"
                : count + " DAGs drawn exactly from the structure-modular posterior");
    }
}
