package org.edgewise.driver.store;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.apache.hadoop.conf.Configuration;
import org.apache.parquet.example.data.Group;
import org.apache.parquet.hadoop.ParquetReader;
import org.apache.parquet.hadoop.example.GroupReadSupport;
import org.edgewise.driver.UserError;

/**
 * Reads a score store without Spark. Every check of a store's integrity lives here: the manifest
 * exists and parses, its format version is ours, the Parquet parts exist with the recorded
 * checksums and row counts, and every family refers to valid variables and states. Any failure is
 * a {@link UserError} that says which store and what is wrong.
 */
public final class StoreReader {
    private static final ObjectMapper JSON = new ObjectMapper()
            .configure(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES, false);

    private StoreReader() {
    }

    /** Reads and checks only the manifest. */
    public static Manifest readManifest(Path dir) {
        if (!Files.isDirectory(dir)) {
            throw new UserError("store " + dir + " does not exist or is not a directory");
        }
        Path file = dir.resolve(StoreFormat.MANIFEST);
        if (!Files.isRegularFile(file)) {
            throw new UserError("store " + dir + " has no " + StoreFormat.MANIFEST + "; it is not an Edgewise score store (or was not written completely)");
        }
        JsonNode tree;
        try {
            tree = JSON.readTree(file.toFile());
        } catch (JsonProcessingException e) {
            throw new UserError("store " + dir + ": " + StoreFormat.MANIFEST + " is not valid JSON (line "
                    + e.getLocation().getLineNr() + ", column " + e.getLocation().getColumnNr() + ")");
        } catch (IOException e) {
            throw new UserError("store " + dir + ": cannot read " + StoreFormat.MANIFEST + ": " + e.getMessage());
        }
        if (tree == null || !tree.isObject() || !tree.has("formatVersion")) {
            throw new UserError("store " + dir + ": " + StoreFormat.MANIFEST + " has no formatVersion; it is not an Edgewise manifest");
        }
        int version = tree.get("formatVersion").asInt(-1);
        if (version != StoreFormat.VERSION) {
            throw new UserError("store " + dir + " has format version " + tree.get("formatVersion").asText()
                    + "; this Edgewise reads format version " + StoreFormat.VERSION);
        }
        Manifest m;
        try {
            m = JSON.treeToValue(tree, Manifest.class);
        } catch (JsonProcessingException e) {
            throw new UserError("store " + dir + ": " + StoreFormat.MANIFEST + " is malformed: " + e.getOriginalMessage());
        }
        if (m.variables() == null || m.variables().isEmpty() || m.parts() == null || m.score() == null) {
            throw new UserError("store " + dir + ": " + StoreFormat.MANIFEST + " lacks variables, parts or score");
        }
        return m;
    }

