package org.edgewise.driver.posterior;

import com.fasterxml.jackson.annotation.JsonInclude;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.BufferedInputStream;
import java.io.BufferedOutputStream;
import java.io.DataInputStream;
import java.io.DataOutputStream;
import java.io.EOFException;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.score.StructurePrior;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.Manifest;

/**
 * The posterior-sample directory (issue 19), its one format class: writing (atomic, as a score store
 * is written), reading, and every check — format version, kind, sizes, the variables and the data
 * fingerprint of the store it was drawn from.
 * <ul>
 *   <li>{@value #MANIFEST}: formatVersion, kind {@code sample}, the store (path, data fingerprint,
 *       variables), how the DAGs were drawn (method, sampler, DAG prior, order, tiers, scoring,
 *       settings, seed), the chains' diagnostics and verdict when sampled by chains, the number of
 *       chains and of DAGs per chain, whether weights are present.</li>
 *   <li>{@value #DAGS}: big-endian, the 8 magic bytes {@code EWDAGS\0\1}, then int n, int chains,
 *       int DAGs per chain, byte weighted (0|1); then chain by chain, DAG by DAG in draw order: per
 *       variable its parent count and its parents (ints, ascending), then, when weighted, the DAG's
 *       weight (a double). <b>Bytes per DAG: 4·(n + Σ_i |U_i|), + 8 when weighted</b> — e.g. 40
 *       variables with 3 parents on average: 640 bytes; 4,000 DAGs: 2.6 MB.</li>
 * </ul>
 * Nothing else may be in the directory; {@code overwrite} replaces only a sample directory.
 */
public final class SampleFile {
    /** The format version this code writes and reads. */
    public static final int FORMAT_VERSION = 1;
    public static final String KIND = "sample";
    public static final String MANIFEST = "sample.json";
    public static final String DAGS = "dags.bin";
    private static final byte[] MAGIC = {'E', 'W', 'D', 'A', 'G', 'S', 0, 1};
    private static final Set<String> PARTS = Set.of(MANIFEST, DAGS);
    private static final ObjectMapper JSON = new ObjectMapper()
            .enable(SerializationFeature.INDENT_OUTPUT)
            .setSerializationInclusion(JsonInclude.Include.NON_NULL)
            .configure(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES, false);

    private SampleFile() {
    }

    /** The store a sample was drawn from. */
    public record StoreRef(String path, String fingerprint, List<String> variables) {
    }

    /** The scoring the structures were drawn under (null score and ess: as stored). */
    public record Scoring(String score, Double ess, String prior, List<String> forbid, List<String> require) {
        static Scoring of(ScoringOptions o) {
            return new Scoring(o.score() == null ? null : o.score().label(), Double.isNaN(o.ess()) ? null : o.ess(),
                    o.prior().label(), o.forbid().stream().map(EdgeRule::toString).toList(),
                    o.require().stream().map(EdgeRule::toString).toList());
        }

        /** The scoring options again, named in messages as {@code names}. */
        public ScoringOptions options(InputNames names) {
            return new ScoringOptions(score == null ? null : ScoreKind.parse(score), ess == null ? Double.NaN : ess,
                    StructurePrior.parse(prior), rules(forbid), rules(require), names);
        }

        private static List<EdgeRule> rules(List<String> texts) {
            List<EdgeRule> out = new ArrayList<>();
            for (String t : texts == null ? List.<String>of() : texts) {
                out.add(EdgeRule.parse(t, MANIFEST));
            }
            return out;
        }
    }

    /**
     * The chains' diagnostics and verdict (sampled by chains only). {@code stopReason} and the
     * targets are optional (null in samples written before they were recorded): why the run stopped
     * ({@code steps}, {@code converged}, {@code max-steps}, {@code max-time}) and the R̂, bulk effective
     * sample size and MCSE targets the verdict was judged against.
     */
    public record Diagnostics(double maxRhat, double minEss, boolean converged, long stepsPerChain, long burnIn,
                              long thin, double samplingSeconds, String stopReason, Double rhatTarget,
                              Double effectiveSampleSizeTarget, Double mcseTarget) {
    }

