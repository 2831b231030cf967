package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.NetworkReader;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Issue 23 item 14: states that need CSV quoting (a comma, a quote, a line break) or hold blank space
 * inside round-trip through {@code simulate} (the one {@link ForwardSampler}, RFC 4180 quoting) and
 * {@code tally} (Spark's CSV reader): the store lists exactly the network's states, and each
 * variable's counts equal a recount of the same draws ({@link ForwardSampler#sample} with the same
 * seed, independent of any CSV). The states no table can give back (empty, blank space at an end) are
 * refused when the network is read (NetworkReaderTest).
 */
class SimulateRoundTripTest {
    @TempDir
    static Path dir;

    /** A network over two variables whose states need quoting or keep inner blank space. */
    static final String NETWORK = """
            {"edgewiseNetwork": 1, "name": "awkward", "variables": [
             {"name": "a", "states": ["x,y", "say \\"hi\\"", "two words", "line\\nbreak", "1"], "parents": [],
              "cpt": [[0.2, 0.2, 0.2, 0.2, 0.2]]},
             {"name": "b b", "states": ["#1", "ü", "-"], "parents": ["a"],
              "cpt": [[0.5, 0.3, 0.2], [0.2, 0.5, 0.3], [0.3, 0.2, 0.5], [0.4, 0.4, 0.2], [0.1, 0.1, 0.8]]}]}
            """;

    @Test
    void quotedAndSpacedStatesReadBackAsWritten() throws IOException {
        Network net = NetworkReader.parse("awkward.json", NETWORK);
        int rows = 400;
        long seed = 5;
        Path csv = dir.resolve("sim.csv");
        try (OutputStream out = Files.newOutputStream(csv)) {
            new ForwardSampler(net).writeCsv(rows, seed, out, n -> { });
        }
        ScoreStore store = TestTables.tallyInto(dir, csv, "--max-parents", "1");
        int[][] draws = new ForwardSampler(net).sample(rows, seed);
        for (int v = 0; v < net.size(); v++) {
            assertEquals(net.names().get(v), store.variables().get(v).name());
            // every state was drawn (400 rows, no probability below 0.1 given each parent state)
            List<String> expected = net.states().get(v).stream().sorted().toList();
            assertEquals(expected, store.variables().get(v).states().stream().sorted().toList(), "states of " + v);
            long[] recount = new long[net.arity(v)];
            for (int[] row : draws) {
                recount[row[v]]++;
            }
            long[] stored = new long[net.arity(v)];
            FamilyCounts f = noParents(store, v);
            for (int k = 0; k < store.variables().get(v).arity(); k++) {
                stored[net.states().get(v).indexOf(store.variables().get(v).states().get(k))] = f.counts()[k];
            }
            assertArrayEquals(recount, stored, "counts of " + net.names().get(v));
        }
    }

    private static FamilyCounts noParents(ScoreStore store, int child) {
        for (int f = 0; f < store.families().size(); f++) {
            FamilyCounts c = store.family(f);
            if (c.child() == child && c.parents().length == 0) {
                return c;
            }
        }
        throw new AssertionError("no empty-parent family of " + child);
    }
}
