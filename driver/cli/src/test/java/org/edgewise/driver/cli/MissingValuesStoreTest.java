package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import org.edgewise.driver.analysis.MissingValuesStore;
import org.edgewise.driver.average.augment.Augmentation;
import org.edgewise.driver.average.augment.DrawnNetwork;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.MissingValues;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A store whose missing values were averaged over (written here by the core's data augmentation on a
 * tiny table, as the tally writes it): every query answers from the DAGs it holds — the same answer
 * as naming that sample with {@code --sample} (source: the store's contract, docs/tally.md) — says so,
 * and refuses what does not apply.
 */
class MissingValuesStoreTest {
    static final ObjectMapper JSON = new ObjectMapper();
    static final FamilyScore BDEU = FamilyScore.of(ScoreKind.BDEU, 1);

    @TempDir
    static Path dir;
    static Path store;
    static ScoreStore shape;
    static MissingValues mv;
    static Augmentation.Recount recount;

    @BeforeAll
    static void write() {
        List<Variable> vars = new ArrayList<>();
        for (int v = 0; v < 3; v++) {
            vars.add(new Variable("x" + v, List.of("0", "1")));
        }
        SplittableRandom g = new SplittableRandom(5);
        int[][] rows = new int[60][3];
        for (int[] x : rows) {
            x[0] = g.nextDouble() < 0.5 ? 1 : 0;
            x[1] = g.nextDouble() < (x[0] == 1 ? 0.85 : 0.2) ? 1 : 0;
            x[2] = g.nextDouble() < (x[1] == 1 ? 0.8 : 0.3) ? 1 : 0;
        }
        rows[4][1] = -1;
        rows[9][2] = -1;
        int[][] start = new int[rows.length][];
        for (int t = 0; t < rows.length; t++) {
            start[t] = rows[t].clone();
            for (int v = 0; v < 3; v++) {
                start[t][v] = Math.max(0, start[t][v]);
            }
        }
        shape = InMemoryTally.tally(vars, start, 2, BDEU);
        recount = Augmentation.chainByChain((chain, round, net, seed) -> {
            SplittableRandom rng = new SplittableRandom(seed);
            int[][] filled = new int[rows.length][];
            for (int t = 0; t < rows.length; t++) {
                filled[t] = rows[t].clone();
                int[] x = filled[t];
                int[] miss = java.util.stream.IntStream.range(0, 3).filter(v -> x[v] < 0).toArray();
                if (miss.length > 0) {
                    net.complete(x, miss, rng);
                }
            }
            ScoreStore s = InMemoryTally.tally(vars, filled, 2, BDEU);
            return new Augmentation.Completed(s.families(), s.logScores());
        });
        Augmentation.Settings settings = new Augmentation.Settings(40, 10, 2, 40, 3);
        Augmentation.Outcome o = Augmentation.run(shape.manifest(), BDEU,
                DrawnNetwork.marginals(new int[] {2, 2, 2}, new long[][] {{30, 30}, {30, 29}, {30, 29}}, 1), settings,
                recount, (r, s, check) -> { });
        mv = new MissingValues(MissingValues.METHOD, MissingValues.ASSUMPTION, 40, 10, 2, 40, 3, "order-modular",
                MissingValues.SAMPLE, "the completed table of chain 1's last round", 2, 2 / 60.0,
                new java.util.LinkedHashMap<>(Map.of("x0", 0.0)));
        mv = new MissingValues(mv.method(), mv.assumption(), mv.rounds(), mv.burnIn(), mv.chains(), mv.drawsPerRound(),
                mv.seed(), mv.dagPrior(), mv.sample(), mv.countsFrom(), mv.incompleteRows(), mv.incompleteRowShare(),
                shares());
        store = dir.resolve("store");
        MissingValuesStore.write(store, shape.manifest().withMissingValues(mv), o, 1.0, false, "overwrite");
    }

    static Map<String, Double> shares() {
        Map<String, Double> m = new java.util.LinkedHashMap<>();
        m.put("x0", 0.0);
        m.put("x1", 1 / 60.0);
        m.put("x2", 1 / 60.0);
        return m;
    }

    @Test
    void queriesAnswerFromTheStoresOwnDags() throws Exception {
        CliRun own = CliRun.of("edges", "--store", store.toString(), "--format", "json");
        assertEquals(0, own.status(), own.err());
        CliRun named = CliRun.of("edges", "--store", store.toString(), "--sample", store.resolve("sample").toString(),
                "--format", "json");
        assertEquals(0, named.status(), named.err());
        JsonNode a = JSON.readTree(own.out());
        JsonNode b = JSON.readTree(named.out());
        assertEquals("sample", a.get("method").asText());
        assertTrue(a.get("diagnostics").get("converged").asBoolean(), "R̂ and ESS over the rounds: " + a.get("diagnostics"));
        assertEquals(b.get("edges"), a.get("edges"));
        String words = a.get("store").get("missingValues").asText();
        assertTrue(words.startsWith("averaged over missing values by data augmentation (Tanner & Wong 1987; missing at"
                + " random assumed), 40 rounds, burn-in 10"), words);
        assertTrue(words.contains("3.3% of the rows incomplete, x1 1.7% missing, x2 1.7% missing"), words);
        for (String[] q : List.of(new String[] {"predict", "--store", store.toString(), "--case", "x0=1,x1=0"},
                new String[] {"effect", "--store", store.toString(), "--do", "x0=1", "--target", "x2=1"},
                new String[] {"sample", "--store", store.toString(), "--out", dir.resolve("copy").toString()})) {
            CliRun r = CliRun.of(q);
            assertEquals(0, r.status(), q[0] + ": " + r.err());
        }
    }

    @Test
    void anUnconvergedStoreSaysToTallyWithMoreRounds() {
        // 4 rounds (2 kept) cannot reach a bulk effective sample size of 400 over 2 × 2 × 5 DAGs
        Path few = dir.resolve("few");
        MissingValuesStore.write(few, shape.manifest().withMissingValues(mv), Augmentation.run(shape.manifest(), BDEU,
                DrawnNetwork.marginals(new int[] {2, 2, 2}, new long[][] {{30, 30}, {30, 29}, {30, 29}}, 1),
                new Augmentation.Settings(4, 2, 2, 5, 3), recount, (r, s, check) -> { }), 1.0, false, "overwrite");
        CliRun r = CliRun.of("edges", "--store", few.toString());
        assertEquals(3, r.status(), r.err());
        assertTrue(r.err().contains("WARNING: not converged (a fixed number of rounds of data augmentation was run over the"
                + " missing values;"), r.err());
        assertTrue(r.err().contains("Run longer: tally the table again with more rounds of data augmentation."), r.err());
    }

    @Test
    void aMethodOrOrderIsRefusedOnIt() {
        assertEquals("edges: --method does not apply on a store averaged over missing values: its structure posterior is"
                        + " the DAGs its tally drew while averaging over the missing values (tally --missing average)",
                CliRun.of("edges", "--store", store.toString(), "--method", "exact").errLine());
        assertEquals("edges: --ess does not apply on a store averaged over missing values: its structure posterior is"
                        + " the DAGs its tally drew while averaging over the missing values (tally --missing average)",
                CliRun.of("edges", "--store", store.toString(), "--ess", "5").errLine());
    }
}