    /**
     * What {@value #MANIFEST} holds.
     *
     * @param method      {@code order} (given), {@code exact} or {@code mcmc}
     * @param sampler     what drew the DAGs, for people
     * @param dagPrior    the DAG prior, or null given an order (both coincide)
     * @param settings    the sampling settings as given (names as in results)
     * @param candidateBoundary from a store tallied with pruned candidates: the children whose candidate sets bound
     *                    the sampled posterior ({@link org.edgewise.driver.average.CandidateBoundary}; empty when none
     *                    does); null when the store was not pruned or the sample predates this field
     */
    public record Info(int formatVersion, String kind, StoreRef store, String method, String sampler, String dagPrior,
                       List<String> order, List<List<String>> tiers, Scoring scoring, Map<String, Object> settings,
                       long seed, Diagnostics diagnostics, int chains, int dagsPerChain, boolean weighted,
                       String program, String createdAt, List<String> candidateBoundary) {
    }

    /** A sample read back and checked. */
    public record Loaded(Path path, Info info, DagSample dags) {
    }

    /** As the other form, without a candidate boundary (a store that was not pruned). */
    public static Info info(Manifest store, Path storePath, String method, String sampler, String dagPrior,
                            List<String> order, List<List<String>> tiers, ScoringOptions scoring,
                            Map<String, Object> settings, long seed, Diagnostics diagnostics, DagSample d, String program,
                            String createdAt) {
        return info(store, storePath, method, sampler, dagPrior, order, tiers, scoring, settings, seed, diagnostics, d, program,
                createdAt, null);
    }

    /** The manifest fields that come from the request, before the DAGs are known. */
    public static Info info(Manifest store, Path storePath, String method, String sampler, String dagPrior,
                            List<String> order, List<List<String>> tiers, ScoringOptions scoring,
                            Map<String, Object> settings, long seed, Diagnostics diagnostics, DagSample d, String program,
                            String createdAt, List<String> candidateBoundary) {
        List<String> names = store.variables().stream().map(v -> v.name()).toList();
        return new Info(FORMAT_VERSION, KIND, new StoreRef(storePath.toString(),
                store.input() == null ? null : store.input().fingerprint(), names), method, sampler, dagPrior, order,
                tiers, Scoring.of(scoring), settings, seed, diagnostics, d.chains(), d.perChain(), d.weighted(),
                program, createdAt, candidateBoundary);
    }

    /**
     * Refuses {@code out} before any work unless it is new, or an existing sample directory and
     * {@code overwrite}; {@code outName} and {@code overwriteName} name them in messages.
     */
    public static void checkTarget(Path out, boolean overwrite, String outName, String overwriteName) {
        if (Files.exists(out)) {
            if (!overwrite) {
                throw new UserError("output " + out + " already exists; pass " + overwriteName + " to replace it");
            }
            String only = overwriteName + " replaces only a posterior sample; ";
            if (!Files.isDirectory(out) || !Files.isRegularFile(out.resolve(MANIFEST))) {
                throw new UserError(only + out + " is not one (no " + MANIFEST + "); choose another " + outName);
            }
            try (DirectoryStream<Path> ds = Files.newDirectoryStream(out)) {
                for (Path c : ds) {
                    if (!PARTS.contains(c.getFileName().toString())) {
                        throw new UserError(only + out + " also holds " + c.getFileName() + "; choose another " + outName);
                    }
                }
            } catch (IOException e) {
                throw new UserError("cannot list " + outName + " " + out + ": " + AtomicWrite.reason(e));
            }
        }
        AtomicWrite.checkWritable(out, outName);
    }

    /** Writes the sample directory atomically (temporary sibling, renamed when complete). */
    public static void write(Path out, boolean overwrite, String overwriteName, Info info, DagSample d) {
        try {
            AtomicWrite.directory(out, overwrite, overwriteName, tmp -> {
                JSON.writeValue(tmp.resolve(MANIFEST).toFile(), info);
                try (OutputStream os = new BufferedOutputStream(Files.newOutputStream(tmp.resolve(DAGS)), 1 << 16)) {
                    writeDags(os, d);
                }
            });
        } catch (IOException e) {
            throw new UserError("cannot write " + out + ": " + AtomicWrite.reason(e));
        }
    }

