package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;
import org.junit.jupiter.api.Test;

/** {@code sample} and {@code --sample} (issue 19, points 1 and 2), end to end through the CLI. */
class SavedSampleTest extends StoreFixture {
    static final ObjectMapper JSON = new ObjectMapper();

    @Override
    long seed() {
        return 19_001L;
    }

    Path sample(String name, String... more) {
        Path out = dir.resolve(name);
        String[] base = {"sample", "--store", store.toString(), "--out", out.toString()};
        String[] all = new String[base.length + more.length];
        System.arraycopy(base, 0, all, 0, base.length);
        System.arraycopy(more, 0, all, base.length, more.length);
        CliRun r = CliRun.of(all);
        assertEquals(0, r.status(), r.err());
        return out;
    }

    /** Source: the format's own definition — reading and writing again gives the same bytes; the manifest says what it holds. */
    @Test
    void aSavedSampleRoundTripsBitExactly() throws Exception {
        Path p = sample("s1", "--method", "exact", "--dags", "300", "--seed", "5");
        Path q = sample("s2", "--method", "exact", "--dags", "300", "--seed", "5");
        assertArrayEquals(Files.readAllBytes(p.resolve("dags.bin")), Files.readAllBytes(q.resolve("dags.bin")));
        JsonNode m = JSON.readTree(p.resolve("sample.json").toFile());
        assertEquals("sample", m.get("kind").asText());
        assertEquals(1, m.get("formatVersion").asInt());
        assertEquals("exact", m.get("method").asText());
        assertEquals("structure-modular", m.get("dagPrior").asText());
        assertEquals(1, m.get("chains").asInt());
        assertEquals(mem.manifest().input().fingerprint(), m.get("store").get("fingerprint").asText());
        // re-read and re-written by the library: identical bytes (SampleFileRoundTrip in the core package)
        assertArrayEquals(Files.readAllBytes(p.resolve("dags.bin")),
                org.edgewise.driver.posterior.SampleFileAccess.rewrite(p));
        // mcmc: chains in order, diagnostics and verdict saved
        Path c = sample("s3", "--method", "mcmc", "--allow-unconverged", "--steps", "400", "--draws", "100", "--chains", "2");
        JsonNode mc = JSON.readTree(c.resolve("sample.json").toFile());
        assertEquals(2, mc.get("chains").asInt());
        assertEquals(100, mc.get("dagsPerChain").asInt());
        assertTrue(mc.get("diagnostics").has("converged"), mc.toString());
        assertArrayEquals(Files.readAllBytes(c.resolve("dags.bin")), org.edgewise.driver.posterior.SampleFileAccess.rewrite(c));
        // an existing sample is replaced only with --overwrite
        assertEquals("sample: output " + p + " already exists; pass --overwrite to replace it",
                CliRun.of("sample", "--store", store.toString(), "--out", p.toString(), "--method", "exact").errLine());
    }

    /** Source: an independent method — the exact sum over DAGs (Tian & He 2009) against frequencies over exact draws, within 4 MCSE. */
    @Test
    void edgesFromASavedExactSampleAgreeWithTheExactSum() throws Exception {
        Path p = sample("exact", "--method", "exact", "--dags", "4000", "--seed", "3");
        JsonNode exact = JSON.readTree(CliRun.of("edges", "--store", store.toString(), "--method", "exact", "--format", "json").out());
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--sample", p.toString(), "--format", "json");
        assertEquals(0, r.status(), r.err());
        JsonNode saved = JSON.readTree(r.out());
        assertEquals("sample", saved.get("method").asText());
        Map<String, Double> ex = new HashMap<>();
        for (JsonNode e : exact.get("edges")) {
            ex.put(e.get("from").asText() + ">" + e.get("to").asText(), e.get("posterior").asDouble());
        }
        int checked = 0;
        for (JsonNode e : saved.get("edges")) {
            double want = ex.get(e.get("from").asText() + ">" + e.get("to").asText());
            double got = e.get("posterior").asDouble();
            double mcse = e.get("mcse").asDouble();
            assertTrue(Math.abs(got - want) <= 4 * mcse + 1e-12, e + " vs exact " + want);
            checked++;
        }
        assertEquals(20, checked);
    }

