package org.edgewise.driver.posterior;

import java.util.List;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.effect.EffectOrders;
import org.edgewise.driver.query.CasePredictor;

/**
 * Every DAG consistent with a given order, summed in closed form (Buntine 1991; Friedman &amp;
 * Koller 2003): exact, with the evidence in both conventions and the single best network under
 * the order. Both DAG priors coincide given an order.
 */
public final class GivenOrder implements StructurePosterior {
    private final OrderPosterior op;

    /** Refuses a required edge whose parent comes after its child in {@code order}, naming it. */
    GivenOrder(LocalScores ls, int[] order) {
        this.op = OrderPosterior.of(ls, order);
    }

    @Override
    public int[] order() {
        return op.order().clone();
    }

    @Override
    public LocalScores scores() {
        return op.scores();
    }

    @Override
    public Labels labels() {
        return new Labels("order", null, null);
    }

    @Override
    public List<List<String>> tiers() {
        List<List<String>> t = op.scores().store().manifest().tiers();
        return t == null || t.isEmpty() ? null : t;
    }

    @Override
    public EdgeEstimates edges() {
        return new EdgeEstimates(op.result().edgePosterior(), null, 0, op.result().logEvidence(),
                op.result().logEvidenceNormalized());
    }

    @Override
    public double[][] setPosterior() {
        return op.setPosteriors();
    }

    @Override
    public int[] bestSets() {
        return op.bestSets();
    }

    @Override
    public Cases cases(double tailMass, long maxHiddenStates) {
        return new Cases(CasePredictor.averaged(op, tailMass).withMaxHiddenStates(maxHiddenStates), op.order(),
                "every DAG consistent with the order", "every DAG consistent with the order", null,
                "averaged over networks consistent with the order:", "under the single best network:                ", false);
    }

    @Override
    public EffectSource effectSource() {
        return new OverOrders(EffectOrders.given(op.order()),
                "every DAG consistent with the given order (exact; both DAG priors coincide given an order)", null, null);
    }

    /**
     * {@code count} DAGs drawn independently from the exact posterior given the order: parent sets
     * are independent given the order, each child's drawn with probability exp(w_i(U) − log α_i)
     * among the sets its predecessors allow (Buntine 1991).
     */
    @Override
    public Sampled sampleDags(int count, long seed) {
        LocalScores ls = op.scores();
        int n = ls.variableCount();
        int[] pos = org.edgewise.driver.average.givenorder.OrderSum.positions(op.order(), n);
        long[] mask = new long[n];
        double[] z = new double[n];
        for (int i = 0; i < n; i++) {
            mask[i] = ls.predecessorMask(i, pos);
            z[i] = org.edgewise.driver.average.givenorder.OrderSum.childLogSum(ls, i, mask[i]);
        }
        java.util.SplittableRandom rng = new java.util.SplittableRandom(seed);
        List<int[]> dags = new java.util.ArrayList<>(count);
        for (int k = 0; k < count; k++) {
            dags.add(org.edgewise.driver.average.dag.DagFeatures.sampleDag(ls, mask, z, rng));
        }
        return new Sampled(DagSample.fromSets(ls, List.of(dags)), count
                + " DAGs drawn independently from the exact posterior given the order");
    }
}
