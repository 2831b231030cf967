package org.edgewise.driver.store;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.List;
import java.util.stream.Stream;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.FileSystem;
import org.apache.parquet.example.data.Group;
import org.apache.parquet.example.data.simple.SimpleGroupFactory;
import org.apache.parquet.hadoop.ParquetFileWriter;
import org.apache.parquet.hadoop.ParquetWriter;
import org.apache.parquet.hadoop.example.ExampleParquetWriter;
import org.apache.parquet.hadoop.metadata.CompressionCodecName;
import org.apache.parquet.hadoop.util.HadoopOutputFile;
import org.edgewise.driver.AtomicWrite;

/**
 * Writes a score store atomically: everything goes to a hidden temporary sibling of the target,
 * which is renamed into place only when complete. An existing store is replaced only with
 * {@code overwrite}; a failure leaves the target as it was.
 */
public final class StoreWriter {
    private static final ObjectMapper JSON = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);

    private StoreWriter() {
    }

    /**
     * Writes {@code families} (grouped by child, increasing) with their {@code logScores}.
     * The manifest's {@code parts} are filled in here.
     */
    public static void write(Path target, Manifest manifest, List<FamilyCounts> families,
                             double[] logScores, boolean overwrite) {
        write(target, manifest, families, logScores, overwrite, "overwrite");
    }

    /** More parts written into the store's temporary directory before it is renamed into place. */
    public interface ExtraParts {
        void write(Path dir) throws IOException;
    }

    /** As {@link #write(Path, Manifest, List, double[], boolean)}; {@code overwriteOption} names the permission to replace. */
    public static void write(Path target, Manifest manifest, List<FamilyCounts> families,
                             double[] logScores, boolean overwrite, String overwriteOption) {
        write(target, manifest, families, logScores, overwrite, overwriteOption, dir -> { });
    }

    /**
     * As {@link #write(Path, Manifest, List, double[], boolean, String)}, with {@code extra} written
     * into the store too (a store averaged over missing values: its sample, {@link MissingValues}).
     */
    public static void write(Path target, Manifest manifest, List<FamilyCounts> families,
                             double[] logScores, boolean overwrite, String overwriteOption, ExtraParts extra) {
        try {
            AtomicWrite.directory(target, overwrite, overwriteOption, tmp -> {
                long countRows = writeCounts(tmp.resolve(StoreFormat.COUNTS), families);
                writeScores(tmp.resolve(StoreFormat.SCORES), families, logScores);
                // the same counts and scores give the same bytes (and SHA-256) in every run
                ParquetFooters.canonicalize(tmp.resolve(StoreFormat.COUNTS));
                ParquetFooters.canonicalize(tmp.resolve(StoreFormat.SCORES));
                StoreParts parts = new StoreParts(StoreFormat.SCORES, families.size(),
                        sha256(tmp.resolve(StoreFormat.SCORES)), StoreFormat.COUNTS, countRows,
                        sha256(tmp.resolve(StoreFormat.COUNTS)));
                extra.write(tmp);
                JSON.writeValue(tmp.resolve(StoreFormat.MANIFEST).toFile(), StoreFormat.stamp(manifest, parts));
            });
        } catch (IOException e) {
            throw new org.edgewise.driver.UserError("cannot write store " + target + ": " + AtomicWrite.reason(e), e);
        }
    }

    private static Configuration localConf() throws IOException {
        Configuration conf = new Configuration(false);
        conf.set("fs.file.impl", "org.apache.hadoop.fs.LocalFileSystem");
        FileSystem.getLocal(conf).setWriteChecksum(false);
        return conf;
    }

    private static ParquetWriter<Group> open(Path file, org.apache.parquet.schema.MessageType schema)
            throws IOException {
        Configuration conf = localConf();
        return ExampleParquetWriter.builder(HadoopOutputFile.fromPath(
                        new org.apache.hadoop.fs.Path(file.toUri()), conf))
                .withConf(conf)
                .withType(schema)
                .withCompressionCodec(CompressionCodecName.SNAPPY)
                .withWriteMode(ParquetFileWriter.Mode.CREATE)
                .build();
    }

    private static long writeCounts(Path file, List<FamilyCounts> families) throws IOException {
        SimpleGroupFactory groups = new SimpleGroupFactory(StoreFormat.COUNTS_SCHEMA);
        long rows = 0;
        try (ParquetWriter<Group> w = open(file, StoreFormat.COUNTS_SCHEMA)) {
            for (int f = 0; f < families.size(); f++) {
                FamilyCounts fc = families.get(f);
                int r = fc.configs().length == 0 ? 0 : fc.counts().length / fc.configs().length;
                for (int m = 0; m < fc.configs().length; m++) {
                    Group g = groups.newGroup().append("family", f).append("config", fc.configs()[m]);
                    for (int k = 0; k < r; k++) {
                        g.add("counts", fc.counts()[m * r + k]);
                    }
                    w.write(g);
                    rows++;
                }
            }
        }
        return rows;
    }

    private static void writeScores(Path file, List<FamilyCounts> families, double[] logScores) throws IOException {
        SimpleGroupFactory groups = new SimpleGroupFactory(StoreFormat.SCORES_SCHEMA);
        try (ParquetWriter<Group> w = open(file, StoreFormat.SCORES_SCHEMA)) {
            for (int f = 0; f < families.size(); f++) {
                FamilyCounts fc = families.get(f);
                Group g = groups.newGroup().append("family", f).append("child", fc.child());
                for (int p : fc.parents()) {
                    g.add("parents", p);
                }
                g.add("log_score", logScores[f]);
                w.write(g);
            }
        }
    }

    /** SHA-256 of a file, lower-case hex. */
    static String sha256(Path file) throws IOException {
        try (InputStream in = Files.newInputStream(file)) {
            MessageDigest md = MessageDigest.getInstance("SHA-256");
            byte[] buf = new byte[1 << 16];
            for (int n; (n = in.read(buf)) > 0; ) {
                md.update(buf, 0, n);
            }
            return HexFormat.of().formatHex(md.digest());
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }
}