    /** Writes the sample's two parts into {@code dir} (created; inside a directory being written atomically). */
    public static void writeInto(Path dir, Info info, DagSample d) throws IOException {
        Files.createDirectory(dir);
        JSON.writeValue(dir.resolve(MANIFEST).toFile(), info);
        try (OutputStream os = new BufferedOutputStream(Files.newOutputStream(dir.resolve(DAGS)), 1 << 16)) {
            writeDags(os, d);
        }
    }

    /** The binary DAG part (see the class comment). */
    static void writeDags(OutputStream os, DagSample d) throws IOException {
        DataOutputStream out = new DataOutputStream(os);
        out.write(MAGIC);
        out.writeInt(d.variables());
        out.writeInt(d.chains());
        out.writeInt(d.perChain());
        out.writeByte(d.weighted() ? 1 : 0);
        for (int c = 0; c < d.chains(); c++) {
            for (int k = 0; k < d.perChain(); k++) {
                for (int[] pa : d.dags()[c][k]) {
                    out.writeInt(pa.length);
                    for (int p : pa) {
                        out.writeInt(p);
                    }
                }
                if (d.weighted()) {
                    out.writeDouble(d.weights()[c][k]);
                }
            }
        }
        out.flush();
    }

    /**
     * Reads and checks the sample at {@code dir}: its format version and kind, that its DAG part
     * matches the manifest's sizes and is a list of DAGs over the manifest's variables, and — when
     * {@code store} is not null — that it was drawn from a store with the same variables and data
     * fingerprint as {@code store} (read from {@code storePath}).
     */
    public static Loaded read(Path dir, Manifest store, Path storePath) {
        Path mf = dir.resolve(MANIFEST);
        if (!Files.isRegularFile(mf)) {
            throw new UserError("sample " + dir + ": no " + MANIFEST + (Files.isDirectory(dir) ? "" : " (no such directory)")
                    + "; give a directory written by the sample command");
        }
        Info info;
        try {
            info = JSON.readValue(mf.toFile(), Info.class);
        } catch (IOException e) {
            throw new UserError("sample " + dir + ": " + MANIFEST + " is not a sample manifest (" + AtomicWrite.reason(e) + ")");
        }
        if (!KIND.equals(info.kind())) {
            throw new UserError("sample " + dir + ": " + MANIFEST + " is of kind '" + info.kind() + "', not '" + KIND + "'");
        }
        if (info.formatVersion() != FORMAT_VERSION) {
            throw new UserError("sample " + dir + ": format version " + info.formatVersion() + ", this program reads version "
                    + FORMAT_VERSION + "; draw the sample again with this program");
        }
        if (info.store() == null || info.store().variables() == null) {
            throw new UserError("sample " + dir + ": " + MANIFEST + " does not name the store it was drawn from");
        }
        if (store != null) {
            checkStore(dir, info, store, storePath);
        }
        DagSample d;
        try (InputStream is = new BufferedInputStream(Files.newInputStream(dir.resolve(DAGS)), 1 << 16)) {
            d = readDags(is, info, dir);
        } catch (EOFException e) {
            throw new UserError("sample " + dir + ": " + DAGS + " is shorter than " + MANIFEST + " says (truncated?)");
        } catch (IOException e) {
            throw new UserError("sample " + dir + ": cannot read " + DAGS + ": " + AtomicWrite.reason(e));
        }
        return new Loaded(dir, info, d);
    }

    /** The words of the refusal of a sample drawn from another store's data. */
    static void checkStore(Path dir, Info info, Manifest store, Path storePath) {
        String have = store.input() == null ? null : store.input().fingerprint();
        String drawn = info.store().fingerprint();
        if (drawn == null || !drawn.equals(have)) {
            throw new UserError("sample " + dir + " was drawn from the store " + info.store().path() + " (data fingerprint "
                    + drawn + "), not from " + storePath + " (data fingerprint " + have + "); draw a sample from this store");
        }
        List<String> names = store.variables().stream().map(v -> v.name()).toList();
        if (!names.equals(info.store().variables())) {
            throw new UserError("sample " + dir + " names the variables " + info.store().variables() + ", the store "
                    + storePath + " has " + names + "; draw a sample from this store");
        }
    }

