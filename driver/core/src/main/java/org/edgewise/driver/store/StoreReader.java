package org.edgewise.driver.store;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import org.apache.parquet.ParquetRuntimeException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.apache.hadoop.conf.Configuration;
import org.apache.parquet.column.ColumnDescriptor;
import org.apache.parquet.column.ColumnReader;
import org.apache.parquet.column.impl.ColumnReadStoreImpl;
import org.apache.parquet.column.page.PageReadStore;
import org.apache.parquet.example.data.Group;
import org.apache.parquet.example.data.simple.convert.GroupRecordConverter;
import org.apache.parquet.hadoop.ParquetFileReader;
import org.apache.parquet.hadoop.util.HadoopInputFile;
import org.apache.parquet.schema.MessageType;
import org.apache.parquet.hadoop.ParquetReader;
import org.apache.parquet.hadoop.example.GroupReadSupport;
import org.edgewise.driver.JsonInput;
import org.edgewise.driver.UserError;

/**
 * Reads a score store without Spark. Every check of a store's integrity lives here: the manifest
 * exists and parses, its format version is ours, the Parquet parts exist with the recorded
 * checksums and row counts, every family refers to valid variables and states, and the counts
 * agree with the data fingerprint (version and fingerprint checks: {@link StoreFormat}). Any failure is
 * a {@link UserError} that says which store and what is wrong.
 */
