package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.NetworkReader;
import org.edgewise.driver.result.EdgeResult;
import org.junit.jupiter.api.Test;

/** compare's figures on a hand example (truth a → b → c → d). */
class EdgeRecoveryTest {
    static Network chain() {
        return NetworkReader.parse("chain", "{\"edgewiseNetwork\":1,\"variables\":["
                + "{\"name\":\"a\",\"states\":[\"0\",\"1\"],\"cpt\":[[0.5,0.5]]},"
                + "{\"name\":\"b\",\"states\":[\"0\",\"1\"],\"parents\":[\"a\"],\"cpt\":[[0.9,0.1],[0.1,0.9]]},"
                + "{\"name\":\"c\",\"states\":[\"0\",\"1\"],\"parents\":[\"b\"],\"cpt\":[[0.9,0.1],[0.1,0.9]]},"
                + "{\"name\":\"d\",\"states\":[\"0\",\"1\"],\"parents\":[\"c\"],\"cpt\":[[0.9,0.1],[0.1,0.9]]}]}");
    }

    /** a→b 0.9 (right), c→b 0.8 (reversed b→c), a→d 0.7 (extra), c→d 0.2 (missed), b→a 0.06; others 0. */
    static EdgeMatrix estimate() {
        List<EdgeResult.Edge> e = List.of(new EdgeResult.Edge("a", "b", 0.9), new EdgeResult.Edge("c", "b", 0.8),
                new EdgeResult.Edge("a", "d", 0.7), new EdgeResult.Edge("c", "d", 0.2), new EdgeResult.Edge("b", "a", 0.06));
        return EdgeMatrix.of(List.of("a", "b", "c", "d"), e, "test");
    }

    @Test
    void structuralHammingDistanceByHand() {
        EdgeRecovery r = EdgeRecovery.of(estimate(), chain(), "chain", 0.5);
        EdgeRecovery.Consensus c = r.consensus();
        // consensus {a→b, c→b, a→d}: missing c→d, reversed b→c, extra a→d — SHD 3 (each counts 1)
        assertEquals(List.of("c -> d"), c.missing());
        assertEquals(List.of("b -> c"), c.reversed());
        assertEquals(List.of("a -> d"), c.extra());
        assertEquals(3, c.shd());
        assertEquals(3, c.edges());
        assertEquals(1, c.correct());
        assertEquals(1.0 / 3, c.precision(), 1e-15);
        assertEquals(1.0 / 3, c.recall(), 1e-15);
        // skeleton: estimated {ab, bc, ad}, true {ab, bc, cd}
        assertEquals(2.0 / 3, c.skeletonPrecision(), 1e-15);
        assertEquals(2.0 / 3, c.skeletonRecall(), 1e-15);
        // lower threshold 0.1 adds c→d: SHD 2
        assertEquals(2, EdgeRecovery.of(estimate(), chain(), "chain", 0.1).consensus().shd());
        // threshold 0.05 adds b→a beside the correct a→b: an extra edge
        EdgeRecovery.Consensus low = EdgeRecovery.of(estimate(), chain(), "chain", 0.05).consensus();
        assertEquals(List.of("b -> a", "a -> d"), low.extra());
        assertEquals(3, low.shd());
    }

    @Test
    void rankingFiguresByHand() {
        EdgeRecovery r = EdgeRecovery.of(estimate(), chain(), "chain", 0.5);
        assertEquals(3, r.trueEdges());
        // directed, 12 ordered pairs: positives a→b 0.9, b→c 0, c→d 0.2; negatives c→b 0.8, a→d 0.7,
        // b→a 0.06 and six zeros. U = 9 + (6 ties · ½) + 7 = 19 (by hand); AUROC = 19 / 27
        assertEquals(3, r.directed().positives());
        assertEquals(9, r.directed().negatives());
        assertEquals(19.0 / 27, r.directed().auroc(), 1e-15);
        // skeleton, 6 pairs scored min(1, P(x→y)+P(y→x)): ab 0.96+, bc 0.8+, cd 0.2+, ad 0.7−, ac 0−, bd 0−:
        // U = 3 + 3 + 2 = 8 of 9
        assertEquals(8.0 / 9, r.skeleton().auroc(), 1e-15);
        // skeleton AP: ranks ab(+), bc(+), ad(−), cd(+): (1 + 1 + 3/4) / 3
        assertEquals(2.75 / 3, r.skeleton().averagePrecision(), 1e-15);
    }

    @Test
    void refusesResultVariablesTheTruthLacks() {
        EdgeMatrix m = EdgeMatrix.of(List.of("a", "zz"), List.of(new EdgeResult.Edge("a", "zz", 0.5)), "test");
        assertEquals("result variable 'zz' is not in the truth network chain",
                assertThrows(UserError.class, () -> EdgeRecovery.of(m, chain(), "chain", 0.5)).getMessage());
        // a truth with more variables: compared on the induced subgraph, extras listed
        EdgeMatrix ab = EdgeMatrix.of(List.of("a", "b"), List.of(new EdgeResult.Edge("a", "b", 0.9)), "test");
        EdgeRecovery r = EdgeRecovery.of(ab, chain(), "chain", 0.5);
        assertEquals(List.of("c", "d"), r.truthOnly());
        assertEquals(0, r.consensus().shd());
    }
}
