package org.edgewise.driver.average;

import org.edgewise.driver.UserError;
import org.edgewise.driver.average.givenorder.OrderSum;

/**
 * The independent reference for the unknown-order engines: every one of the n! orders
 * enumerated (Heap's algorithm, Heap 1963), each evaluated in closed form by
 * {@link OrderSum#evaluate}, and combined by a log-sum-exp. Exponential; for n ≤ 8 in tests.
 */
public final class BruteForceOrders {
    public final double logOrderSum;
    public final double[][] edges;
    public final int orders;

    public BruteForceOrders(LocalScores ls, OrderConstraints oc) {
        int n = ls.variableCount();
        int[] perm = new int[n];
        for (int i = 0; i < n; i++) {
            perm[i] = i;
        }
        java.util.List<double[][]> posts = new java.util.ArrayList<>();
        java.util.List<Double> logs = new java.util.ArrayList<>();
        int[] c = new int[n];
        int count = 0;
        count += visit(ls, oc, perm, posts, logs);
        int i = 0;
        while (i < n) {
            if (c[i] < i) {
                int j = (i % 2 == 0) ? 0 : c[i];
                int t = perm[j];
                perm[j] = perm[i];
                perm[i] = t;
                count += visit(ls, oc, perm, posts, logs);
                c[i]++;
                i = 0;
            } else {
                c[i] = 0;
                i++;
            }
        }
        double[] l = logs.stream().mapToDouble(Double::doubleValue).toArray();
        logOrderSum = LogSum.of(l);
        edges = new double[n][n];
        for (int k = 0; k < l.length; k++) {
            double w = Math.exp(l[k] - logOrderSum);
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    edges[a][b] += w * posts.get(k)[a][b];
                }
            }
        }
        orders = count;
    }

    /** Returns 1 for each order visited that the constraints allow (counted whatever its likelihood). */
    private static int visit(LocalScores ls, OrderConstraints oc, int[] perm, java.util.List<double[][]> posts,
                             java.util.List<Double> logs) {
        // the order prior's support: tiers only (required edges act through the likelihood)
        for (int p = 0; p < perm.length; p++) {
            for (int q = p + 1; q < perm.length; q++) {
                int tp = oc.tier(perm[p]);
                int tq = oc.tier(perm[q]);
                if (tp >= 0 && tq >= 0 && tp > tq) {
                    return 0;
                }
            }
        }
        try {
            OrderSum.OrderResult r = OrderSum.evaluate(ls, perm.clone());
            posts.add(r.edgePosterior());
            logs.add(r.logEvidence());
        } catch (UserError e) {
            // a required parent comes after its child: likelihood zero under this order
        }
        return 1;
    }
}
