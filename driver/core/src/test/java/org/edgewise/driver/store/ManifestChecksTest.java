package org.edgewise.driver.store;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.RandomAccessFile;
import java.nio.file.Files;
import java.nio.file.Path;
import org.edgewise.driver.UserError;
import org.edgewise.driver.result.ResultJson;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The manifest is checked against what the parts show (an edited maxParents or rows, duplicate
 * state labels, text after the JSON were accepted and the output contradicted itself: d = 1
 * beside 2-parent sets). Messages word for word.
 */
class ManifestChecksTest {
    @TempDir
    Path dir;

    private int stores;

    /** A fresh good store. */
    Path store() {
        Path store = dir.resolve("s" + stores++);
        StoreWriter.write(store, StoreRoundTripTest.manifest(), StoreRoundTripTest.families(),
                new double[] {-1, -2, -3, -4}, false);
        return store;
    }

    static String refused(Path store) {
        return assertThrows(UserError.class, () -> StoreReader.read(store)).getMessage();
    }

    static void edit(Path store, String from, String to) throws Exception {
        Path m = store.resolve(StoreFormat.MANIFEST);
        String text = Files.readString(m);
        if (!text.contains(from)) {
            throw new AssertionError("no '" + from + "' in " + text);
        }
        Files.writeString(m, text.replace(from, to));
    }

    /** A fresh store whose manifest has {@code from} edited to {@code to} is refused with "store &lt;path&gt;" + {@code after}. */
    void assertRefused(String from, String to, String after) throws Exception {
        Path s = store();
        edit(s, from, to);
        assertEquals("store " + s + after, refused(s));
    }

    @Test
    void anEditedMaxParentsIsCaught() throws Exception {
        assertRefused("\"maxParents\" : 1", "\"maxParents\" : 0",
                " contradicts its manifest.json: family 1 has 1 parent, but maxParents is 0");
        assertRefused("\"maxParents\" : 1", "\"maxParents\" : -1", ": manifest.json has maxParents -1; it must be 0 or more");
    }

    @Test
    void editedRowsDuplicateStatesAndTrailingTextAreCaught() throws Exception {
        assertRefused("\"rows\" : 5", "\"rows\" : 50", " is damaged: family 0 (child a) counts 5 rows; the data fingerprint says 50");
        assertRefused("\"x\", \"y\", \"z\"", "\"x\", \"y\", \"x\"", ": manifest.json lists the state 'x' of variable 'b' twice");
        Path s = store();
        StoreReader.read(s); // a good store
        Files.writeString(s.resolve(StoreFormat.MANIFEST), "\n{\"garbage\": 1}", java.nio.file.StandardOpenOption.APPEND);
        String m = refused(s);
        assertEquals(true, m.startsWith("store " + s + ": manifest.json has text after its JSON (line "), m);
    }

    @Test
    void jsonOfTheWrongShapeIsNotCalledInvalid() throws Exception {
        Path f = Files.writeString(dir.resolve("r.json"), "{\"formatVersion\": " + ResultJson.EDGES_FORMAT_VERSION + ", \"variables\": [\"a\"], \"edges\": 7}");
        UserError e = assertThrows(UserError.class, () -> ResultJson.readEdges(f));
        assertEquals("result file " + f + " is JSON but not an edges result: edges has the wrong type (line 1, column 51)",
                e.getMessage());
    }

    /** Issue 23 item 5: a part path that leads out of the store is refused before anything is opened. */
    @Test
    void partsAreFilesInsideTheStore() throws Exception {
        Path s = store();
        Path other = dir.resolve("other");
        Files.createDirectory(other);
        Files.copy(s.resolve(StoreFormat.SCORES), other.resolve(StoreFormat.SCORES));
        byte[] manifest = Files.readAllBytes(s.resolve(StoreFormat.MANIFEST));
        edit(s, "\"scoresFile\" : \"scores.parquet\"", "\"scoresFile\" : \"../other/scores.parquet\"");
        assertEquals("store " + s + ": manifest.json field parts.scoresFile is '../other/scores.parquet'; it must be the"
                + " name of a file inside the store", refused(s));
        Files.write(s.resolve(StoreFormat.MANIFEST), manifest);
        edit(s, "\"countsFile\" : \"counts.parquet\"", "\"countsFile\" : \"/etc/passwd\"");
        assertEquals("store " + s + ": manifest.json field parts.countsFile is '/etc/passwd'; it must be the"
                + " name of a file inside the store", refused(s));
        edit(s, "\"countsFile\" : \"/etc/passwd\"", "\"countsFile\" : \"..\"");
        assertEquals("store " + s + ": manifest.json field parts.countsFile is '..'; it must be the"
                + " name of a file inside the store", refused(s));
        edit(s, "\"countsFile\" : \"..\"", "\"countsFile\" : \"\"");
        assertEquals("store " + s + ": manifest.json field parts.countsFile is ''; it must be the"
                + " name of a file inside the store", refused(s));
        Files.write(s.resolve(StoreFormat.MANIFEST), manifest);
        // a part that is a symbolic link out of the store
        Path scores = s.resolve(StoreFormat.SCORES);
        Files.move(scores, dir.resolve("moved.parquet"));
        Files.createSymbolicLink(scores, dir.resolve("moved.parquet"));
        assertEquals("store " + s + " is damaged: scores.parquet is a symbolic link, not a part of the store", refused(s));
        Files.delete(scores);
        Files.move(dir.resolve("moved.parquet"), scores);
        StoreReader.read(s); // back to a good store
    }

    /** Issue 23 item 7: two variables of one name are refused (edges a → a followed). */
    @Test
    void duplicateVariableNamesAreRefused() throws Exception {
        Path s = store();
        edit(s, "\"name\" : \"b\"", "\"name\" : \"a\"");
        assertEquals("store " + s + ": manifest.json lists the variable 'a' twice", refused(s));
        assertEquals("store " + s + ": manifest.json lists the variable 'a' twice",
                assertThrows(UserError.class, () -> StoreReader.readManifest(s)).getMessage());
    }

    /** Issue 23 item 8: a manifest is bounded like every JSON input. */
    @Test
    void aManifestIsBoundedToo() throws Exception {
        Path s = dir.resolve("s");
        StoreWriter.write(s, StoreRoundTripTest.manifest(), StoreRoundTripTest.families(), new double[] {-1, -2, -3, -4},
                false);
        Path m = s.resolve("manifest.json");
        String good = Files.readString(m);
        Files.writeString(m, good.replaceFirst("\\{", "{\"deep\": " + "[".repeat(1000) + "]".repeat(1000) + ","));
        byte[] before = Files.readAllBytes(m);
        assertEquals("store " + s + ": manifest.json is nested deeper than 100 levels", refused(s));
        assertArrayEquals(before, Files.readAllBytes(m));
        try (RandomAccessFile f = new RandomAccessFile(m.toFile(), "rw")) {
            f.setLength(org.edgewise.driver.JsonInput.MAX_BYTES + 1);
        }
        assertEquals("store " + s + ": manifest.json is 268,435,457 bytes; JSON inputs are limited to 268,435,456 bytes"
                + " (256 MiB)", refused(s));
    }
}
