package org.edgewise.driver.average.mcmc;

import java.util.List;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;
import org.edgewise.driver.average.dag.DagFeatures;

/**
 * What order MCMC diagnoses: the Rao-Blackwellised posterior of every candidate edge (index e, as
 * stored per draw) and, with features, the ancestor (a ⇝ b) and Markov-blanket indicators of the
 * DAG sampled per draw (indices {@code edges + }{@link DagFeatures#ancestorBit} /
 * {@link DagFeatures#blanketBit}; slots for a = b and for blanket pairs with a &gt; b are constant 0).
 */
final class OrderQuantities implements MultiChainDiagnostics.Quantities {
    private final List<String> names;
    private final int[] edgeFrom;
    private final int[] edgeTo;
    private final int features;

    private OrderQuantities(List<String> names, int[] edgeFrom, int[] edgeTo, boolean features) {
        this.names = names;
        this.edgeFrom = edgeFrom;
        this.edgeTo = edgeTo;
        int n = names.size();
        this.features = features ? 2 * n * n : 0;
    }

    static OrderQuantities of(List<String> names, int[] edgeFrom, int[] edgeTo, boolean features) {
        return new OrderQuantities(names, edgeFrom, edgeTo, features);
    }

    static int ancestorIndex(int a, int b, int n) {
        return DagFeatures.ancestorBit(a, b, n);
    }

    static int blanketIndex(int a, int b, int n) {
        return DagFeatures.blanketBit(a, b, n);
    }

    @Override
    public int count() {
        return edgeFrom.length + features;
    }

    @Override
    public String label(int q) {
        if (q < edgeFrom.length) {
            return "edge " + names.get(edgeFrom[q]) + " -> " + names.get(edgeTo[q]);
        }
        int n = names.size();
        int bit = q - edgeFrom.length;
        if (bit < n * n) {
            return "ancestor " + names.get(bit / n) + " ~> " + names.get(bit % n);
        }
        bit -= n * n;
        return "markov-blanket " + names.get(bit / n) + " -- " + names.get(bit % n);
    }

    @Override
    public boolean probability(int q) {
        return true;
    }

    /** The edges are Rao-Blackwellised (exact given the state); the features are indicators of one drawn DAG. */
    @Override
    public boolean raoBlackwellised(int q) {
        return q < edgeFrom.length;
    }

    @Override
    public double start(int q, DrawStore chain) {
        if (q < edgeFrom.length) {
            return chain.startQuantity(q);
        }
        DrawStore.Drawn st = chain.startState();
        if (st == null || st.features() == null) {
            return Double.NaN;
        }
        return DagFeatures.get(st.features(), q - edgeFrom.length) ? 1.0 : 0.0;
    }

    @Override
    public void fill(int q, List<DrawStore> chains, int[] from, double[][] x) {
        if (q < edgeFrom.length) {
            MultiChainDiagnostics.fillStored(q, chains, from, x);
            return;
        }
        int bit = q - edgeFrom.length;
        for (int c = 0; c < chains.size(); c++) {
            DrawStore d = chains.get(c);
            for (int t = 0; t < x[c].length; t++) {
                x[c][t] = DagFeatures.get(((DrawStore.Drawn) d.state(from[c] + t)).features(), bit) ? 1.0 : 0.0;
            }
        }
    }
}
