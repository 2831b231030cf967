package org.edgewise.driver.result;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.UserError;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The edges result's format version: written first by ResultJson, checked by readEdges (report, compare). */
class ResultJsonTest {
    static EdgeResult small() {
        return new EdgeResult("order", List.of("a", "b"), -3.5, -3.5, null, List.of("a", "b"), null, null,
                List.of(new EdgeResult.Edge("a", "b", 0.75), new EdgeResult.Edge("b", "a", 0.0)),
                null, null, null, null, null, null, null);
    }

    @Test
    void writtenWithTheVersionFirstAndReadBack(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("r.json");
        ResultJson.write(f, small());
        String text = Files.readString(f);
        assertTrue(text.startsWith("{\n  \"formatVersion\" : 1,\n  \"method\" : \"order\""), text);
        assertEquals(small(), ResultJson.readEdges(f));
    }

    @Test
    void anotherVersionOrNoneIsRefusedNamingTheFile(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("r.json");
        ResultJson.write(f, small());
        String text = Files.readString(f);
        Files.writeString(f, text.replace("\"formatVersion\" : 1", "\"formatVersion\" : 2"));
        UserError e = assertThrows(UserError.class, () -> ResultJson.readEdges(f));
        assertEquals("result file " + f + " has format version 2; this Edgewise reads edges results of format version 1",
                e.getMessage());
        Files.writeString(f, text.replace("\"formatVersion\" : 1,", ""));
        e = assertThrows(UserError.class, () -> ResultJson.readEdges(f));
        assertEquals("result file " + f + " has no format version; this Edgewise reads edges results of format version 1",
                e.getMessage());
    }
}
