package org.edgewise.driver.store;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

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
}
