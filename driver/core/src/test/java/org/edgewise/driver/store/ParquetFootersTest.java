package org.edgewise.driver.store;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.apache.parquet.format.ColumnChunk;
import org.apache.parquet.format.Encoding;
import org.apache.parquet.format.FileMetaData;
import org.apache.parquet.format.Util;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The footer's encoding lists are a set in the Parquet format (parquet-format {@code parquet.thrift},
 * {@code ColumnMetaData.encodings}: "Set of all encodings used for this column"), so any order
 * names the same file content; canonicalising must give one byte sequence for every order and
 * leave the data as it was.
 */
class ParquetFootersTest {
    @TempDir
    Path dir;

    private static int footerLength(byte[] file) {
        return ByteBuffer.wrap(file, file.length - 8, 4).order(ByteOrder.LITTLE_ENDIAN).getInt();
    }

    private static FileMetaData footer(byte[] file) throws Exception {
        int len = footerLength(file);
        return Util.readFileMetaData(new ByteArrayInputStream(file, file.length - 8 - len, len));
    }

    /** The same file with every column chunk's encoding list in the reverse of its sorted order. */
    private static byte[] withReversedEncodings(byte[] file) throws Exception {
        FileMetaData meta = footer(file);
        for (ColumnChunk cc : meta.getRow_groups().get(0).getColumns()) {
            List<Encoding> e = new ArrayList<>(cc.getMeta_data().getEncodings());
            e.sort((x, y) -> Integer.compare(y.getValue(), x.getValue()));
            cc.getMeta_data().setEncodings(e);
        }
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        Util.writeFileMetaData(meta, out);
        int len = footerLength(file);
        assertEquals(len, out.size(), "same elements, same thrift length");
        byte[] copy = file.clone();
        System.arraycopy(out.toByteArray(), 0, copy, file.length - 8 - len, len);
        return copy;
    }

    @Test
    void everyOrderOfTheEncodingSetGivesTheSameBytes() throws Exception {
        Path store = dir.resolve("s");
        StoreWriter.write(store, StoreRoundTripTest.manifest(), StoreRoundTripTest.families(),
                new double[] {-1, -2, -3, -4}, false);
        for (String part : List.of(StoreFormat.COUNTS, StoreFormat.SCORES)) {
            byte[] written = Files.readAllBytes(store.resolve(part));
            FileMetaData meta = footer(written);
            boolean several = false;
            for (ColumnChunk cc : meta.getRow_groups().get(0).getColumns()) {
                List<Encoding> e = cc.getMeta_data().getEncodings();
                List<Encoding> sorted = new ArrayList<>(e);
                sorted.sort((x, y) -> Integer.compare(x.getValue(), y.getValue()));
                assertEquals(sorted, e, part + ": the writer leaves the encodings sorted");
                several |= e.size() > 1;
            }
            assertEquals(true, several, part + ": some column has more than one encoding (else nothing is checked)");

            byte[] reversed = withReversedEncodings(written);
            assertEquals(false, java.util.Arrays.equals(written, reversed), part + ": the reversed order differs in bytes");
            Path other = dir.resolve(part);
            Files.write(other, reversed);
            ParquetFooters.canonicalize(other);
            assertArrayEquals(written, Files.readAllBytes(other), part + ": canonical bytes whatever the order");
            ParquetFooters.canonicalize(other);
            assertArrayEquals(written, Files.readAllBytes(other), part + ": canonicalising twice changes nothing");
        }
        // the store still reads back, manifest hashes included
        assertEquals(-4, StoreReader.read(store).logScore(3));
    }
}
