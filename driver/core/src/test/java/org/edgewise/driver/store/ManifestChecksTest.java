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

    Path store() {
        Path store = dir.resolve("s");
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

    @Test
    void anEditedMaxParentsIsCaught() throws Exception {
        Path s = store();
        edit(s, "\"maxParents\" : 1", "\"maxParents\" : 0");
        assertEquals("store " + s + " contradicts its manifest.json: family 1 has 1 parent, but maxParents is 0", refused(s));
        edit(s, "\"maxParents\" : 0", "\"maxParents\" : -1");
        assertEquals("store " + s + ": manifest.json has maxParents -1; it must be 0 or more", refused(s));
    }

    @Test
    void editedRowsDuplicateStatesAndTrailingTextAreCaught() throws Exception {
        Path s = store();
        edit(s, "\"rows\" : 5", "\"rows\" : 50");
        assertEquals("store " + s + " is damaged: family 0 (child a) counts 5 rows; the data fingerprint says 50", refused(s));
        edit(s, "\"rows\" : 50", "\"rows\" : 5");
        edit(s, "\"x\", \"y\", \"z\"", "\"x\", \"y\", \"x\"");
        assertEquals("store " + s + ": manifest.json lists the state 'x' of variable 'b' twice", refused(s));
        edit(s, "\"x\", \"y\", \"x\"", "\"x\", \"y\", \"z\"");
        StoreReader.read(s); // back to a good store
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
