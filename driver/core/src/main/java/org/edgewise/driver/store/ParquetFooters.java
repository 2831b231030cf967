package org.edgewise.driver.store;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Comparator;
import java.util.List;
import org.apache.parquet.format.ColumnChunk;
import org.apache.parquet.format.Encoding;
import org.apache.parquet.format.FileMetaData;
import org.apache.parquet.format.RowGroup;
import org.apache.parquet.format.Util;

/**
 * Makes a Parquet file written by parquet-mr reproducible byte for byte.
 *
 * <p>parquet-mr 1.13 collects each column chunk's encodings in a {@code HashSet<Encoding>} and
 * writes them in that set's iteration order, which follows the enum constants' identity hash
 * codes and so changes from one JVM run to the next: two runs over the same data give files that
 * differ in a couple of footer bytes (and in their SHA-256). The Parquet format defines the field
 * as a set ("Set of all encodings used for this column", {@code ColumnMetaData.encodings} in
 * parquet-format's {@code parquet.thrift}), so its order carries no meaning; here it is sorted by
 * the encodings' thrift values. Re-encoding a list of the same elements in another order keeps
 * the footer's length, so the footer is rewritten in place and every offset stays valid.
 *
 * <p>File layout (parquet-format {@code README}, "File format"): {@code PAR1}, column chunks, the
 * thrift-compact {@code FileMetaData}, its length as a 4-byte little-endian integer, {@code PAR1}.
 * Memory: the footer only (a few KiB per row group).
 */
final class ParquetFooters {
    private static final byte[] MAGIC = "PAR1".getBytes(StandardCharsets.US_ASCII);

    private ParquetFooters() {
    }

    /** Sorts every column chunk's encoding list in the footer of {@code file}, in place. */
    static void canonicalize(Path file) throws IOException {
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.READ, StandardOpenOption.WRITE)) {
            long size = ch.size();
            if (size < 12) {
                throw new IOException(file + " is too short for a Parquet file");
            }
            ByteBuffer tail = ByteBuffer.allocate(8).order(ByteOrder.LITTLE_ENDIAN);
            readFully(ch, tail, size - 8);
            int footerLength = tail.getInt(0);
            for (int i = 0; i < 4; i++) {
                if (tail.get(4 + i) != MAGIC[i]) {
                    throw new IOException(file + " does not end with the Parquet magic");
                }
            }
            long footerStart = size - 8 - footerLength;
            if (footerLength <= 0 || footerStart < MAGIC.length) {
                throw new IOException(file + " has a footer length of " + footerLength + " bytes");
            }
            ByteBuffer footer = ByteBuffer.allocate(footerLength);
            readFully(ch, footer, footerStart);
            FileMetaData meta = Util.readFileMetaData(new ByteArrayInputStream(footer.array()));
            if (!sortEncodings(meta)) {
                return;
            }
            ByteArrayOutputStream out = new ByteArrayOutputStream(footerLength);
            Util.writeFileMetaData(meta, out);
            if (out.size() != footerLength) {
                throw new IOException(file + ": the reordered footer has " + out.size() + " bytes instead of "
                        + footerLength);
            }
            ByteBuffer rewritten = ByteBuffer.wrap(out.toByteArray());
            while (rewritten.hasRemaining()) {
                ch.write(rewritten, footerStart + rewritten.position());
            }
        }
    }

    /** Sorts the encoding lists; true when any was out of order. */
    private static boolean sortEncodings(FileMetaData meta) {
        boolean changed = false;
        for (RowGroup rg : meta.getRow_groups()) {
            for (ColumnChunk cc : rg.getColumns()) {
                if (cc.isSetMeta_data() && cc.getMeta_data().isSetEncodings()) {
                    List<Encoding> encodings = cc.getMeta_data().getEncodings();
                    List<Encoding> sorted = encodings.stream().sorted(Comparator.comparingInt(Encoding::getValue)).toList();
                    if (!sorted.equals(encodings)) {
                        cc.getMeta_data().setEncodings(new java.util.ArrayList<>(sorted));
                        changed = true;
                    }
                }
            }
        }
        return changed;
    }

    private static void readFully(FileChannel ch, ByteBuffer buf, long position) throws IOException {
        while (buf.hasRemaining()) {
            if (ch.read(buf, position + buf.position()) < 0) {
                throw new IOException("unexpected end of file");
            }
        }
    }
}