public final class StoreReader {
    private static final ObjectMapper JSON = JsonInput.mapper()
            .configure(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES, false)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS);

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
        JsonInput.checkSize(file, "store " + dir + ": " + StoreFormat.MANIFEST);
        JsonNode tree;
        try {
            tree = JSON.readTree(file.toFile());
        } catch (com.fasterxml.jackson.databind.exc.MismatchedInputException e) {
            throw new UserError("store " + dir + ": " + StoreFormat.MANIFEST + " has text after its JSON"
                    + JsonInput.at(e.getLocation()));
        } catch (JsonProcessingException e) {
            throw new UserError("store " + dir + ": " + StoreFormat.MANIFEST + " " + JsonInput.problem(e));
        } catch (IOException e) {
            throw new UserError("store " + dir + ": cannot read " + StoreFormat.MANIFEST + ": " + e.getMessage());
        }
        StoreFormat.checkVersion(dir, tree);
        Manifest m;
        try {
            m = JSON.treeToValue(tree, Manifest.class);
        } catch (JsonProcessingException e) {
            throw new UserError("store " + dir + ": " + StoreFormat.MANIFEST + " is malformed: " + e.getOriginalMessage());
        }
        if (m.variables() == null || m.variables().isEmpty() || m.parts() == null || m.score() == null) {
            throw new UserError("store " + dir + ": " + StoreFormat.MANIFEST + " lacks variables, parts or score");
        }
        StoreFormat.checkManifest(dir, m);
        return m;
    }

    /** Reads the whole store and checks that its parts agree with the manifest. */
    public static ScoreStore read(Path dir) {
        return read(dir, true);
    }

    /**
     * Reads the store's families and their stored scores without decoding its counts: for a request
     * that only weighs stored parent sets (e.g. edge and feature frequencies over a saved sample
     * under the stored scoring). The scores part is checked as {@link #read} checks it; the counts part
     * is neither hashed nor decoded (nothing read from it), so the data fingerprint is not recomputed,
     * and every family's {@link FamilyCounts#counts()}
     * refuses to be read ({@link ScoreStore#hasCounts()} is false). On the 40-variable, d = 3 store of
     * {@code scripts/bench sample-once} (396,800 families, 64 MB) this saves seconds.
     */
    public static ScoreStore readScores(Path dir) {
        return read(dir, false);
    }

    private static ScoreStore read(Path dir, boolean withCounts) {
        Manifest m = readManifest(dir);
        StoreParts parts = m.parts();
        Path scoresFile = dir.resolve(parts.scoresFile());
        Path countsFile = dir.resolve(parts.countsFile());
        checkPart(dir, scoresFile, parts.scoresSha256());
        if (withCounts) {
            checkPart(dir, countsFile, parts.countsSha256());
        }
        int n = m.variables().size();
        int families = Math.toIntExact(parts.families());
        int[] childOf = new int[families];
        int[][] parentsOf = new int[families][];
        double[] scores = new double[families];
        List<long[]> configs = new ArrayList<>(families);
        List<long[]> counts = new ArrayList<>(families);
        try {
            if (isColumnar(scoresFile, StoreFormat.SCORES_SCHEMA)) {
                readScoresColumnar(dir, parts, scoresFile, n, childOf, parentsOf, scores);
            } else {
                readScoresByRecord(dir, parts, scoresFile, n, childOf, parentsOf, scores);
            }
        } catch (IOException | ParquetRuntimeException e) {
            throw wrap(dir, parts.scoresFile(), e);
        }
        if (!withCounts) {
            StoreFormat.checkParentSets(dir, m, parentsOf);
            List<FamilyCounts> list = new ArrayList<>(families);
            for (int f = 0; f < families; f++) {
                list.add(new FamilyCounts(childOf[f], parentsOf[f], null, null));
            }
            try {
                return new ScoreStore(m, list, scores);
            } catch (IllegalArgumentException e) {
                throw damaged(dir, parts.scoresFile(), e.getMessage());
            }
        }
        long rows;
        try {
            CountsSink sink = new CountsSink(dir, parts, m, childOf, configs, counts);
            if (isColumnar(countsFile, StoreFormat.COUNTS_SCHEMA)) {
                readCountsColumnar(countsFile, sink);
            } else {
                readCountsByRecord(countsFile, sink);
            }
            rows = sink.finish();
        } catch (IOException | ParquetRuntimeException e) {
            throw wrap(dir, parts.countsFile(), e);
        }
        if (rows != parts.countRows()) {
            throw damaged(dir, parts.countsFile(), "holds " + rows + " rows, the manifest says " + parts.countRows());
        }
        StoreFormat.checkFingerprint(dir, m, childOf, counts);
        StoreFormat.checkParentSets(dir, m, parentsOf);
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

    /** True when the file's schema is exactly the store format's (then it is read column by column). */
    private static boolean isColumnar(Path file, MessageType expected) throws IOException {
        try (ParquetFileReader r = ParquetFileReader.open(HadoopInputFile.fromPath(
                new org.apache.hadoop.fs.Path(file.toUri()), localConf()))) {
            return r.getFooter().getFileMetaData().getSchema().equals(expected);
        }
    }

    private static void checkFamily(Path dir, StoreParts parts, int f, int families, int child, int[] ps, int np, int n) {
        if (f >= families) {
            throw damaged(dir, parts.scoresFile(), "family rows are out of sequence at row " + f);
        }
        for (int i = 0; i < np; i++) {
            if (ps[i] < 0 || ps[i] >= n || ps[i] == child || (i > 0 && ps[i] <= ps[i - 1])) {
                throw damaged(dir, parts.scoresFile(), "family " + f + " has an invalid parent list");
            }
        }
        if (child < 0 || child >= n) {
            throw damaged(dir, parts.scoresFile(), "family " + f + " names variable " + child + " of " + n);
        }
    }

    /**
     * Column-level reading of the scores part: no record assembly, one pass per column chunk
     * (about ten times faster than reading records on large stores).
     */
    private static void readScoresColumnar(Path dir, StoreParts parts, Path file, int n, int[] childOf,
                                           int[][] parentsOf, double[] scores) throws IOException {
        int families = childOf.length;
        MessageType schema = StoreFormat.SCORES_SCHEMA;
        int[] next = {0};
        forEachRowGroup(file, schema, (store, groupRows) -> {
            Column family = new Column(store, schema, "family");
            Column child = new Column(store, schema, "child");
            Column parents = new Column(store, schema, "parents");
            Column score = new Column(store, schema, "log_score");
            int f = next[0];
            for (long row = 0; row < groupRows; row++, f++) {
                int fam = family.nextInt();
                if (f >= families || fam != f) {
                    throw damaged(dir, parts.scoresFile(), "family rows are out of sequence at row " + f);
                }
                int c = child.nextInt();
                int np = parents.nextInts();
                checkFamily(dir, parts, f, families, c, parents.ints, np, n);
                childOf[f] = c;
                parentsOf[f] = Arrays.copyOf(parents.ints, np);
                scores[f] = score.nextDouble();
            }
            next[0] = f;
        });
        if (next[0] != families) {
            throw damaged(dir, parts.scoresFile(), "holds " + next[0] + " families, the manifest says " + families);
        }
    }

    private static void readScoresByRecord(Path dir, StoreParts parts, Path file, int n, int[] childOf,
                                           int[][] parentsOf, double[] scores) throws IOException {
        int families = childOf.length;
        try (ParquetReader<Group> r = open(file)) {
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
                }
                checkFamily(dir, parts, f, families, child, ps, np, n);
                childOf[f] = child;
                parentsOf[f] = ps;
                scores[f] = g.getDouble("log_score", 0);
            }
            if (f != families) {
                throw damaged(dir, parts.scoresFile(), "holds " + f + " families, the manifest says " + families);
            }
        }
    }

    private static void readCountsColumnar(Path file, CountsSink sink) throws IOException {
        MessageType schema = StoreFormat.COUNTS_SCHEMA;
        forEachRowGroup(file, schema, (store, groupRows) -> {
            Column family = new Column(store, schema, "family");
            Column config = new Column(store, schema, "config");
            Column counts = new Column(store, schema, "counts");
            for (long row = 0; row < groupRows; row++) {
                int f = family.nextInt();
                long cfg = config.nextLong();
                int k = counts.nextLongs();
                sink.row(f, cfg, counts.longs, k);
            }
        });
    }

    /** The body run for each row group of a columnar part (once per group, not per row). */
    private interface RowGroupBody {
        void accept(ColumnReadStoreImpl columns, long rows) throws IOException;
    }

    /** Reads {@code file} row group by row group at column level (no record assembly). */
    private static void forEachRowGroup(Path file, MessageType schema, RowGroupBody body) throws IOException {
        try (ParquetFileReader r = ParquetFileReader.open(HadoopInputFile.fromPath(
                new org.apache.hadoop.fs.Path(file.toUri()), localConf()))) {
            String createdBy = r.getFooter().getFileMetaData().getCreatedBy();
            for (PageReadStore pages; (pages = r.readNextRowGroup()) != null; ) {
                body.accept(new ColumnReadStoreImpl(pages, new GroupRecordConverter(schema).getRootConverter(), schema,
                        createdBy), pages.getRowCount());
            }
        }
    }

    private static void readCountsByRecord(Path file, CountsSink sink) throws IOException {
        long[] buf = new long[16];
        try (ParquetReader<Group> r = open(file)) {
            for (Group g; (g = r.read()) != null; ) {
                int k = g.getFieldRepetitionCount("counts");
                if (k > buf.length) {
                    buf = new long[k];
                }
                for (int i = 0; i < k; i++) {
                    buf[i] = g.getLong("counts", i);
                }
                sink.row(g.getInteger("family", 0), g.getLong("config", 0), buf, k);
            }
        }
    }

    /** One primitive column of one row group, read value by value. */
    private static final class Column {
        final ColumnReader reader;
        final long total;
        final int maxDefinition;
        long read;

        Column(ColumnReadStoreImpl store, MessageType schema, String name) {
            ColumnDescriptor d = schema.getColumnDescription(new String[] {name});
            this.reader = store.getColumnReader(d);
            this.total = reader.getTotalValueCount();
            this.maxDefinition = d.getMaxDefinitionLevel();
        }

        boolean more() {
            return read < total;
        }

        int repetitionLevel() {
            return reader.getCurrentRepetitionLevel();
        }

        int definitionLevel() {
            return reader.getCurrentDefinitionLevel();
        }

        void skip() {
            reader.consume();
            read++;
        }

        int nextInt() {
            int v = reader.getInteger();
            skip();
            return v;
        }

        long nextLong() {
            long v = reader.getLong();
            skip();
            return v;
        }

        /** Values of the current record's repeated field, filled by {@link #nextInts()}; reused. */
        int[] ints = new int[8];
        /** Values of the current record's repeated field, filled by {@link #nextLongs()}; reused. */
        long[] longs = new long[8];

        /** Reads one record's repeated int field into {@link #ints}; returns how many (0 for an empty list). */
        int nextInts() {
            return nextRepeated(false);
        }

        /** Reads one record's repeated long field into {@link #longs}; returns how many (0 for an empty list). */
        int nextLongs() {
            return nextRepeated(true);
        }

        /** One record's repeated field into {@link #longs} ({@code wide}) or {@link #ints}; no boxing. */
        private int nextRepeated(boolean wide) {
            if (definitionLevel() < maxDefinition) {
                skip();
                return 0;
            }
            int k = 0;
            do {
                if (wide) {
                    if (k == longs.length) {
                        longs = Arrays.copyOf(longs, k * 2);
                    }
                    longs[k++] = nextLong();
                } else {
                    if (k == ints.length) {
                        ints = Arrays.copyOf(ints, k * 2);
                    }
                    ints[k++] = nextInt();
                }
            } while (more() && repetitionLevel() > 0);
            return k;
        }

        double nextDouble() {
            double v = reader.getDouble();
            skip();
            return v;
        }
    }

    /**
     * Collects count rows (families in order, one row per observed configuration) into per-family
     * arrays, with the checks of order and arity. Memory: the final arrays plus one growing buffer.
     */
    private static final class CountsSink {
        private final Path dir;
        private final StoreParts parts;
        private final Manifest m;
        private final int[] childOf;
        private final List<long[]> configs;
        private final List<long[]> counts;
        private final int families;
        private int current = -1;
        private long[] cfg = new long[16];
        private long[] cnt = new long[64];
        private int used;
        private int arity;
        private long rows;

        CountsSink(Path dir, StoreParts parts, Manifest m, int[] childOf, List<long[]> configs, List<long[]> counts) {
            this.dir = dir;
            this.parts = parts;
            this.m = m;
            this.childOf = childOf;
            this.configs = configs;
            this.counts = counts;
            this.families = childOf.length;
        }

        void row(int f, long config, long[] values, int k) {
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
            if (k != arity) {
                throw damaged(dir, parts.countsFile(), "row " + rows + " has " + k + " counts for a child with "
                        + arity + " states");
            }
            if (used == cfg.length) {
                cfg = Arrays.copyOf(cfg, used * 2);
            }
            if ((used + 1) * arity > cnt.length) {
                cnt = Arrays.copyOf(cnt, Math.max(cnt.length * 2, (used + 1) * arity));
            }
            cfg[used] = config;
            System.arraycopy(values, 0, cnt, used * arity, arity);
            used++;
            rows++;
        }

        /** Closes the last families; returns the number of rows seen. */
        long finish() {
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
            return rows;
        }
    }

    private static void checkPart(Path dir, Path file, String sha) {
        if (!Files.isRegularFile(file)) {
            throw new UserError("store " + dir + " is damaged: " + file.getFileName() + " is missing");
        }
        if (!Files.isRegularFile(file, java.nio.file.LinkOption.NOFOLLOW_LINKS)) {
            throw new UserError("store " + dir + " is damaged: " + file.getFileName() + " is a symbolic link, not a part"
                    + " of the store");
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

    private static Configuration localConf() {
        Configuration conf = new Configuration(false);
        conf.set("fs.file.impl", "org.apache.hadoop.fs.LocalFileSystem");
        return conf;
    }

    private static ParquetReader<Group> open(Path file) throws IOException {
        return ParquetReader.builder(new GroupReadSupport(), new org.apache.hadoop.fs.Path(file.toUri()))
                .withConf(localConf())
                .build();
    }

    private static UserError damaged(Path dir, String part, String what) {
        return new UserError("store " + dir + " is damaged: " + part + " " + what);
    }

    /**
     * What a damaged part really throws — an {@link IOException} (truncated file, bad footer) or a
     * Parquet decoding error — as the user's problem; anything else propagates as a bug.
     */
    private static UserError wrap(Path dir, String part, Exception e) {
        return new UserError("store " + dir + " is damaged: cannot read " + part + " (" + e.getClass().getSimpleName()
                + (e.getMessage() == null ? "" : ": " + e.getMessage().lines().findFirst().orElse("")) + ")");
    }
}
