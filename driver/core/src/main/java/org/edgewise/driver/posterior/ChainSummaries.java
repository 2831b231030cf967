package org.edgewise.driver.posterior;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.mcmc.McmcResult;

/** What order chains and partition chains report alike: Rao-Blackwellised edges, chain-time features, thinning. */
final class ChainSummaries {
    /** Stored draws used for the parent-set posteriors of order chains, and mixed for prediction. */
    static final int MAX_MIXED = 1000;
    /** Orders kept per chain for an effect. */
    static final int EFFECT_ORDERS_PER_CHAIN = 500;

    private ChainSummaries() {
    }

    /** The chains' Rao-Blackwellised edge estimates (a pair that is no candidate: exactly 0). */
    static StructurePosterior.EdgeEstimates edges(McmcResult r) {
        int n = r.edges().length;
        double[][] mean = new double[n][n];
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                Estimate e = r.edges()[a][b];
                mean[a][b] = a == b || e == null ? 0.0 : e.mean();
            }
        }
        return new StructurePosterior.EdgeEstimates(mean, r.edges(), r.orders().size(), null, null);
    }

    /** The ancestor and Markov-blanket estimates the chains kept, errors bounded by the rule of three. */
    static StructurePosterior.Features features(McmcResult r) {
        int n = r.edges().length;
        double[][][] f = new double[4][n][n];
        for (int a = 0; a < n; a++) {
            for (int b = 0; b < n; b++) {
                if (a != b) {
                    f[0][a][b] = r.ancestors()[a][b].mean();
                    f[1][a][b] = r.ancestors()[a][b].mcse();
                    f[2][a][b] = r.blanket()[a][b].mean();
                    f[3][a][b] = r.blanket()[a][b].mcse();
                }
            }
        }
        return DagLists.bounded(f[0], f[1], f[2], f[3], r.orders().size());
    }

    /** At most {@value #EFFECT_ORDERS_PER_CHAIN} evenly spaced draws of each chain, chains kept apart and equally long. */
    static List<int[]> perChain(List<int[]> draws, int chains) {
        int per = draws.size() / chains;
        int every = Math.max(1, (per + EFFECT_ORDERS_PER_CHAIN - 1) / EFFECT_ORDERS_PER_CHAIN);
        int keep = per / every;
        List<int[]> out = new ArrayList<>();
        for (int c = 0; c < chains; c++) {
            for (int t = 0; t < keep; t++) {
                out.add(draws.get(c * per + t * every));
            }
        }
        return out;
    }
}
