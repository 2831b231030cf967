package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Path;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreWriter;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class ScoresCommandTest {
    @TempDir
    Path dir;

    static CliRun run(String... args) {
        return CliRun.of(args);
    }

    static final List<Variable> VARS = List.of(new Variable("a", List.of("0", "1")),
            new Variable("b", List.of("0", "1", "2")), new Variable("c", List.of("x", "y")));

    static int[][] table(long seed, int rows) {
        SplittableRandom rnd = new SplittableRandom(seed);
        int[][] t = new int[rows][3];
        for (int[] row : t) {
            row[0] = rnd.nextInt(2);
            row[1] = (row[0] + rnd.nextInt(2)) % 3;
            row[2] = rnd.nextDouble() < 0.8 ? row[0] : 1 - row[0];
        }
        return t;
    }

    Path store(String name, FamilyScore score) {
        ScoreStore s = InMemoryTally.tally(VARS, table(11, 300), 2, score);
        Path p = dir.resolve(name);
        StoreWriter.write(p, s.manifest(), s.families(), s.logScores(), false);
        return p;
    }

    @Test
    void rescoredExportEqualsAStoreScoredAtThatEss() throws Exception {
        Path ess1 = store("ess1", FamilyScore.withDefaults());
        Path ess10 = store("ess10", FamilyScore.of(ScoreKind.BDEU, 10));
        Path k2 = store("k2", FamilyScore.of(ScoreKind.K2, 1));
        ObjectMapper json = new ObjectMapper();
        JsonNode rescoredAll = json.readTree(run("scores", "--store", ess1.toString(), "--ess", "10").out());
        // every result JSON starts with its format version and kind (ResultJson stamps them in one place)
        assertEquals("[formatVersion, kind, score, ess, families]", fieldNames(rescoredAll));
        assertEquals("scores", rescoredAll.get("kind").asText());
        assertEquals(10.0, rescoredAll.get("ess").asDouble());
        JsonNode rescored = rescoredAll.get("families");
        JsonNode direct = json.readTree(run("scores", "--store", ess10.toString()).out()).get("families");
        JsonNode k2All = json.readTree(run("scores", "--store", ess1.toString(), "--score", "k2").out());
        assertTrue(k2All.get("ess") == null, "K2 has no ESS: " + k2All);
        JsonNode rescoredK2 = k2All.get("families");
        JsonNode directK2 = json.readTree(run("scores", "--store", k2.toString()).out()).get("families");
        assertEquals(direct.size(), rescored.size());
        assertEquals(3 * (1 + 2 + 1), direct.size(), "3 children × parent sets of size ≤ 2 from 2 others");
        for (int i = 0; i < direct.size(); i++) {
            assertEquals(direct.get(i).get("child"), rescored.get(i).get("child"));
            assertEquals(direct.get(i).get("parents"), rescored.get(i).get("parents"));
            assertEquals(direct.get(i).get("logScore").asDouble(), rescored.get(i).get("logScore").asDouble(), 1e-9);
            assertEquals(directK2.get(i).get("logScore").asDouble(), rescoredK2.get(i).get("logScore").asDouble(), 1e-9);
        }
    }

    @Test
    void csvHasOneRowPerFamily() {
        Path s = store("s", FamilyScore.withDefaults());
        CliRun r = run("scores", "--store", s.toString(), "--format", "csv");
        assertEquals(0, r.status(), r.err());
        List<String> lines = r.out().lines().toList();
        assertEquals("child,parents,logScore", lines.get(0));
        assertEquals(1 + 12, lines.size());
        assertTrue(lines.get(2).startsWith("a,b,-"), lines.get(2));
        assertTrue(lines.get(4).startsWith("a,b;c,-"), lines.get(4));
    }

    @Test
    void badInputIsOneLineAndExitTwo() {
        Path s = store("s", FamilyScore.withDefaults());
        CliRun r = run("scores", "--store", s.toString(), "--format", "xml");
        assertEquals(2, r.status());
        assertEquals("scores: --format must be json or csv, got 'xml'\n", r.err());
        r = run("scores", "--store", s.toString(), "--ess", "0");
        assertEquals(2, r.status());
        assertEquals("scores: --ess must be positive, got 0.0\n", r.err());
        r = run("scores", "--store", dir.resolve("nope").toString());
        assertEquals(2, r.status());
        assertEquals("scores: store " + dir.resolve("nope") + " does not exist or is not a directory\n", r.err());
    }

    static String fieldNames(JsonNode n) {
        java.util.List<String> names = new java.util.ArrayList<>();
        n.fieldNames().forEachRemaining(names::add);
        return names.toString();
    }
}