    /** Source: the same DAGs — exact draws with the effect's own seed and count are the DAGs effect --method exact averages over. */
    @Test
    void effectFromASavedSampleEqualsEffectOverTheSameDags() throws Exception {
        Path p = sample("eff", "--method", "exact", "--dags", "20000", "--seed", "1");
        String[] q = {"--do", "v3=s1", "--target", "v2=s0", "--effect-draws", "200", "--format", "json"};
        CliRun direct = CliRun.of(concat(new String[] {"effect", "--store", store.toString(), "--method", "exact"}, q));
        CliRun saved = CliRun.of(concat(new String[] {"effect", "--store", store.toString(), "--sample", p.toString()}, q));
        assertEquals(0, direct.status(), direct.err());
        assertEquals(0, saved.status(), saved.err());
        JsonNode a = JSON.readTree(direct.out());
        JsonNode b = JSON.readTree(saved.out());
        a = a.isArray() ? a.get(0) : a;
        b = b.isArray() ? b.get(0) : b;
        assertEquals(a.get("probability").asDouble(), b.get("probability").asDouble(), 0.0);
        assertEquals(a.get("mcse").asDouble(), b.get("mcse").asDouble(), 0.0);
        assertEquals("sample", b.get("method").asText());
        assertTrue(b.get("averagedOver").asText().contains(p.toString()), b.get("averagedOver").asText());
    }

    /** The refusal users read, word for word: a sample drawn from another store's data. */
    @Test
    void aSampleFromAnotherStoreIsRefused() throws Exception {
        Path p = sample("fp", "--method", "exact", "--dags", "100");
        // the same DAGs, said to come from another table (the fixture's stores all carry fingerprint 0)
        Path moved = dir.resolve("fp2");
        Files.createDirectories(moved);
        Files.copy(p.resolve("dags.bin"), moved.resolve("dags.bin"));
        String fp = mem.manifest().input().fingerprint();
        Files.writeString(moved.resolve("sample.json"), Files.readString(p.resolve("sample.json"))
                .replace("\"fingerprint\" : \"" + fp + "\"", "\"fingerprint\" : \"feedbeef\""));
        assertEquals("edges: sample " + moved + " was drawn from the store " + store + " (data fingerprint feedbeef), not from "
                + store + " (data fingerprint " + fp + "); draw a sample from this store",
                CliRun.of("edges", "--store", store.toString(), "--sample", moved.toString()).errLine());
        assertEquals("edges: --method does not apply with --sample: the saved DAGs were drawn once, with the method and scoring "
                + "the sample records; draw another sample to change them",
                CliRun.of("edges", "--store", store.toString(), "--sample", p.toString(), "--method", "exact").errLine());
    }

    /**
     * Source: an independent method — the exact structure-modular sum Z(D ∪ x)/Z(D) of {@code predict --method exact}
     * (Tian &amp; He 2009) against per-DAG exact inference averaged over exact draws, within 4 MCSE, for a case with
     * hidden variables and for a conditional (a ratio of averages); labelled sampled, never exact.
     */
    @Test
    void predictFromASavedExactSampleAgreesWithTheExactSum() throws Exception {
        Path p = sample("pred", "--method", "exact", "--dags", "4000", "--seed", "5");
        String[][] queries = {{"--case", "v2=s1,v0=s0"}, {"--case", "v4=s2"}, {"--case", "v2=s0", "--given", "v1=s2,v3=s0"}};
        for (String[] q : queries) {
            CliRun ex = CliRun.of(concat(new String[] {"predict", "--store", store.toString(), "--method", "exact", "--format", "json"}, q));
            CliRun sa = CliRun.of(concat(new String[] {"predict", "--store", store.toString(), "--sample", p.toString(), "--format", "json"}, q));
            assertEquals(0, ex.status(), ex.err());
            assertEquals(0, sa.status(), sa.err());
            JsonNode a = JSON.readTree(ex.out());
            JsonNode b = JSON.readTree(sa.out());
            double mcse = b.get("mcse").asDouble();
            assertTrue(mcse > 0, b.toString());
            assertTrue(Math.abs(a.get("probability").asDouble() - b.get("probability").asDouble()) <= 4 * mcse,
                    String.join(" ", q) + ": exact " + a.get("probability") + ", sampled " + b.get("probability") + " ± " + mcse);
            assertEquals("sampled DAGs", b.get("averagedOver").asText());
            assertEquals(4000, b.get("samples").asInt());
            assertEquals("sample", b.get("method").asText());
        }
    }

