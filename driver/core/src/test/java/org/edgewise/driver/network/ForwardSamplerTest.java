package org.edgewise.driver.network;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.SplittableRandom;
import org.apache.commons.math3.stat.inference.ChiSquareTest;
import org.junit.jupiter.api.Test;

/**
 * Forward sampling reproduces the generating network's distributions within sampling error:
 * Pearson's chi-square goodness-of-fit test (commons-math3 ChiSquareTest) at α = 0.001 with a
 * fixed seed, against exact marginals obtained by enumerating the joint (chain rule).
 */
class ForwardSamplerTest {
    static final double ALPHA = 0.001; // common practice for a fixed-seed goodness-of-fit check
    static final int ROWS = 20_000;

    static Network fleet() {
        return NetworkReader.read(Path.of("..", "..", "sample-data", "fleet-network.json"));
    }

    static int[][] sample(Network net, int rows, long seed) {
        ForwardSampler s = new ForwardSampler(net);
        SplittableRandom rng = new SplittableRandom(seed);
        int[][] out = new int[rows][net.size()];
        for (int[] row : out) {
            s.draw(rng, row);
        }
        return out;
    }

    static double pValue(double[] probabilities, long[] observed) {
        double total = 0;
        for (long o : observed) {
            total += o;
        }
        double[] expected = new double[probabilities.length];
        for (int k = 0; k < expected.length; k++) {
            expected[k] = probabilities[k] * total;
        }
        return new ChiSquareTest().chiSquareTest(expected, observed);
    }

    @Test
    void exactMarginalOfAHandNetwork() {
        // a -> b: P(a=1) = 0.7, P(b=1 | a=0) = 0.2, P(b=1 | a=1) = 0.9;
        // by hand, P(b=1) = 0.3·0.2 + 0.7·0.9 = 0.69
        Network n = NetworkReader.parse("hand", "{\"edgewiseNetwork\":1,\"variables\":["
                + "{\"name\":\"a\",\"states\":[\"0\",\"1\"],\"cpt\":[[0.3,0.7]]},"
                + "{\"name\":\"b\",\"states\":[\"0\",\"1\"],\"parents\":[\"a\"],\"cpt\":[[0.8,0.2],[0.1,0.9]]}]}");
        assertArrayEquals(new double[] {0.31, 0.69}, n.marginal(1), 1e-12);
    }

    @Test
    void marginalsMatchTheNetwork() {
        Network net = fleet();
        int[][] data = sample(net, ROWS, 20261201L);
        for (int v = 0; v < net.size(); v++) {
            long[] observed = new long[net.arity(v)];
            for (int[] row : data) {
                observed[row[v]]++;
            }
            double[] exact = net.marginal(v);
            assertEquals(1.0, java.util.Arrays.stream(exact).sum(), 1e-12);
            double p = pValue(exact, observed);
            assertTrue(p > ALPHA, net.names().get(v) + ": chi-square p = " + p);
        }
    }

    @Test
    void conditionalOfAChildGivenItsParents() {
        Network net = fleet();
        int[][] data = sample(net, ROWS, 99L);
        int child = net.indexOf("temp_excursion");
        int doors = net.indexOf("door_openings");
        int drift = net.indexOf("setpoint_drift");
        long[] observed = new long[3];
        for (int[] row : data) {
            if (row[doors] == 1 && row[drift] == 2) { // many door openings, large drift
                observed[row[child]]++;
            }
        }
        // the CPT row written in the network file for (many, large): [0.2, 0.4, 0.4]
        assertTrue(pValue(new double[] {0.2, 0.4, 0.4}, observed) > ALPHA);
        // the check can fail: the same counts against the row of (few, none) are rejected
        assertTrue(pValue(new double[] {0.85, 0.12, 0.03}, observed) < ALPHA);
        // and the child's unconditional marginal does not fit the conditional counts either
        assertTrue(pValue(net.marginal(child), observed) < ALPHA);
    }

    @Test
    void aSeedFixesTheSampleAndLabelsAreQuoted() throws Exception {
        Network net = NetworkReader.parse("q", "{\"edgewiseNetwork\":1,\"variables\":["
                + "{\"name\":\"size, cm\",\"states\":[\"small\",\"big, \\\"very\\\"\"],\"cpt\":[[0.5,0.5]]},"
                + "{\"name\":\"b\",\"states\":[\"x\",\"y\"],\"parents\":[\"size, cm\"],\"cpt\":[[0.9,0.1],[0.1,0.9]]}]}");
        String one = csv(net, 200, 5);
        assertEquals(one, csv(net, 200, 5));
        assertFalse(one.equals(csv(net, 200, 6)));
        String[] lines = one.split("\n");
        assertEquals(201, lines.length);
        assertEquals("\"size, cm\",b", lines[0]); // RFC 4180 quoting
        assertTrue(one.contains("\"big, \"\"very\"\"\","), "quoted label with doubled quotes");
    }

    static String csv(Network net, long rows, long seed) throws Exception {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        long[] seen = new long[1];
        new ForwardSampler(net).writeCsv(rows, seed, out, n -> seen[0] += n);
        assertEquals(rows, seen[0], "progress counts every row");
        return out.toString(StandardCharsets.UTF_8);
    }
}