    static DagSample readDags(InputStream is, Info info, Path dir) throws IOException {
        DataInputStream in = new DataInputStream(is);
        String where = "sample " + dir + ": " + DAGS;
        byte[] magic = new byte[MAGIC.length];
        in.readFully(magic);
        if (!Arrays.equals(magic, MAGIC)) {
            throw new UserError(where + " is not a DAG file of format version " + FORMAT_VERSION);
        }
        int n = in.readInt();
        int chains = in.readInt();
        int per = in.readInt();
        boolean weighted = in.readByte() == 1;
        if (n != info.store().variables().size() || chains != info.chains() || per != info.dagsPerChain()
                || weighted != info.weighted() || chains < 1 || per < 1) {
            throw new UserError(where + " holds " + chains + " chains of " + per + " DAGs over " + n + " variables"
                    + (weighted ? ", weighted" : "") + "; " + MANIFEST + " says " + info.chains() + " of " + info.dagsPerChain()
                    + " over " + info.store().variables().size() + (info.weighted() ? ", weighted" : ""));
        }
        int[][][][] dags = new int[chains][per][n][];
        double[][] w = weighted ? new double[chains][per] : null;
        for (int c = 0; c < chains; c++) {
            for (int k = 0; k < per; k++) {
                for (int v = 0; v < n; v++) {
                    int m = in.readInt();
                    if (m < 0 || m >= n) {
                        throw new UserError(where + ": chain " + (c + 1) + ", DAG " + (k + 1) + ": variable " + (v + 1)
                                + " has " + m + " parents (corrupt file)");
                    }
                    int[] pa = new int[m];
                    for (int i = 0; i < m; i++) {
                        pa[i] = in.readInt();
                        if (pa[i] < 0 || pa[i] >= n || pa[i] == v || (i > 0 && pa[i] <= pa[i - 1])) {
                            throw new UserError(where + ": chain " + (c + 1) + ", DAG " + (k + 1) + ": variable " + (v + 1)
                                    + " has an invalid parent list (corrupt file)");
                        }
                    }
                    dags[c][k][v] = pa;
                }
                if (weighted) {
                    w[c][k] = in.readDouble();
                    if (!(w[c][k] >= 0) || Double.isInfinite(w[c][k])) {
                        throw new UserError(where + ": chain " + (c + 1) + ", DAG " + (k + 1) + " has weight " + w[c][k]
                                + " (corrupt file)");
                    }
                }
            }
        }
        if (in.read() != -1) {
            throw new UserError(where + " is longer than " + MANIFEST + " says (" + chains + " chains of " + per + " DAGs)");
        }
        return new DagSample(n, dags, w);
    }

    /** The manifest as written, for tests and people. */
    static String manifestText(Info info) throws IOException {
        return new String(JSON.writeValueAsBytes(info), StandardCharsets.UTF_8);
    }

    /**
     * The SHA-256 (hex) of the sample's manifest followed by its DAG part: what a result quotes to name
     * exactly the sample it was answered from.
     */
    public static String fingerprint(Path dir) {
        try {
            java.security.MessageDigest md = java.security.MessageDigest.getInstance("SHA-256");
            for (String part : List.of(MANIFEST, DAGS)) {
                try (InputStream is = Files.newInputStream(dir.resolve(part))) {
                    byte[] buf = new byte[1 << 16];
                    for (int r; (r = is.read(buf)) > 0; ) {
                        md.update(buf, 0, r);
                    }
                }
            }
            return java.util.HexFormat.of().formatHex(md.digest());
        } catch (IOException e) {
            throw new UserError("sample " + dir + ": cannot read it again: " + AtomicWrite.reason(e));
        } catch (java.security.NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }
}
