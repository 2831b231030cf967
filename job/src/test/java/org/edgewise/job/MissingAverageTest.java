package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.apache.spark.sql.SparkSession;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.MissingValues;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreFormat;
import org.edgewise.driver.store.StoreReader;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code tally --missing average} on Spark: the store records how the missing cells were averaged
 * over (shares counted by hand from the table below), holds the kept DAGs as its sample, and rows
 * whose missing cells are too many to enumerate are refused in one line.
 */
class MissingAverageTest {
    @TempDir
    static Path dir;
    static SparkSession spark;

    @BeforeAll
    static void session() {
        spark = SharedSpark.session();
    }

    /** 40 rows of a, b, c; b empty in rows 0, 10, 20 (3 of 40), c empty in row 20 and 30 (2 of 40). */
    static Path table(Path file) {
        List<String[]> rows = new ArrayList<>();
        for (int i = 0; i < 40; i++) {
            String a = i % 2 == 0 ? "x" : "y";
            String b = i % 10 == 0 && i < 30 ? "" : (i % 3 == 0 ? "p" : a.equals("x") ? "q" : "p");
            String c = i == 20 || i == 30 ? "" : (i % 4 == 0 ? "u" : "v");
            rows.add(new String[] {a, b, c});
        }
        return TestTables.csv(file, List.of("a", "b", "c"), rows);
    }

