package org.edgewise.driver;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.RandomAccessFile;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.network.NetworkReader;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.result.ResultJson;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.function.Executable;
import org.junit.jupiter.api.io.TempDir;

/**
 * Issue 23 item 8: every JSON input (network, result, effect result, store manifest) is bounded in
 * size, nesting, text and number length, and refused in one line naming the file — no
 * NullPointerException from a constraint error without a location, no stack overflow, no heap
 * exhausted. A network node whose cpt would be astronomically large is refused with the figure
 * and the limit. Messages word for word; the files are untouched.
 */
class BoundedJsonTest {
    @TempDir
    Path dir;

    static String refused(Executable e) {
        return assertThrows(UserError.class, e).getMessage();
    }

    static String deep(int levels) {
        return "[".repeat(levels) + "]".repeat(levels);
    }

    @Test
    void deepLongAndHugeFilesAreRefusedInOneLine() throws Exception {
        List<Path> files = new ArrayList<>();
        Path deep = Files.writeString(dir.resolve("deep.json"), "{\"edgewiseNetwork\": 1, \"x\": " + deep(5000) + "}");
        files.add(deep);
        assertEquals("network file " + deep + " is nested deeper than 100 levels", refused(() -> NetworkReader.read(deep)));
        assertEquals("result file " + deep + " is nested deeper than 100 levels", refused(() -> ResultJson.readEdges(deep)));
        assertEquals("effect file " + deep + " is nested deeper than 100 levels", refused(() -> EffectResult.read(deep)));
        Path text = Files.writeString(dir.resolve("text.json"), "{\"name\": \"" + "x".repeat(1_000_001) + "\"}");
        assertEquals("network file " + text + " holds a text longer than 1,000,000 characters",
                refused(() -> NetworkReader.read(text)));
        Path number = Files.writeString(dir.resolve("number.json"), "{\"edgewiseNetwork\": 1" + "0".repeat(1000) + "}");
        assertEquals("network file " + number + " holds a number longer than 1,000 characters",
                refused(() -> NetworkReader.read(number)));
        Path huge = dir.resolve("huge.json");
        try (RandomAccessFile f = new RandomAccessFile(huge.toFile(), "rw")) {
            f.setLength(JsonInput.MAX_BYTES + 1); // sparse: nothing is written
        }
        assertEquals("network file " + huge + " is 268,435,457 bytes; JSON inputs are limited to 268,435,456 bytes (256 MiB)",
                refused(() -> NetworkReader.read(huge)));
        assertEquals("result file " + huge + " is 268,435,457 bytes; JSON inputs are limited to 268,435,456 bytes (256 MiB)",
                refused(() -> ResultJson.readEdges(huge)));
        Path bad = Files.writeString(dir.resolve("bad.json"), "{\"edgewiseNetwork\": 1,\n  oops}");
        assertEquals("network file " + bad + " is not valid JSON (line 2, column 4)", refused(() -> NetworkReader.read(bad)));
        assertEquals(JsonInput.MAX_BYTES + 1, Files.size(huge));
    }

    /** A node with 64 binary parents: 2^65 cpt entries, refused with the figure and the limit (was an integer overflow). */
    @Test
    void aNodeWithTooManyParentsIsRefusedWithTheFigure() {
        StringBuilder sb = new StringBuilder("{\"edgewiseNetwork\":1,\"variables\":[");
        List<String> parents = new ArrayList<>();
        for (int i = 0; i < 64; i++) {
            sb.append("{\"name\":\"p").append(i).append("\",\"states\":[\"0\",\"1\"],\"cpt\":[[0.5,0.5]]},");
            parents.add("\"p" + i + "\"");
        }
        sb.append("{\"name\":\"c\",\"states\":[\"0\",\"1\"],\"parents\":[").append(String.join(",", parents))
                .append("],\"cpt\":[[0.5,0.5]]}]}");
        assertEquals("network n.json: variable 'c' has 64 parents and a cpt of 36,893,488,147,419,103,232 entries;"
                + " a variable's cpt may hold at most 10,000,000", refused(() -> NetworkReader.parse("n.json", sb.toString())));
    }
}