    /** Reads the whole store and checks that its parts agree with the manifest. */
    public static ScoreStore read(Path dir) {
        Manifest m = readManifest(dir);
        StoreParts parts = m.parts();
        Path scoresFile = dir.resolve(parts.scoresFile());
        Path countsFile = dir.resolve(parts.countsFile());
        checkPart(dir, scoresFile, parts.scoresSha256());
        checkPart(dir, countsFile, parts.countsSha256());
        int n = m.variables().size();
        int families = Math.toIntExact(parts.families());
        int[] childOf = new int[families];
        int[][] parentsOf = new int[families][];
        double[] scores = new double[families];
        try (ParquetReader<Group> r = open(scoresFile)) {
            int f = 0;
            for (Group g; (g = r.read()) != null; f++) {
                if (f >= families || g.getInteger("family", 0) != f) {
                    throw damaged(dir, parts.scoresFile(), "family rows are out of sequence at row " + f);
                }
                int child = g.getInteger("child", 0);
                int np = g.getFieldRepetitionCount("parents");
                int[] ps = new int[np];
                for (int i = 0; i < np; i++) {
                    ps[i] = g.getInteger("parents", i);
                    if (ps[i] < 0 || ps[i] >= n || ps[i] == child || (i > 0 && ps[i] <= ps[i - 1])) {
                        throw damaged(dir, parts.scoresFile(), "family " + f + " has an invalid parent list");
                    }
                }
                if (child < 0 || child >= n) {
                    throw damaged(dir, parts.scoresFile(), "family " + f + " names variable " + child + " of " + n);
                }
                childOf[f] = child;
                parentsOf[f] = ps;
                scores[f] = g.getDouble("log_score", 0);
            }
            if (f != families) {
                throw damaged(dir, parts.scoresFile(), "holds " + f + " families, the manifest says " + families);
            }
        } catch (IOException | RuntimeException e) {
            throw wrap(dir, parts.scoresFile(), e);
        }
        // Counts: one row per observed configuration, families in order.
        List<long[]> configs = new ArrayList<>(families);
        List<long[]> counts = new ArrayList<>(families);
        long rows = 0;
        try (ParquetReader<Group> r = open(countsFile)) {
            int current = -1;
            long[] cfg = new long[16];
            long[] cnt = new long[64];
            int used = 0;
            int arity = 0;
            for (Group g; (g = r.read()) != null; rows++) {
                int f = g.getInteger("family", 0);
                if (f < current || f >= families) {
                    throw damaged(dir, parts.countsFile(), "row " + rows + " names family " + f + " out of order");
                }
                while (current < f) {
                    if (current >= 0) {
                        configs.add(Arrays.copyOf(cfg, used));
                        counts.add(Arrays.copyOf(cnt, used * arity));
                    }
                    current++;
                    used = 0;
                    arity = m.variables().get(childOf[current]).arity();
                }
                if (g.getFieldRepetitionCount("counts") != arity) {
                    throw damaged(dir, parts.countsFile(), "row " + rows + " has "
                            + g.getFieldRepetitionCount("counts") + " counts for a child with " + arity + " states");
                }
                if (used == cfg.length) {
                    cfg = Arrays.copyOf(cfg, used * 2);
                }
                if ((used + 1) * arity > cnt.length) {
                    cnt = Arrays.copyOf(cnt, Math.max(cnt.length * 2, (used + 1) * arity));
                }
                cfg[used] = g.getLong("config", 0);
                for (int k = 0; k < arity; k++) {
                    cnt[used * arity + k] = g.getLong("counts", k);
                }
                used++;
            }
            while (current < families) {
                if (current >= 0) {
                    configs.add(Arrays.copyOf(cfg, used));
                    counts.add(Arrays.copyOf(cnt, used * arity));
                }
                current++;
                used = 0;
                if (current < families) {
                    arity = m.variables().get(childOf[current]).arity();
                }
            }
        } catch (IOException | RuntimeException e) {
            throw wrap(dir, parts.countsFile(), e);
        }
        if (rows != parts.countRows()) {
            throw damaged(dir, parts.countsFile(), "holds " + rows + " rows, the manifest says " + parts.countRows());
        }
        List<FamilyCounts> list = new ArrayList<>(families);
        for (int f = 0; f < families; f++) {
            list.add(new FamilyCounts(childOf[f], parentsOf[f], configs.get(f), counts.get(f)));
        }
        try {
            return new ScoreStore(m, list, scores);
        } catch (IllegalArgumentException e) {
            throw damaged(dir, parts.scoresFile(), e.getMessage());
        }
    }

    private static void checkPart(Path dir, Path file, String sha) {
        if (!Files.isRegularFile(file)) {
            throw new UserError("store " + dir + " is damaged: " + file.getFileName() + " is missing");
        }
        try {
            String actual = StoreWriter.sha256(file);
            if (!actual.equals(sha)) {
                throw new UserError("store " + dir + " is damaged: " + file.getFileName()
                        + " does not match its manifest (SHA-256 differs); re-run the tally");
            }
        } catch (IOException e) {
            throw new UserError("store " + dir + ": cannot read " + file.getFileName() + ": " + e.getMessage());
        }
    }

    private static ParquetReader<Group> open(Path file) throws IOException {
        Configuration conf = new Configuration(false);
        conf.set("fs.file.impl", "org.apache.hadoop.fs.LocalFileSystem");
        return ParquetReader.builder(new GroupReadSupport(), new org.apache.hadoop.fs.Path(file.toUri()))
                .withConf(conf)
                .build();
    }

    private static UserError damaged(Path dir, String part, String what) {
        return new UserError("store " + dir + " is damaged: " + part + " " + what);
    }

    private static UserError wrap(Path dir, String part, Exception e) {
        if (e instanceof UserError u) {
            return u;
        }
        return new UserError("store " + dir + " is damaged: cannot read " + part + " (" + e.getClass().getSimpleName()
                + (e.getMessage() == null ? "" : ": " + e.getMessage().lines().findFirst().orElse("")) + ")");
    }
}
