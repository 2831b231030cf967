package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import org.edgewise.driver.HeldOutData;
import org.edgewise.driver.analysis.CandidateWideningTest;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreWriter;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * What {@code edges} says about a store tallied with pruned candidates (issue 20, point 3), word for
 * word, on the table of {@link CandidateWideningTest} (b = a XOR e and its proxy x; 6 binary variables):
 * with more candidates than d and nothing stored beyond them, every child is named as unchecked; with a
 * reserve, the widenings are listed and nothing is left unchecked.
 */
class CandidateCautionTest {
    @TempDir
    Path dir;

    Path write(String name, int k, int reserve) {
        ScoreStore s = InMemoryTally.pruned(HeldOutData.variables(2, 2, 2, 2, 2, 2), CandidateWideningTest.rows(), 2,
                FamilyScore.withDefaults(), k, reserve);
        Path p = dir.resolve(name);
        StoreWriter.write(p, s.manifest(), s.families(), s.logScores(), false);
        return p;
    }

    @Test
    void aPlainPrunedStoreNamesTheChildrenItCouldNotCheck() throws Exception {
        Path store = write("plain", 3, -1);
        Path json = dir.resolve("r.json");
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--method", "exact");
        assertEquals(0, r.status(), r.err());
        String caution = """
                CAUTION: candidate parents were pruned at tally time and nothing beyond them is stored, so whether they bound \
                the posterior could not be checked for 6 children (v0, v1, v2, v3, v4, v5); an edge into them may stand for a \
                pruned parent. Tally with --reserve M beside --candidates to check and widen them.
                """;
        assertTrue(r.out().contains("\n" + caution), r.out());
        // written to a file, nothing goes to standard output: the caution goes to standard error beside the file's name
        CliRun f = CliRun.of("edges", "--store", store.toString(), "--method", "exact", "--out", json.toString());
        assertEquals(0, f.status(), f.err());
        assertEquals(caution + "edges: wrote " + json + "\n", f.err().replace("\r\n", "\n"));
        JsonNode j = new ObjectMapper().readTree(Files.readString(json));
        assertEquals(6, j.get("candidateSearch").get("unchecked").size());
        // the report says it under "Read this first"
        Path html = dir.resolve("r.html");
        assertEquals(0, CliRun.of("report", "--result", json.toString(), "--out", html.toString()).status());
        assertTrue(Files.readString(html).contains("<li><b>Candidate parents were pruned at tally time.</b> Whether the "
                + "candidates bound the posterior could not be checked for 6 children (nothing beyond their candidates is "
                + "stored): v0, v1, v2, v3, v4, v5. A tally with more candidates, or with a reserve of further ones, settles it."
                + "</li>"), "report bullet");
        assertEquals(false, j.get("candidateSearch").get("reserve").asBoolean());
    }

    @Test
    void aReserveIsWidenedIntoAndSaidSo() throws Exception {
        Path store = write("reserve", 1, 4);
        Path json = dir.resolve("r.json");
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--method", "exact");
        assertEquals(0, r.status(), r.err());
        assertEquals(0, CliRun.of("edges", "--store", store.toString(), "--method", "exact", "--out", json.toString()).status());
        assertTrue(r.out().contains("\nCandidates widened into the store's reserve where the posterior reached them, and "
                + "averaged again: v1 (+v0, v2, v3, v4; filled, round 1); "), r.out());
        assertTrue(!r.out().contains("CAUTION: candidate"), r.out());
        JsonNode j = new ObjectMapper().readTree(Files.readString(json));
        assertEquals(0, j.get("candidateBoundary").size());
        assertEquals(true, j.get("candidateSearch").get("reserve").asBoolean());
        assertEquals("v2", j.get("candidateSearch").get("widened").get(1).get("child").asText());
        assertEquals(0, j.get("candidateSearch").get("unchecked").size());
    }
}