    @Test
    void theStoreRecordsTheMissingCellsAndHoldsTheKeptDags() {
        Path in = table(dir.resolve("t.csv"));
        Path out = dir.resolve("store");
        TestTables.Run r = TestTables.tally(spark, "--input", in.toString(), "--out", out.toString(), "--missing", "average",
                "--rounds", "6", "--seed", "3");
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("averaged over missing values by data augmentation (missing at random assumed): "
                + "6 rounds, burn-in 3, 2 chains"), r.out());
        // rows 0, 10, 20, 30 are incomplete: 4 of 40
        assertTrue(r.out().contains("incomplete rows 4 (10.0%); missing cells per variable: b 7.5%, c 5.0%"), r.out());
        ScoreStore s = StoreReader.read(out);
        Manifest m = s.manifest();
        assertEquals(StoreFormat.VERSION, m.formatVersion());
        MissingValues mv = m.missingValues();
        assertEquals(4, mv.incompleteRows());
        assertEquals(0.075, mv.missingCellShare().get("b"), 1e-12);
        assertEquals(0.0, mv.missingCellShare().get("a"), 0);
        assertEquals("order-modular", mv.dagPrior());
        assertEquals(40, m.input().rows());
        assertEquals("average", m.input().missingPolicy());
        SampleFile.Loaded sample = SampleFile.read(out.resolve(mv.sample()), m, out);
        assertEquals(2, sample.dags().chains());
        assertEquals(3 * mv.drawsPerRound(), sample.dags().perChain());
        // the completed table counts every row, missing cells included
        assertEquals(40, s.family(0).total());
    }

    @Test
    void aTableWithoutMissingCellsIsAPlainStore() {
        List<String[]> rows = new ArrayList<>();
        for (int i = 0; i < 20; i++) {
            rows.add(new String[] {i % 2 == 0 ? "x" : "y", i % 3 == 0 ? "p" : "q"});
        }
        Path in = TestTables.csv(dir.resolve("full.csv"), List.of("a", "b"), rows);
        Path out = dir.resolve("full");
        TestTables.Run r = TestTables.tally(spark, "--input", in.toString(), "--out", out.toString(), "--missing", "average");
        assertEquals(0, r.status(), r.err());
        assertEquals(null, StoreReader.read(out).manifest().missingValues());
        assertEquals(StoreFormat.VERSION_PLAIN, StoreReader.read(out).manifest().formatVersion());
    }

    @Test
    void aRowWithTooManyMissingCellsIsRefused() {
        // 17 binary columns all empty in one row: 2^17 = 131,072 joint values, more than 65,536
        List<String> names = new ArrayList<>();
        for (int v = 0; v < 17; v++) {
            names.add("v" + v);
        }
        List<String[]> rows = new ArrayList<>();
        for (int i = 0; i < 10; i++) {
            String[] row = new String[17];
            for (int v = 0; v < 17; v++) {
                row[v] = i == 4 ? "" : String.valueOf((i + v) % 2);
            }
            rows.add(row);
        }
        Path in = TestTables.csv(dir.resolve("wide.csv"), names, rows);
        TestTables.Run r = TestTables.tally(spark, "--input", in.toString(), "--out", dir.resolve("wide").toString(),
                "--missing", "average", "--max-parents", "1");
        assertEquals(2, r.status(), r.err());
        assertEquals("tally: --missing average: a row misses 17 values (" + String.join(", ", names) + ") whose joint "
                + "takes 131,072 values; at most 65,536 are enumerated exactly per row (leave some of them out with "
                + "--exclude, or choose --missing drop)", r.err());
    }

    @Test
    void theSeedAndRoundsAreRefusedWithoutAverage() {
        Path in = table(dir.resolve("t2.csv"));
        TestTables.Run r = TestTables.tally(spark, "--input", in.toString(), "--out", dir.resolve("x").toString(),
                "--missing", "drop", "--rounds", "5");
        assertEquals(2, r.status(), r.err());
        assertEquals("tally: --rounds does not apply without --missing average: it counts rounds of data augmentation",
                r.err());
    }

    /**
     * The incomplete rows are redrawn in a canonical order, each from its own stream (IncompleteRows):
     * one partition or three give byte-identical Parquet parts and sample; another seed draws otherwise.
     */
    @Test
    void oneOrManyPartitionsGiveTheSameStore() throws java.io.IOException {
        List<String[]> rows = new ArrayList<>();
        java.util.SplittableRandom rng = new java.util.SplittableRandom(17);
        for (int i = 0; i < 400; i++) {
            int a = rng.nextInt(2);
            int b = rng.nextDouble() < 0.8 ? a : 1 - a;
            int c = rng.nextDouble() < 0.7 ? b : rng.nextInt(3);
            String[] row = {"a" + a, "b" + b, "c" + c};
            if (rng.nextDouble() < 0.3) {
                row[1 + rng.nextInt(2)] = "";
            }
            rows.add(row);
        }
        Path in = TestTables.csv(dir.resolve("parts.csv"), List.of("a", "b", "c"), rows);
        Path[] outs = new Path[3];
        String[][] extra = {{"--partitions", "1", "--seed", "5"}, {"--partitions", "3", "--seed", "5"},
            {"--partitions", "3", "--seed", "6"}};
        for (int k = 0; k < 3; k++) {
            outs[k] = dir.resolve("parts" + k);
            List<String> args = new ArrayList<>(List.of("--input", in.toString(), "--out", outs[k].toString(), "--missing",
                    "average", "--rounds", "4"));
            args.addAll(List.of(extra[k]));
            TestTables.Run r = TestTables.tally(spark, args.toArray(String[]::new));
            assertEquals(0, r.status(), r.err());
        }
        for (String part : List.of(StoreFormat.COUNTS, StoreFormat.SCORES, "sample/dags.bin")) {
            byte[] one = java.nio.file.Files.readAllBytes(outs[0].resolve(part));
            assertTrue(java.util.Arrays.equals(one, java.nio.file.Files.readAllBytes(outs[1].resolve(part))),
                    part + " differs between 1 and 3 partitions");
        }
        assertTrue(!java.util.Arrays.equals(java.nio.file.Files.readAllBytes(outs[1].resolve("sample/dags.bin")),
                java.nio.file.Files.readAllBytes(outs[2].resolve("sample/dags.bin"))), "seed 6 drew what seed 5 drew");
    }

    /**
     * Incomplete rows that would not fit the driver's memory bound are redrawn on the cluster, chain by
     * chain (the bound lowered to 0 here): the same shares and sample shape as on the driver, every family
     * counting all 40 rows.
     */
    @Test
    void rowsBeyondTheDriversBoundAreRedrawnOnTheCluster() {
        Path in = table(dir.resolve("cluster.csv"));
        Path out = dir.resolve("cluster");
        AugmentedTally.driverBound = 0;
        TestTables.Run r;
        try {
            r = TestTables.tally(spark, "--input", in.toString(), "--out", out.toString(), "--missing", "average",
                    "--rounds", "4", "--seed", "3");
        } finally {
            AugmentedTally.driverBound = -1;
        }
        assertEquals(0, r.status(), r.err());
        assertTrue(r.out().contains("incomplete rows 4 (10.0%); missing cells per variable: b 7.5%, c 5.0%"), r.out());
        ScoreStore s = StoreReader.read(out);
        for (int f = 0; f < s.families().size(); f++) {
            assertEquals(40, s.family(f).total(), "family " + f);
        }
        SampleFile.Loaded sample = SampleFile.read(out.resolve(s.manifest().missingValues().sample()), s.manifest(), out);
        assertEquals(2, sample.dags().chains());
        assertEquals(2 * s.manifest().missingValues().drawsPerRound(), sample.dags().perChain());
    }

    /**
     * A table of counts with empty cells: {@code --weight} gives the store of its expansion to one row
     * per unit, byte for byte (Parquet parts and sample) — each unit of an incomplete line is redrawn on
     * its own, in the expansion's canonical order — with the same shares of missing cells.
     */
    @Test
    void aTableOfCountsWithMissingCellsGivesTheStoreOfItsExpansion() throws java.io.IOException {
        List<String[]> lines = new ArrayList<>();
        List<String[]> expanded = new ArrayList<>();
        java.util.SplittableRandom rng = new java.util.SplittableRandom(23);
        for (int i = 0; i < 60; i++) {
            int a = rng.nextInt(2);
            int b = rng.nextDouble() < 0.8 ? a : 1 - a;
            int c = rng.nextDouble() < 0.7 ? b : rng.nextInt(3);
            String[] row = {"a" + a, "b" + b, "c" + c};
            if (rng.nextDouble() < 0.3) {
                row[1 + rng.nextInt(2)] = "";
            }
            int w = 1 + rng.nextInt(6);
            lines.add(new String[] {row[0], row[1], row[2], String.valueOf(w)});
            for (int k = 0; k < w; k++) {
                expanded.add(row);
            }
        }
        Path weighted = TestTables.csv(dir.resolve("counts.csv"), List.of("a", "b", "c", "n"), lines);
        Path rows = TestTables.csv(dir.resolve("expanded.csv"), List.of("a", "b", "c"), expanded);
        Path w = dir.resolve("weighted");
        Path e = dir.resolve("expanded");
        TestTables.Run rw = TestTables.tally(spark, "--input", weighted.toString(), "--out", w.toString(), "--weight", "n",
                "--missing", "average", "--rounds", "4", "--seed", "8");
        assertEquals(0, rw.status(), rw.err());
        TestTables.Run re = TestTables.tally(spark, "--input", rows.toString(), "--out", e.toString(), "--missing",
                "average", "--rounds", "4", "--seed", "8", "--partitions", "2");
        assertEquals(0, re.status(), re.err());
        for (String part : List.of(StoreFormat.COUNTS, StoreFormat.SCORES, "sample/dags.bin")) {
            assertTrue(java.util.Arrays.equals(java.nio.file.Files.readAllBytes(w.resolve(part)),
                    java.nio.file.Files.readAllBytes(e.resolve(part))), part + " differs from the expansion's");
        }
        MissingValues mw = StoreReader.read(w).manifest().missingValues();
        MissingValues me = StoreReader.read(e).manifest().missingValues();
        assertEquals(me.incompleteRows(), mw.incompleteRows());
        assertEquals(me.missingCellShare(), mw.missingCellShare());
        assertEquals(StoreReader.read(e).manifest().input().fingerprint(), StoreReader.read(w).manifest().input().fingerprint());
    }
}
