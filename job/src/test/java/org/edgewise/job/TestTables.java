package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.io.StringWriter;
import java.io.PrintWriter;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;
import org.apache.spark.sql.SparkSession;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.store.FamilyCounts;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreReader;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.io.TempDir;

/** Small tables for the tests, and a way to run the tally command line on the shared session. */
final class TestTables {
    private TestTables() {
    }

    /** The result of one command-line run. */
    record Run(int status, String out, String err) {
    }

    static Run tally(SparkSession spark, String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int status = TallyMain.execute(spark, new PrintWriter(out, true), new PrintWriter(err, true), args);
        return new Run(status, out.toString(), err.toString().strip());
    }

    static Path write(Path file, String text) {
        try {
            Files.writeString(file, text);
            return file;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** A CSV with a header of {@code names} and the given string rows. */
    static Path csv(Path file, List<String> names, List<String[]> rows) {
        StringBuilder sb = new StringBuilder(String.join(",", names)).append('\n');
        for (String[] r : rows) {
            sb.append(String.join(",", r)).append('\n');
        }
        return write(file, sb.toString());
    }

    /**
     * Rows sampled by the one {@link ForwardSampler} from a small {@link RandomNetwork} over
     * {@code arity.length} variables (each depends on up to two earlier ones through a random
     * conditional table, rows u² + 0.05 normalised), as state indices.
     */
    static int[][] sample(int[] arity, int rows, long seed) {
        Network net = RandomNetwork.generate("x", arity, 2, arity.length, 2, 0.05, seed);
        return new ForwardSampler(net).sample(rows, seed + 1);
    }

    /** Writes sampled rows as CSV with labels {@code labels[v][state]}. */
    static Path csvOf(Path file, List<String> names, String[][] labels, int[][] rows) {
        List<String[]> text = new ArrayList<>();
        for (int[] r : rows) {
            String[] s = new String[r.length];
            for (int v = 0; v < r.length; v++) {
                s[v] = labels[v][r[v]];
            }
            text.add(s);
        }
        return csv(file, names, text);
    }

    /** Re-encodes labelled rows with a store's own state labels (for an independent recount). */
    static int[][] encodeWith(List<Variable> vars, String[][] labels, int[][] rows) {
        int[][] out = new int[rows.length][vars.size()];
        for (int t = 0; t < rows.length; t++) {
            for (int v = 0; v < vars.size(); v++) {
                int s = vars.get(v).stateIndex(labels[v][rows[t][v]]);
                if (s < 0) {
                    throw new IllegalStateException("label " + labels[v][rows[t][v]] + " missing from the store");
                }
                out[t][v] = s;
            }
        }
        return out;
    }

    static ScoreStore read(Path store) {
        return StoreReader.read(store);
    }

    /**
     * {@code s} holds the reference's families with the same counts (exactly) and scores (to 1e-9);
     * with {@code rows} ≥ 0 every family's counts also add up to that many rows.
     */
    static void assertSameFamilies(ScoreStore ref, ScoreStore s, long rows) {
        assertEquals(ref.families().size(), s.families().size());
        for (int f = 0; f < ref.families().size(); f++) {
            FamilyCounts a = ref.family(f);
            FamilyCounts b = s.family(f);
            assertEquals(a.child(), b.child(), "family " + f);
            assertArrayEquals(a.parents(), b.parents(), "family " + f);
            assertArrayEquals(a.configs(), b.configs(), "family " + f);
            assertArrayEquals(a.counts(), b.counts(), "family " + f);
            if (rows >= 0) {
                assertEquals(rows, b.total(), "family " + f + " sums to the row count");
            }
            assertEquals(ref.logScore(f), s.logScore(f), 1e-9, "family " + f);
        }
    }

    /** Numbers the stores the input tests write, so each run gets a fresh --out. */
    private static final AtomicInteger STORES = new AtomicInteger();

    /** Tallies {@code input} (plus {@code extra} options) into a new store under {@code dir}; asserts success and reads it. */
    static ScoreStore tallyInto(Path dir, Path input, String... extra) {
        Path out = dir.resolve("store" + STORES.getAndIncrement());
        List<String> args = new ArrayList<>(List.of("--input", input.toString(), "--out", out.toString()));
        args.addAll(List.of(extra));
        Run r = tally(SharedSpark.session(), args.toArray(String[]::new));
        assertEquals(0, r.status(), r.err());
        return read(out);
    }

    /**
     * {@code tally} refuses {@code input} with exactly {@code expected} on standard error and exit 2,
     * writes no store and leaves the input byte for byte as it was.
     */
    static void assertRefused(Path dir, String expected, Path input, String... extra) throws IOException {
        byte[] before = Files.readAllBytes(input);
        Path out = dir.resolve("store" + STORES.getAndIncrement());
        List<String> args = new ArrayList<>(List.of("--input", input.toString(), "--out", out.toString()));
        args.addAll(List.of(extra));
        Run r = tally(SharedSpark.session(), args.toArray(String[]::new));
        assertEquals(2, r.status(), r.err());
        assertEquals(expected, r.err());
        assertEquals(false, Files.exists(out), "nothing written");
        assertArrayEquals(before, Files.readAllBytes(input));
    }

    /**
     * The fixture of the refusal tests: the shared session, a temporary folder, a good two-column
     * CSV in it and a fresh output folder per case. The test classes run one after another, each
     * with its own folder.
     */
    abstract static class Refusals {
        static SparkSession spark;
        @TempDir
        static Path dir;
        static Path good;
        static int cases;

        @BeforeAll
        static void start() {
            spark = SharedSpark.session();
            good = write(dir.resolve("good.csv"), "u,v\n1,a\n2,b\n1,b\n");
        }

        /** A folder for the output of the next case, not yet made. */
        static Path nextOut() {
            return dir.resolve("out" + (cases++));
        }
    }
}
