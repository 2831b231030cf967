package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.analysis.CandidateWideningTest;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreWriter;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code sample} on a store tallied with pruned candidates (issue 19): the sample says which children its candidate
 * sets bound, and predictions and effects answered from it carry that caution. The table of {@link CandidateWideningTest}
 * (v2 = v0 XOR v1 with 5% noise, v3 its proxy; 6 binary variables) with one candidate per child, so that some child is
 * bound. Reference for the list: {@code edges --sample} on the same sample, which applies the boundary rules
 * ({@code CandidateBoundary}) to the same DAG frequencies — the sample must name exactly the children it names.
 */
class SampleBoundaryTest {
    @TempDir
    Path dir;

    @Test
    void aSampleFromAPrunedStoreNamesItsBoundChildrenAndQueriesCarryTheCaution() throws Exception {
        ScoreStore s = InMemoryTally.pruned(HeldOutData.variables(2, 2, 2, 2, 2, 2), CandidateWideningTest.rows(), 2,
                FamilyScore.withDefaults(), 1, -1);
        Path store = dir.resolve("store");
        StoreWriter.write(store, s.manifest(), s.families(), s.logScores(), false);
        Path sample = dir.resolve("sample");
        CliRun drawn = CliRun.of("sample", "--store", store.toString(), "--out", sample.toString(), "--method", "exact",
                "--dags", "2000", "--seed", "3");
        assertEquals(0, drawn.status(), drawn.err());
        ObjectMapper json = new ObjectMapper();
        JsonNode info = json.readTree(sample.resolve("sample.json").toFile());
        List<String> bound = new ArrayList<>();
        info.get("candidateBoundary").forEach(n -> bound.add(n.asText()));
        assertTrue(!bound.isEmpty(), "one candidate per child bounds some: " + bound);
        assertTrue(drawn.err().contains("sample: CAUTION: the candidate sets pruned at tally time bound the sampled posterior of "
                + String.join(", ", bound) + " (a parent beyond them may be missing from every DAG)"), drawn.err());

        CliRun edges = CliRun.of("edges", "--store", store.toString(), "--sample", sample.toString(), "--format", "json");
        assertEquals(0, edges.status(), edges.err());
        List<String> byEdges = new ArrayList<>();
        json.readTree(edges.out()).get("candidateBoundary").forEach(n -> byEdges.add(n.asText()));
        assertEquals(byEdges, bound);

        String caution = "CAUTION: the candidate sets pruned at tally time bound the posterior of " + String.join(", ", bound)
                + " (a parent beyond them may be missing from every DAG)";
        CliRun predict = CliRun.of("predict", "--store", store.toString(), "--sample", sample.toString(), "--case", "v2=s1",
                "--given", "v0=s0");
        assertEquals(0, predict.status(), predict.err());
        assertTrue(predict.out().contains(caution), predict.out());
        CliRun effect = CliRun.of("effect", "--store", store.toString(), "--sample", sample.toString(), "--do", "v0=s1",
                "--target", "v2=s1", "--format", "json");
        assertEquals(0, effect.status(), effect.err());
        JsonNode e = json.readTree(effect.out());
        e = e.isArray() ? e.get(0) : e;
        assertTrue(e.get("averagedOver").asText().contains(caution), e.get("averagedOver").asText());
    }
}
