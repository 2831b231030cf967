package org.edgewise.driver.query;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Variable elimination on one DAG against brute-force enumeration of the joint. Source: the
 * definition, P(x_O) = Σ over the states of every other variable of Π_v θ_v(x_v | x_{U_v}), summed
 * over all n variables (not only the ancestral set), in linear space on networks small enough
 * (n ≤ 8, arities 2–3) that every joint state is listed; a conditional by its definition
 * P(t | g) = P(t, g) / P(g).
 */
class DagInferenceTest {

    /** A random DAG (parents among earlier variables of a random order) with random θ tables. */
    record Net(int[][] parents, int[] arity, double[][] theta) {
        double theta(int v, long j, int k) {
            return theta[v][(int) j * arity[v] + k];
        }

        long config(int v, int[] x) {
            long j = 0;
            for (int p : parents[v]) {
                j = j * arity[p] + x[p];
            }
            return j;
        }
    }

    static Net random(int n, SplittableRandom rng) {
        int[] arity = new int[n];
        for (int v = 0; v < n; v++) {
            arity[v] = 2 + rng.nextInt(2);
        }
        int[] order = new int[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
        }
        for (int i = n - 1; i > 0; i--) {
            int j = rng.nextInt(i + 1);
            int t = order[i];
            order[i] = order[j];
            order[j] = t;
        }
        int[][] parents = new int[n][];
        for (int i = 0; i < n; i++) {
            int v = order[i];
            int[] pa = new int[i];
            int k = 0;
            for (int e = 0; e < i; e++) {
                if (k < 3 && rng.nextDouble() < 0.45) {
                    pa[k++] = order[e];
                }
            }
            parents[v] = Arrays.copyOf(pa, k);
            Arrays.sort(parents[v]);
        }
        double[][] theta = new double[n][];
        for (int v = 0; v < n; v++) {
            int q = 1;
            for (int p : parents[v]) {
                q *= arity[p];
            }
            theta[v] = new double[q * arity[v]];
            for (int j = 0; j < q; j++) {
                double s = 0;
                for (int k = 0; k < arity[v]; k++) {
                    theta[v][j * arity[v] + k] = 0.05 + rng.nextDouble();
                    s += theta[v][j * arity[v] + k];
                }
                for (int k = 0; k < arity[v]; k++) {
                    theta[v][j * arity[v] + k] /= s;
                }
            }
        }
        return new Net(parents, arity, theta);
    }

    /** Σ over every joint state consistent with the observed cells of Π_v θ_v (the definition). */
    static double brute(Net net, int[] states) {
        int n = net.arity.length;
        int[] x = new int[n];
        double total = 0;
        while (true) {
            boolean ok = true;
            for (int v = 0; v < n; v++) {
                if (states[v] != CaseParser.HIDDEN && states[v] != x[v]) {
                    ok = false;
                    break;
                }
            }
            if (ok) {
                double p = 1;
                for (int v = 0; v < n; v++) {
                    p *= net.theta(v, net.config(v, x), x[v]);
                }
                total += p;
            }
            int v = 0;
            while (v < n && ++x[v] == net.arity[v]) {
                x[v] = 0;
                v++;
            }
            if (v == n) {
                return total;
            }
        }
    }

    static double ve(Net net, int[] states) {
        DagInference.Plan plan = DagInference.plan(net.parents, net.arity, states);
        return DagInference.logProbability(plan, net.parents, net.arity, states, (v, j, k) -> Math.log(net.theta(v, j, k)));
    }

    static int[] randomCase(Net net, SplittableRandom rng, double observed) {
        int[] s = new int[net.arity.length];
        for (int v = 0; v < s.length; v++) {
            s[v] = rng.nextDouble() < observed ? rng.nextInt(net.arity[v]) : CaseParser.HIDDEN;
        }
        return s;
    }

    @Test
    void caseProbabilityWithHiddenVariablesEqualsTheEnumeratedJoint() {
        SplittableRandom rng = new SplittableRandom(19_301L);
        int checked = 0;
        for (int rep = 0; rep < 60; rep++) {
            Net net = random(2 + rng.nextInt(7), rng);
            for (int c = 0; c < 10; c++) {
                int[] s = randomCase(net, rng, 0.4);
                double want = brute(net, s);
                double got = Math.exp(ve(net, s));
                assertEquals(want, got, 1e-12, () -> "case " + Arrays.toString(s) + " on " + Arrays.deepToString(net.parents));
                checked++;
            }
        }
        assertEquals(600, checked);
    }

    @Test
    void conditionalsEqualTheRatioOfEnumeratedJoints() {
        SplittableRandom rng = new SplittableRandom(19_302L);
        for (int rep = 0; rep < 60; rep++) {
            Net net = random(3 + rng.nextInt(6), rng);
            int n = net.arity.length;
            int[] given = randomCase(net, rng, 0.35);
            int t = rng.nextInt(n);
            if (given[t] != CaseParser.HIDDEN) {
                given[t] = CaseParser.HIDDEN;
            }
            double pg = brute(net, given);
            double sum = 0;
            for (int k = 0; k < net.arity[t]; k++) {
                int[] joint = given.clone();
                joint[t] = k;
                double want = brute(net, joint) / pg;
                double got = Math.exp(ve(net, joint) - ve(net, given));
                assertEquals(want, got, 1e-12);
                sum += got;
            }
            assertEquals(1.0, sum, 1e-12);
        }
    }

    @Test
    void fullyObservedAndFullyHiddenCases() {
        SplittableRandom rng = new SplittableRandom(19_303L);
        Net net = random(6, rng);
        int[] none = new int[6];
        Arrays.fill(none, CaseParser.HIDDEN);
        assertEquals(0.0, ve(net, none), 0.0);
        int[] all = randomCase(net, rng, 2.0);
        assertEquals(Math.log(brute(net, all)), ve(net, all), 1e-12);
    }

    @Test
    void planStatesTheLargestTableAndKeepsOnlyAncestors() {
        // a chain 0 -> 1 -> 2 -> 3 of binary variables, and 4 -> 3; observe 3 only: every other variable is an ancestor
        int[][] pa = {{}, {0}, {1}, {2, 4}, {}};
        int[] ar = {2, 2, 2, 2, 3};
        int[] s = {-1, -1, -1, 1, -1};
        DagInference.Plan plan = DagInference.plan(pa, ar, s);
        assertEquals(5, plan.factors().length);
        // eliminating 0 first needs {0,1} (4 entries); then 1 {1,2} (4); 4 {2,4} (6); 2 {2} — largest 6 (definition of the greedy order)
        assertEquals(6.0, plan.largest(), 0.0);
        // observing 1 only: 2, 3 and 4 are not ancestors and drop out
        int[] s2 = {-1, 0, -1, -1, -1};
        assertTrue(Arrays.equals(new int[] {0, 1}, DagInference.plan(pa, ar, s2).factors()));
    }
}
