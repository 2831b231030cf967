package org.edgewise.driver;

import com.fasterxml.jackson.core.JsonFactory;
import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.StreamReadConstraints;
import com.fasterxml.jackson.core.exc.StreamConstraintsException;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

/**
 * The bounds of every JSON file Edgewise reads (store manifests, networks, results), in one place:
 * a file size limit checked before parsing, and Jackson's {@link StreamReadConstraints} on nesting
 * depth, string length and number length, so that a hostile or broken file is refused in one line
 * instead of exhausting the heap or the stack. {@link #problem} words a parse failure; a
 * constraint's exception may carry no location, and the wording does not need one.
 */
public final class JsonInput {
    /** Largest JSON input read, in bytes (256 MiB: far above any store manifest, network or result written here). */
    public static final long MAX_BYTES = 256L << 20;
    /** Deepest nesting of objects and arrays (Edgewise's own files nest fewer than ten levels). */
    public static final int MAX_DEPTH = 100;
    /** Longest string value or name, in characters. */
    public static final int MAX_STRING = 1_000_000;
    /** Longest number, in characters. */
    public static final int MAX_NUMBER = 1000;

    private static final JsonFactory FACTORY = JsonFactory.builder()
            .streamReadConstraints(StreamReadConstraints.builder()
                    .maxNestingDepth(MAX_DEPTH)
                    .maxStringLength(MAX_STRING)
                    .maxNumberLength(MAX_NUMBER)
                    .build())
            .build();

    private JsonInput() {
    }

    /** A JSON factory with the bounds above. */
    public static JsonFactory factory() {
        return FACTORY;
    }

    /** A fresh mapper reading with the bounds above (configure it as needed). */
    public static ObjectMapper mapper() {
        return new ObjectMapper(JsonFactory.builder()
                .streamReadConstraints(FACTORY.streamReadConstraints())
                .build());
    }

    /**
     * Refuses a file larger than {@link #MAX_BYTES}: "{@code what} is N bytes; …". {@code what} names the
     * file as the caller's messages do ({@code network file x.json}).
     */
    public static void checkSize(Path file, String what) {
        long size;
        try {
            size = Files.size(file);
        } catch (IOException e) {
            return; // the read reports it
        }
        if (size > MAX_BYTES) {
            throw new UserError(String.format(Locale.ROOT, "%s is %,d bytes; JSON inputs are limited to %,d bytes (%d MiB)",
                    what, size, MAX_BYTES, MAX_BYTES >> 20));
        }
    }

    /**
     * What is wrong with a JSON text, after its name: "is not valid JSON (line 3, column 7)", or a
     * bound it exceeds ("is nested deeper than 100 levels") — with no location when the parser gave none.
     */
    public static String problem(JsonProcessingException e) {
        if (e instanceof StreamConstraintsException) {
            String m = String.valueOf(e.getOriginalMessage()).toLowerCase(Locale.ROOT);
            if (m.contains("depth")) {
                return "is nested deeper than " + MAX_DEPTH + " levels";
            }
            if (m.contains("number")) {
                return String.format(Locale.ROOT, "holds a number longer than %,d characters", MAX_NUMBER);
            }
            if (m.contains("string") || m.contains("name")) {
                return String.format(Locale.ROOT, "holds a text longer than %,d characters", MAX_STRING);
            }
            return "exceeds a limit of JSON input (" + e.getOriginalMessage() + ")";
        }
        return "is not valid JSON" + at(e.getLocation());
    }

    /** " (line L, column C)", or "" without a location. */
    public static String at(JsonLocation loc) {
        return loc == null || loc.getLineNr() < 1 ? "" : " (line " + loc.getLineNr() + ", column " + loc.getColumnNr() + ")";
    }
}
