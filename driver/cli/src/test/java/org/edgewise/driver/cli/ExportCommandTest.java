package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.NetworkReader;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code export}: a network from a saved sample, read back by {@link NetworkReader} (what {@code simulate}
 * and {@code compare} read), and the round trip export → simulate → tally → edges. References: the
 * generating network (its edges); the posterior-mean table θ̄_ijk = (N_ijk + α_ijk)/(N_ij + α_ij) with BDeu
 * α_ijk = ESS/(q r), ESS 1 (Heckerman, Geiger &amp; Chickering 1995, eq. 23), counted here from the rows.
 */
class ExportCommandTest {
    static final String ORDER = "v0,v1,v2,v3,v4";

    @TempDir
    Path dir;

    static Set<String> edges(Network net) {
        Set<String> out = new TreeSet<>();
        for (String[] e : net.edges()) {
            out.add(e[0] + "->" + e[1]);
        }
        return out;
    }

    /** The edges of an edges result whose posterior exceeds 1/2. */
    static Set<String> recovered(String json) throws Exception {
        Set<String> out = new TreeSet<>();
        for (JsonNode e : StoreFixture.JSON.readTree(json).get("edges")) {
            if (e.get("posterior").asDouble() > 0.5) {
                out.add(e.get("from").asText() + "->" + e.get("to").asText());
            }
        }
        return out;
    }

    /** Rows of a CSV that simulate wrote (header v0 … v4, labels s0, s1, …) as state indices. */
    static int[][] rows(Path csv) throws Exception {
        List<String> lines = Files.readAllLines(csv);
        assertEquals("v0,v1,v2,v3,v4", lines.get(0));
        int[][] out = new int[lines.size() - 1][];
        for (int t = 1; t < lines.size(); t++) {
            String[] f = lines.get(t).split(",");
            out[t - 1] = new int[f.length];
            for (int v = 0; v < f.length; v++) {
                out[t - 1][v] = Integer.parseInt(f[v].substring(1));
            }
        }
        return out;
    }

    @Test
    void exportSimulateTallyEdgesRecoversTheExportedNetwork() throws Exception {
        Network truth = NetworkReader.parse("truth", OptionWalkTest.TRUTH); // v0 -> v1 -> v2; v3, v4 alone
        int[][] data = new ForwardSampler(truth).sample(3000, 11L);
        Path store = dir.resolve("store");
        CliRun.store(store, data, CliRun.ARITIES, 2);
        Path sample = dir.resolve("sample");
        OptionWalkTest.ok(CliRun.of("sample", "--store", store.toString(), "--out", sample.toString(), "--order", ORDER,
                "--dags", "200"));
        Path net = dir.resolve("net.json");
        CliRun r = CliRun.of("export", "--store", store.toString(), "--sample", sample.toString(), "--out", net.toString());
        OptionWalkTest.ok(r);
        assertTrue(r.out().startsWith("export: wrote " + net + ": 5 variables, 2 edges; the highest-posterior DAG of sample "),
                r.out());
        Network exported = NetworkReader.read(net);
        assertEquals(edges(truth), edges(exported), "3000 rows of a strong chain: the sample's best DAG is the truth's");
        // the table of v1 given v0: posterior means from the counts, by the formula (BDeu, ESS 1: a_ijk = 1/6, a_ij = 1/2)
        int v1 = exported.indexOf("v1");
        for (int j = 0; j < 2; j++) {
            long nj = 0;
            long[] njk = new long[3];
            for (int[] row : data) {
                if (row[0] == j) {
                    nj++;
                    njk[row[1]]++;
                }
            }
            for (int k = 0; k < 3; k++) {
                assertEquals((njk[k] + 1.0 / 6) / (nj + 0.5), exported.probability(v1, j, k), 1e-15);
            }
        }
        // simulate from it, tally what it draws, ask the edges given its order: the same edges again
        Path csv = dir.resolve("again.csv");
        OptionWalkTest.ok(CliRun.of("simulate", "--network", net.toString(), "--rows", "3000", "--seed", "5", "--out", csv.toString()));
        Path store2 = dir.resolve("store2");
        CliRun.store(store2, rows(csv), CliRun.ARITIES, 2);
        CliRun e = CliRun.of("edges", "--store", store2.toString(), "--order", ORDER, "--format", "json");
        OptionWalkTest.ok(e);
        assertEquals(edges(exported), recovered(e.out()));
        // the consensus graph of this sample is the same DAG; to standard output, nothing else printed
        CliRun c = CliRun.of("export", "--store", store.toString(), "--sample", sample.toString(), "--structure", "consensus");
        OptionWalkTest.ok(c);
        Network consensus = NetworkReader.parse("stdout", c.out());
        assertEquals(edges(exported), edges(consensus));
        assertTrue(consensus.description().startsWith("the consensus graph of sample "), consensus.description());
        assertFalse(Files.exists(dir.resolve("stdout")));
    }

    @Test
    void theAveragedEdgesAreNamedWhereTheyAreAndANetworkNeedsASample() throws Exception {
        Path store = dir.resolve("store");
        CliRun.store(store, 3L, 2);
        assertEquals("export: --format dot: export writes a network (network-json); the averaged edges come from edges --sample "
                + "DIR --out result.json, and as DOT from report --result result.json --format dot",
                CliRun.of("export", "--store", store.toString(), "--sample", dir.toString(), "--format", "dot").errLine());
        assertEquals("export: export needs --sample DIR: the network is taken from a posterior sample saved by the sample command",
                CliRun.of("export", "--store", store.toString()).errLine());
    }
}
