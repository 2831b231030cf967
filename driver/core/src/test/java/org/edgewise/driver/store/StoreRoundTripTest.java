package org.edgewise.driver.store;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.edgewise.driver.UserError;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class StoreRoundTripTest {
    @TempDir
    Path dir;

    static Manifest manifest() {
        return Manifest.of("edgewise", "test", "2026-01-01T00:00:00Z",
                new InputInfo(List.of("x.csv"), "csv", 5, 0, "error", "00ff"),
                List.of(new Variable("a", List.of("0", "1")), new Variable("b", List.of("x", "y", "z"))),
                1, null, List.of(), List.of(), List.of(), "bdeu", 1.0);
    }

    static List<FamilyCounts> families() {
        return List.of(
                new FamilyCounts(0, new int[0], new long[] {0}, new long[] {2, 3}),
                new FamilyCounts(0, new int[] {1}, new long[] {0, 2}, new long[] {1, 1, 1, 2}),
                new FamilyCounts(1, new int[0], new long[] {0}, new long[] {2, 0, 3}),
                new FamilyCounts(1, new int[] {0}, new long[] {0, 1}, new long[] {1, 0, 1, 1, 0, 2}));
    }

    @Test
    void writesAndReadsBack() throws Exception {
        Path store = dir.resolve("s");
        StoreWriter.write(store, manifest(), families(), new double[] {-1, -2, -3, -4}, false);
        try (Stream<Path> files = Files.list(dir)) {
            assertEquals(List.of(store), files.toList(), "no temporary left behind");
        }
        ScoreStore s = StoreReader.read(store);
        assertEquals(4, s.families().size());
        assertEquals(2, s.firstFamilyOf(1));
        assertArrayEquals(new long[] {0, 2}, s.family(1).configs());
        assertArrayEquals(new long[] {1, 0, 1, 1, 0, 2}, s.family(3).counts());
        assertArrayEquals(new int[] {0}, s.family(3).parents());
        assertEquals(-4, s.logScore(3));
        assertEquals(List.of("x", "y", "z"), s.variables().get(1).states());
        assertFalse(Files.exists(store.resolve(".counts.parquet.crc")));
    }

    /**
     * A scores-only read gives the same families and stored scores as the full read (source: the same file), refuses
     * to hand out counts it did not read (a bug to ask), and does not look at the counts part at all.
     */
    @Test
    void scoresOnlyReadGivesTheFamiliesAndScoresWithoutCounts() throws Exception {
        Path store = dir.resolve("s");
        StoreWriter.write(store, manifest(), families(), new double[] {-1, -2, -3, -4}, false);
        ScoreStore full = StoreReader.read(store);
        ScoreStore light = StoreReader.readScores(store);
        assertTrue(full.hasCounts());
        assertFalse(light.hasCounts());
        assertArrayEquals(full.logScores(), light.logScores());
        for (int f = 0; f < 4; f++) {
            assertArrayEquals(full.family(f).parents(), light.family(f).parents());
            assertEquals(full.family(f).child(), light.family(f).child());
        }
        int f = 3;
        assertThrows(IllegalStateException.class, () -> light.family(f).counts());
        assertThrows(IllegalStateException.class, () -> light.family(f).configs());
        Files.delete(store.resolve(StoreFormat.COUNTS));
        assertEquals(-4, StoreReader.readScores(store).logScore(3));
    }

    @Test
    void refusesToOverwriteWithoutPermission() {
        Path store = dir.resolve("s");
        StoreWriter.write(store, manifest(), families(), new double[] {-1, -2, -3, -4}, false);
        UserError e = assertThrows(UserError.class,
                () -> StoreWriter.write(store, manifest(), families(), new double[4], false));
        assertEquals("output " + store + " already exists; pass overwrite to replace it", e.getMessage());
        StoreWriter.write(store, manifest(), families(), new double[] {-5, -6, -7, -8}, true);
        assertEquals(-5, StoreReader.read(store).logScore(0));
    }

    @Test
    void refusesDamagedOrForeignStores() throws Exception {
        Path store = dir.resolve("s");
        StoreWriter.write(store, manifest(), families(), new double[] {-1, -2, -3, -4}, false);
        Path counts = store.resolve(StoreFormat.COUNTS);
        byte[] bytes = Files.readAllBytes(counts);
        bytes[bytes.length / 2] ^= 1;
        Files.write(counts, bytes);
        UserError e = assertThrows(UserError.class, () -> StoreReader.read(store));
        assertEquals("store " + store + " is damaged: counts.parquet does not match its manifest (SHA-256 differs); re-run the tally", e.getMessage());

        Path manifestFile = store.resolve(StoreFormat.MANIFEST);
        Files.writeString(manifestFile, Files.readString(manifestFile).replace("\"formatVersion\" : 1", "\"formatVersion\" : 7"));
        e = assertThrows(UserError.class, () -> StoreReader.read(store));
        assertEquals("store " + store + " has format version 7; this Edgewise reads format versions 1 and 2", e.getMessage());

        Files.delete(manifestFile);
        e = assertThrows(UserError.class, () -> StoreReader.read(store));
        assertTrue(e.getMessage().contains("has no manifest.json"), e.getMessage());
    }

    @Test
    void theWriterStampsTheFormatVersion() throws Exception {
        assertEquals(0, manifest().formatVersion(), "a manifest built in memory is not stamped");
        Path store = dir.resolve("s");
        StoreWriter.write(store, manifest(), families(), new double[] {-1, -2, -3, -4}, false);
        assertTrue(Files.readString(store.resolve(StoreFormat.MANIFEST)).contains("\"formatVersion\" : " + StoreFormat.VERSION_PLAIN));
        assertEquals(StoreFormat.VERSION_PLAIN, StoreReader.read(store).manifest().formatVersion());
    }

    /** The row part of the fingerprint is recomputed from the counts: each family counts every row once. */
    @Test
    void refusesCountsThatDisagreeWithTheDataFingerprint() throws Exception {
        Path store = dir.resolve("s");
        Manifest m = manifest();
        InputInfo in = m.input();
        Manifest sixRows = Manifest.of(m.program(), m.programVersion(), m.createdAt(),
                new InputInfo(in.paths(), in.format(), 6, in.droppedRows(), in.missingPolicy(), in.fingerprint()),
                m.variables(), m.maxParents(), m.candidates(), m.forbidden(), m.required(), m.tiers(), m.score(), m.ess());
        StoreWriter.write(store, sixRows, families(), new double[] {-1, -2, -3, -4}, false);
        UserError e = assertThrows(UserError.class, () -> StoreReader.read(store));
        assertEquals("store " + store + " is damaged: family 0 (child a) counts 5 rows; the data fingerprint says 6",
                e.getMessage());

        StoreWriter.write(store, manifest(), families(), new double[] {-1, -2, -3, -4}, true);
        Path manifestFile = store.resolve(StoreFormat.MANIFEST);
        Files.writeString(manifestFile, Files.readString(manifestFile).replace("\"00ff\"", "\"\""));
        e = assertThrows(UserError.class, () -> StoreReader.read(store));
        assertEquals("store " + store + ": manifest.json has no data fingerprint (input.fingerprint, hex)", e.getMessage());
    }
}
