package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.spark.sql.SparkSession;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreFormat;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.ExtendWith;
import org.junit.jupiter.api.io.TempDir;

/**
 * The store does not depend on the Spark line that wrote it (src/test/resources/lines/README.md):
 * a fresh tally of {@code lines/table.csv} on the line running this test has exactly the counts
 * and scores of the stores the Spark 3.5 and the Spark 4 line wrote from it, each of which this
 * line's reader must read, and of an independent recount; its Parquet parts are byte-identical to
 * those its own line wrote (the two Parquet versions write different page headers and footers).
 */
@ExtendWith(SharedSpark.class)
class SameStoreOnEveryLineTest {
    @TempDir
    static Path dir;
    static Path lines;
    static ScoreStore fresh;
    static Path freshDir;

    @BeforeAll
    static void tally(SparkSession spark) throws URISyntaxException {
        lines = Path.of(SameStoreOnEveryLineTest.class.getResource("/lines/table.csv").toURI()).getParent();
        freshDir = dir.resolve("store");
        TestTables.Run r = TestTables.tally(spark, "--input", lines.resolve("table.csv").toString(),
                "--out", freshDir.toString(), "--max-parents", "2");
        assertEquals(0, r.status(), r.err());
        fresh = TestTables.read(freshDir);
    }

    /** Same variables and states, same families, same counts, scores equal to the bit, same data fingerprint. */
    private static void sameContent(ScoreStore a, ScoreStore b, String what) {
        assertEquals(a.variables().size(), b.variables().size(), what);
        for (int v = 0; v < a.variables().size(); v++) {
            assertEquals(a.variables().get(v).name(), b.variables().get(v).name(), what);
            assertEquals(a.variables().get(v).states(), b.variables().get(v).states(), what);
        }
        assertEquals(a.families().size(), b.families().size(), what);
        for (int f = 0; f < a.families().size(); f++) {
            FamilyCounts x = a.family(f);
            FamilyCounts y = b.family(f);
            assertEquals(x.child(), y.child(), what + ", family " + f);
            assertArrayEquals(x.parents(), y.parents(), what + ", family " + f);
            assertArrayEquals(x.configs(), y.configs(), what + ", family " + f);
            assertArrayEquals(x.counts(), y.counts(), what + ", family " + f);
            assertEquals(Double.doubleToLongBits(a.logScore(f)),
                    Double.doubleToLongBits(b.logScore(f)), what + ", score of family " + f);
        }
    }

    @Test
    void freshStoreHasTheCountsAndScoresOfTheStoreEachLineWrote() {
        for (String line : List.of("store-spark3", "store-spark4")) {
            ScoreStore ref = TestTables.read(lines.resolve(line));
            sameContent(ref, fresh, line + " vs this line's tally");
            assertEquals(ref.manifest().input().fingerprint(), fresh.manifest().input().fingerprint(), line);
        }
    }

    /** Independent recount (InMemoryTally, a per-row loop) of the CSV read as plain text. */
    @Test
    void freshStoreEqualsAnIndependentRecount() throws IOException {
        List<String> text = Files.readAllLines(lines.resolve("table.csv"));
        List<Variable> vars = fresh.variables();
        int[][] rows = new int[text.size() - 1][vars.size()];
        for (int t = 1; t < text.size(); t++) {
            String[] fields = text.get(t).split(",", -1);
            for (int v = 0; v < vars.size(); v++) {
                rows[t - 1][v] = vars.get(v).stateIndex(fields[v]);
            }
        }
        ScoreStore ref = InMemoryTally.tally(vars, rows, 2, FamilyScore.withDefaults());
        assertEquals(800, fresh.manifest().input().rows());
        for (int f = 0; f < ref.families().size(); f++) {
            assertArrayEquals(ref.family(f).counts(), fresh.family(f).counts(), "family " + f);
            assertEquals(ref.logScore(f), fresh.logScore(f), 1e-9, "family " + f);
        }
    }

    /** Byte for byte against the store of this build's own line (its Parquet version). */
    @Test
    void partsAreByteIdenticalToThoseOfTheSameLine() throws IOException {
        String line = System.getProperty("edgewise.sparkLine", "3");
        Path own = lines.resolve("store-spark" + line);
        for (String part : List.of(StoreFormat.COUNTS, StoreFormat.SCORES)) {
            assertArrayEquals(Files.readAllBytes(own.resolve(part)), Files.readAllBytes(freshDir.resolve(part)),
                    part + " vs " + own.getFileName());
        }
    }
}