    /** A table of cases from a saved sample: one row each, with its mcse, equal to the one-case answers (the same computation). */
    @Test
    void predictCasesFromASavedSample() throws Exception {
        Path p = sample("rows", "--method", "exact", "--dags", "500", "--seed", "6");
        Path cases = dir.resolve("cases.csv");
        Files.writeString(cases, "v0,v2,v4\ns0,s1,\n,s0,s2\n");
        CliRun r = CliRun.of("predict", "--store", store.toString(), "--sample", p.toString(), "--cases", cases.toString());
        assertEquals(0, r.status(), r.err());
        String[] lines = r.out().strip().split("\n");
        assertEquals(3, lines.length, r.out());
        assertTrue(lines[0].endsWith(",mcse"), lines[0]);
        JsonNode one = JSON.readTree(CliRun.of("predict", "--store", store.toString(), "--sample", p.toString(), "--case",
                "v0=s0,v2=s1", "--format", "json").out());
        assertEquals(one.get("probability").asDouble(), Double.parseDouble(lines[1].split(",")[3]), 0.0);
        assertEquals(one.get("mcse").asDouble(), Double.parseDouble(lines[1].split(",")[7]), 0.0);
    }

    /** The refusal users read, word for word: one DAG's elimination table above the limit, before any work. */
    @Test
    void aDagTooWideForTheLimitIsRefused() throws Exception {
        Path p = sample("wide", "--method", "exact", "--dags", "200", "--seed", "7");
        CliRun r = CliRun.of("predict", "--store", store.toString(), "--sample", p.toString(), "--case", "v2=s1",
                "--max-hidden-states", "1");
        assertEquals(2, r.status(), r.err());
        assertEquals("predict: sample " + p + ": DAG 1 (chain 1): summing out the hidden ancestors of the case by elimination "
                + "would build a table of 2 entries (limit 1); observe more of them, or raise --max-hidden-states", r.errLine());
    }

    /**
     * Issue 19 point 1: a result answered from a sample drawn by MCMC names the sample and carries its verdict — a
     * deliberately short run (8 steps, 4 draws per chain) ends unconverged, and {@code edges --sample} and
     * {@code predict --sample} then print the same not-converged line (after the command's name), word for word, and
     * exit 3 unless {@code --allow-unconverged}, as {@code effect --sample} does. The line's figures are the split-R̂,
     * bulk effective sample size and MCSE of the saved DAGs' edge indicators in draw order (seed 2: reproducible).
     */
    @Test
    void edgesAndPredictFromAnUnconvergedMcmcSampleCarryItsVerdict() throws Exception {
        Path p = dir.resolve("short");
        CliRun drawn = CliRun.of("sample", "--store", store.toString(), "--out", p.toString(), "--method", "mcmc", "--steps", "8",
                "--draws", "4", "--seed", "2", "--allow-unconverged");
        assertEquals(0, drawn.status(), drawn.err());
        JsonNode manifest = JSON.readTree(p.resolve("sample.json").toFile());
        assertEquals("steps", manifest.get("diagnostics").get("stopReason").asText(), manifest.toString());
        assertTrue(!manifest.get("diagnostics").get("converged").asBoolean(), manifest.toString());

        Path out = dir.resolve("short-edges.json");
        CliRun e = CliRun.of("edges", "--store", store.toString(), "--sample", p.toString(), "--out", out.toString());
        CliRun q = CliRun.of("predict", "--store", store.toString(), "--sample", p.toString(), "--case", "v2=s1,v0=s0");
        assertEquals(3, e.status(), e.err());
        assertEquals(3, q.status(), q.err());
        String ew = UnconvergedExitTest.warning(e, "edges");
        String qw = UnconvergedExitTest.warning(q, "predict");
        assertEquals(ew.substring("edges: ".length()), qw.substring("predict: ".length()));
        assertEquals(SHORT_SAMPLE_LINE, ew.substring("edges: ".length()));
        assertFalse(q.out().isEmpty(), "the prediction is printed before the status");

        JsonNode r = JSON.readTree(out.toFile());
        JsonNode s = r.get("store").get("sample");
        assertEquals(p.toString(), s.get("path").asText());
        assertEquals("mcmc", s.get("method").asText());
        assertTrue(s.get("sampler").asText().startsWith("sampled by chains: "), s.toString());
        assertFalse(s.get("converged").asBoolean(), s.toString());
        JsonNode d = r.get("diagnostics");
        assertFalse(d.get("converged").asBoolean(), d.toString());
        assertEquals("steps", d.get("stopReason").asText());
        assertTrue(d.has("rhat") && d.has("bulkEffectiveSampleSize"), d.toString());
        assertEquals(manifest.get("chains").asInt(), d.get("chains").asInt());
        assertEquals(4, d.get("drawsPerChain").asInt());

        CliRun eo = CliRun.of("edges", "--store", store.toString(), "--sample", p.toString(), "--allow-unconverged");
        CliRun qo = CliRun.of("predict", "--store", store.toString(), "--sample", p.toString(), "--case", "v2=s1,v0=s0",
                "--allow-unconverged");
        assertEquals(0, eo.status(), eo.err());
        assertEquals(0, qo.status(), qo.err());
        assertTrue(UnconvergedExitTest.warning(eo, "edges").endsWith(". " + UnconvergedExitTest.EXIT_0), eo.err());
        assertTrue(UnconvergedExitTest.warning(qo, "predict").endsWith(". " + UnconvergedExitTest.EXIT_0), qo.err());
        // effect over the same sample: exit 3 as well
        assertEquals(3, CliRun.of("effect", "--store", store.toString(), "--sample", p.toString(), "--do", "v3=s1", "--target",
                "v2=s0", "--effect-draws", "50", "--format", "json").status());

        // a sample drawn exactly carries no verdict: no diagnostics, no line, exit 0; the sample is still named
        Path x = sample("exact-named", "--method", "exact", "--dags", "100", "--seed", "2");
        CliRun ex = CliRun.of("edges", "--store", store.toString(), "--sample", x.toString(), "--format", "json");
        assertEquals(0, ex.status(), ex.err());
        JsonNode xr = JSON.readTree(ex.out());
        assertTrue(xr.get("diagnostics") == null || xr.get("diagnostics").isNull(), xr.get("diagnostics") + "");
        assertEquals("exact", xr.get("store").get("sample").get("method").asText());
        assertTrue(xr.get("store").get("sample").get("converged") == null);
    }

