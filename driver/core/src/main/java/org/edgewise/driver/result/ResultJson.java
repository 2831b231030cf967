package org.edgewise.driver.result;

import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import org.edgewise.driver.UserError;

/** Reading and writing result JSON; writes go to a temporary sibling and are renamed into place. */
public final class ResultJson {
    public static final ObjectMapper MAPPER = new ObjectMapper()
            .enable(SerializationFeature.INDENT_OUTPUT)
            .configure(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES, false);

    private ResultJson() {
    }

    public static String toJson(Object value) {
        try {
            return MAPPER.writeValueAsString(value);
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Writes {@code value} as JSON to {@code file} atomically. */
    public static void write(Path file, Object value) {
        writeText(file, toJson(value) + "\n");
    }

    /** Writes text to {@code file} atomically (temporary sibling, then rename). */
    public static void writeText(Path file, String text) {
        Path abs = file.toAbsolutePath();
        Path tmp = abs.resolveSibling("." + abs.getFileName() + ".tmp");
        try {
            if (abs.getParent() != null) {
                Files.createDirectories(abs.getParent());
            }
            Files.writeString(tmp, text);
            Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
        } catch (IOException e) {
            try {
                Files.deleteIfExists(tmp);
            } catch (IOException ignored) {
                // nothing more to do
            }
            throw new UserError("cannot write " + file + ": " + e.getMessage());
        }
    }

    public static EdgeResult readEdges(Path file) {
        if (!Files.isRegularFile(file)) {
            throw new UserError("result file " + file + " does not exist");
        }
        try {
            EdgeResult r = MAPPER.readValue(file.toFile(), EdgeResult.class);
            if (r.variables() == null || r.edges() == null) {
                throw new UserError("result file " + file + " is not an edges result (no variables or edges)");
            }
            return r;
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new UserError("result file " + file + " is not valid JSON (line "
                    + e.getLocation().getLineNr() + ", column " + e.getLocation().getColumnNr() + ")");
        } catch (IOException e) {
            throw new UserError("cannot read result file " + file + ": " + e.getMessage());
        }
    }
}