    /** The not-converged line of {@code edges --sample} / {@code predict --sample} over the short MCMC sample (seed 2). */
    static final String SHORT_SAMPLE_LINE = "WARNING: not converged (a fixed number of steps was run, with no check until "
            + "converged; needs R-hat < 1.01, bulk effective sample size >= 400, MCSE <= 0.01 for every edge and feature "
            + "posterior): the posteriors are not reliable. Worst: edge v1 -> v2: R-hat 2.104, bulk eff. n 7, MCSE 0.2053; "
            + "edge v2 -> v3: R-hat 2.104, bulk eff. n 7, MCSE 0.2053; edge v3 -> v2: R-hat 2.104, bulk eff. n 7, MCSE 0.2053; "
            + "edge v2 -> v1: R-hat 1.488, bulk eff. n 9, MCSE 0.1799; edge v2 -> v4: R-hat 1.282, bulk eff. n 11, "
            + "MCSE 0.1377. Run longer: raise the steps per chain (--steps) or run until converged instead "
            + "(no --steps, or --rhat-target). "+ UnconvergedExitTest.EXIT_3;

    /**
     * Issue 19 point 2: features from a saved sample beyond 31 variables. A 35-variable chain-shaped random table (each
     * binary variable copies its predecessor with probability 0.85), a sample drawn given the chain order; ancestor and
     * Markov-blanket posteriors, and the essential graph's adjacency, must equal the (weighted) frequencies over the saved
     * DAGs computed here independently — the DAGs read from dags.bin by this test, reachability by depth-first search.
     */
    @Test
    void featuresOfASavedSampleBeyondThirtyOneVariables() throws Exception {
        int n = 35;
        java.util.SplittableRandom rng = new java.util.SplittableRandom(1935);
        int[][] rows = new int[300][n];
        for (int[] row : rows) {
            row[0] = rng.nextInt(2);
            for (int v = 1; v < n; v++) {
                row[v] = rng.nextDouble() < 0.85 ? row[v - 1] : 1 - row[v - 1];
            }
        }
        int[] arities = new int[n];
        java.util.Arrays.fill(arities, 2);
        Path wide = dir.resolve("wide-store");
        CliRun.store(wide, rows, arities, 2);
        String order = String.join(",", java.util.stream.IntStream.range(0, n).mapToObj(v -> "v" + v).toList());
        Path p = dir.resolve("wide-sample");
        CliRun drawn = CliRun.of("sample", "--store", wide.toString(), "--out", p.toString(), "--order", order, "--dags", "400",
                "--seed", "4");
        assertEquals(0, drawn.status(), drawn.err());
        CliRun r = CliRun.of("edges", "--store", wide.toString(), "--sample", p.toString(), "--features",
                "ancestors,markov-blanket,essential-graph", "--format", "json");
        assertEquals(0, r.status(), r.err());
        JsonNode res = JSON.readTree(r.out());

        // the saved DAGs, read independently of the library (the format of SampleFile's class comment)
        java.util.List<int[][]> dags = new java.util.ArrayList<>();
        java.util.List<Double> weights = new java.util.ArrayList<>();
        try (java.io.DataInputStream in = new java.io.DataInputStream(new java.io.BufferedInputStream(
                Files.newInputStream(p.resolve("dags.bin"))))) {
            in.readFully(new byte[8]);
            assertEquals(n, in.readInt());
            int chains = in.readInt();
            int per = in.readInt();
            boolean weighted = in.readByte() == 1;
            for (int g = 0; g < chains * per; g++) {
                int[][] pa = new int[n][];
                for (int v = 0; v < n; v++) {
                    pa[v] = new int[in.readInt()];
                    for (int i = 0; i < pa[v].length; i++) {
                        pa[v][i] = in.readInt();
                    }
                }
                dags.add(pa);
                weights.add(weighted ? in.readDouble() : 1.0);
            }
        }
        assertEquals(400, dags.size());
        double total = weights.stream().mapToDouble(Double::doubleValue).sum();
        double[][] anc = new double[n][n];
        double[][] mb = new double[n][n];
        double[][] adj = new double[n][n];
        for (int g = 0; g < dags.size(); g++) {
            int[][] pa = dags.get(g);
            double w = weights.get(g) / total;
            boolean[][] reach = new boolean[n][n]; // reach[a][b]: a directed path a ~> b
            for (int a = 0; a < n; a++) {
                java.util.ArrayDeque<Integer> todo = new java.util.ArrayDeque<>(java.util.List.of(a));
                while (!todo.isEmpty()) {
                    int x = todo.pop();
                    for (int ch = 0; ch < n; ch++) {
                        if (!reach[a][ch] && contains(pa[ch], x)) {
                            reach[a][ch] = true;
                            todo.push(ch);
                        }
                    }
                }
            }
            for (int a = 0; a < n; a++) {
                for (int b = 0; b < n; b++) {
                    if (a == b) {
                        continue;
                    }
                    boolean adjacent = contains(pa[b], a) || contains(pa[a], b);
                    boolean coParent = false;
                    for (int v = 0; v < n; v++) {
                        coParent |= contains(pa[v], a) && contains(pa[v], b);
                    }
                    anc[a][b] += reach[a][b] ? w : 0;
                    mb[a][b] += adjacent || coParent ? w : 0;
                    adj[a][b] += adjacent ? w : 0;
                }
            }
        }
        int ancestors = 0;
        int blankets = 0;
        boolean deep = false;
        for (JsonNode f : res.get("features")) {
            int a = Integer.parseInt(f.get("from").asText().substring(1));
            int b = Integer.parseInt(f.get("to").asText().substring(1));
            double want = f.get("kind").asText().equals("ancestor") ? anc[a][b] : mb[a][b];
            assertEquals(want, f.get("posterior").asDouble(), 1e-12, f.toString());
            if (f.get("kind").asText().equals("ancestor")) {
                ancestors++;
                deep |= Math.abs(b - a) > 31 && want > 0; // a path across more than 31 variables
            } else {
                blankets++;
            }
        }
        assertEquals(n * (n - 1), ancestors);
        assertEquals(n * (n - 1) / 2, blankets);
        assertTrue(deep, "some saved DAG has a directed path from v0..v2 to v33..v34");
        int pairs = 0;
        for (JsonNode e : res.get("essentialGraph")) {
            int a = Integer.parseInt(e.get("a").asText().substring(1));
            int b = Integer.parseInt(e.get("b").asText().substring(1));
            assertEquals(adj[a][b], e.get("adjacent").asDouble(), 1e-12, e.toString());
            assertEquals(e.get("adjacent").asDouble(), e.get("aToB").asDouble() + e.get("bToA").asDouble()
                    + e.get("undirected").asDouble(), 1e-12, e.toString());
            pairs++;
        }
        assertEquals(n * (n - 1) / 2, pairs);
        // a sampled figure is labelled as such: the result says it came from the saved sample
        assertEquals("sample", res.get("method").asText());
        assertEquals(p.toString(), res.get("store").get("sample").get("path").asText());
    }

    static boolean contains(int[] sorted, int x) {
        return java.util.Arrays.binarySearch(sorted, x) >= 0;
    }

    static String[] concat(String[] a, String[] b) {
        String[] all = new String[a.length + b.length];
        System.arraycopy(a, 0, all, 0, a.length);
        System.arraycopy(b, 0, all, a.length, b.length);
        return all;
    }
}
