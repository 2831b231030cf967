package org.edgewise.driver.result;

import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.UserError;

/**
 * Reading and writing result JSON; writes go to a temporary sibling and are renamed into place.
 *
 * <p>An edges result ({@link EdgeResult}) is written with {@code "formatVersion": }
 * {@value #EDGES_FORMAT_VERSION} as its first field, and {@link #readEdges} refuses a file with
 * another version or none (e.g. from an older build), naming the file, before reading the rest.
 * Raise the version when a field of the result changes meaning or name, or a required field is
 * added. Version 2: the MCMC effective sample sizes are {@code bulkEffectiveSampleSize},
 * {@code tailEffectiveSampleSize} and {@code effectiveSampleSizeTarget} (version 1 called them
 * {@code ess}, {@code essTail} and {@code essTarget}, the word of BDeu's equivalent sample size).
 */
public final class ResultJson {
    /** The format version of an edges result that this build writes and reads. */
    public static final int EDGES_FORMAT_VERSION = 2;

    public static final ObjectMapper MAPPER = org.edgewise.driver.JsonInput.mapper()
            .enable(SerializationFeature.INDENT_OUTPUT)
            .configure(DeserializationFeature.FAIL_ON_UNKNOWN_PROPERTIES, false)
            .registerModule(new com.fasterxml.jackson.databind.module.SimpleModule("finite-numbers")
                    .addSerializer(Double.class, FiniteOrNull.INSTANCE)
                    .addSerializer(double.class, FiniteOrNull.INSTANCE));

    /**
     * A number that is not finite (NaN, ±∞: e.g. the log of a probability 0) is written as JSON
     * {@code null}, never as the strings {@code "NaN"} or {@code "-Infinity"} that no JSON reader
     * takes for a number.
     */
    private static final class FiniteOrNull extends com.fasterxml.jackson.databind.ser.std.StdSerializer<Double> {
        static final FiniteOrNull INSTANCE = new FiniteOrNull();

        FiniteOrNull() {
            super(Double.class);
        }

        @Override
        public void serialize(Double value, com.fasterxml.jackson.core.JsonGenerator gen,
                              com.fasterxml.jackson.databind.SerializerProvider provider) throws IOException {
            if (value == null || !Double.isFinite(value)) {
                gen.writeNull();
            } else {
                gen.writeNumber(value);
            }
        }
    }

    private ResultJson() {
    }

    /** {@code value} as indented JSON; a {@link JsonResult} with its {@code formatVersion} and {@code kind} first. */
    public static String toJson(Object value) {
        try {
            return MAPPER.writeValueAsString(value instanceof JsonResult r ? stamped(r) : value);
        } catch (IOException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Writes {@code value} as JSON to {@code file} atomically. */
    public static void write(Path file, Object value) {
        writeText(file, toJson(value) + "\n");
    }

    /**
     * Writes {@code value} as JSON to {@code file} atomically; an existing file is replaced only with
     * {@code replace} (and only a regular file), else kept and refused ({@link AtomicWrite#file(Path, boolean, AtomicWrite.Content)}).
     */
    public static void write(Path file, boolean replace, Object value) {
        writeText(file, replace, toJson(value) + "\n");
    }

    /** Writes text to {@code file} atomically; an existing file is replaced only with {@code replace}. */
    public static void writeText(Path file, boolean replace, String text) {
        try {
            AtomicWrite.text(file, replace, text);
        } catch (IOException e) {
            throw new UserError("cannot write " + file + ": " + AtomicWrite.reason(e));
        }
    }

    /** Writes text to {@code file} atomically (temporary sibling, then rename). */
    public static void writeText(Path file, String text) {
        try {
            AtomicWrite.text(file, text);
        } catch (IOException e) {
            throw new UserError("cannot write " + file + ": " + AtomicWrite.reason(e));
        }
    }

    /** The result as a JSON object with {@code formatVersion} and {@code kind} first: the one place they are written. */
    private static ObjectNode stamped(JsonResult r) {
        ObjectNode node = MAPPER.createObjectNode();
        node.put("formatVersion", r.formatVersion());
        node.put("kind", r.kind());
        ObjectNode fields = (ObjectNode) MAPPER.valueToTree(r);
        fields.remove("formatVersion");
        fields.remove("kind");
        node.setAll(fields);
        return node;
    }

    /**
     * The number of variables an edges result names, read by streaming (nothing but that array is
     * kept), so its size can be planned before the whole file is read; -1 when there is no such array
     * at the top level (the full read then says what is wrong).
     */
    public static int variableCount(Path file) {
        if (!Files.isRegularFile(file)) {
            return -1;
        }
        try (com.fasterxml.jackson.core.JsonParser p = MAPPER.getFactory().createParser(file.toFile())) {
            if (p.nextToken() != com.fasterxml.jackson.core.JsonToken.START_OBJECT) {
                return -1;
            }
            while (p.nextToken() == com.fasterxml.jackson.core.JsonToken.FIELD_NAME) {
                String name = p.currentName();
                com.fasterxml.jackson.core.JsonToken t = p.nextToken();
                if ("variables".equals(name) && t == com.fasterxml.jackson.core.JsonToken.START_ARRAY) {
                    int n = 0;
                    while (p.nextToken() != com.fasterxml.jackson.core.JsonToken.END_ARRAY) {
                        p.skipChildren();
                        n++;
                    }
                    return n;
                }
                p.skipChildren();
            }
            return -1;
        } catch (IOException | RuntimeException e) {
            return -1; // the full read names the problem
        }
    }

    public static EdgeResult readEdges(Path file) {
        if (!Files.isRegularFile(file)) {
            throw new UserError("result file " + file + " does not exist");
        }
        org.edgewise.driver.JsonInput.checkSize(file, "result file " + file);
        try {
            JsonNode tree = MAPPER.readTree(file.toFile());
            if (tree == null || tree.get("variables") == null || tree.get("edges") == null) {
                throw new UserError("result file " + file + " is not an edges result (no variables or edges)");
            }
            JsonNode kind = tree.get("kind");
            if (kind != null && !kind.asText().equals("edges")) {
                throw new UserError("result file " + file + " is a " + kind.asText() + " result, not an edges result");
            }
            JsonNode version = tree.get("formatVersion");
            if (version == null || !version.canConvertToInt() || version.asInt() != EDGES_FORMAT_VERSION) {
                throw new UserError("result file " + file + " has " + (version == null ? "no format version"
                        : "format version " + version) + "; this Edgewise reads edges results of format version "
                        + EDGES_FORMAT_VERSION + "; re-run the analysis that wrote it with this Edgewise");
            }
            EdgeResult r = MAPPER.readValue(file.toFile(), EdgeResult.class);
            if (r.variables() == null || r.edges() == null) {
                throw new UserError("result file " + file + " is not an edges result (no variables or edges)");
            }
            return r;
        } catch (com.fasterxml.jackson.databind.exc.MismatchedInputException e) {
            throw new UserError("result file " + file + " is JSON but not an edges result: " + fieldPath(e)
                    + " has the wrong type" + org.edgewise.driver.JsonInput.at(e.getLocation()));
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new UserError("result file " + file + " " + org.edgewise.driver.JsonInput.problem(e));
        } catch (IOException e) {
            throw new UserError("cannot read result file " + file + ": " + e.getMessage());
        }
    }

    /** The {@code kind} a result file declares, or null when it declares none or is not a JSON object (the full read names the problem). */
    public static String kind(Path file) {
        if (!Files.isRegularFile(file)) {
            return null;
        }
        try (com.fasterxml.jackson.core.JsonParser p = MAPPER.getFactory().createParser(file.toFile())) {
            if (p.nextToken() != com.fasterxml.jackson.core.JsonToken.START_OBJECT) {
                return null;
            }
            while (p.nextToken() == com.fasterxml.jackson.core.JsonToken.FIELD_NAME) {
                String name = p.currentName();
                com.fasterxml.jackson.core.JsonToken t = p.nextToken();
                if ("kind".equals(name)) {
                    return t == com.fasterxml.jackson.core.JsonToken.VALUE_STRING ? p.getText() : null;
                }
                p.skipChildren();
            }
            return null;
        } catch (IOException | RuntimeException e) {
            return null;
        }
    }

    /** Reads a {@link TargetPredictions} result, refusing another kind or format version, naming the file. */
    public static TargetPredictions readTargetPredictions(Path file) {
        if (!Files.isRegularFile(file)) {
            throw new UserError("result file " + file + " does not exist");
        }
        org.edgewise.driver.JsonInput.checkSize(file, "result file " + file);
        try {
            JsonNode tree = MAPPER.readTree(file.toFile());
            JsonNode kind = tree == null ? null : tree.get("kind");
            if (kind == null || !kind.asText().equals(TargetPredictions.KIND)) {
                throw new UserError("result file " + file + " is not a " + TargetPredictions.KIND + " result");
            }
            JsonNode version = tree.get("formatVersion");
            if (version == null || !version.canConvertToInt() || version.asInt() != TargetPredictions.FORMAT_VERSION) {
                throw new UserError("result file " + file + " has " + (version == null ? "no format version"
                        : "format version " + version) + "; this Edgewise reads " + TargetPredictions.KIND + " results of format version "
                        + TargetPredictions.FORMAT_VERSION + "; re-run the prediction that wrote it with this Edgewise");
            }
            TargetPredictions r = MAPPER.treeToValue(tree, TargetPredictions.class);
            if (r.target() == null || r.states() == null) {
                throw new UserError("result file " + file + " is not a " + TargetPredictions.KIND + " result (no target or states)");
            }
            return r;
        } catch (com.fasterxml.jackson.databind.exc.MismatchedInputException e) {
            throw new UserError("result file " + file + " is JSON but not a " + TargetPredictions.KIND + " result: " + fieldPath(e)
                    + " has the wrong type" + org.edgewise.driver.JsonInput.at(e.getLocation()));
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new UserError("result file " + file + " " + org.edgewise.driver.JsonInput.problem(e));
        } catch (IOException e) {
            throw new UserError("cannot read result file " + file + ": " + e.getMessage());
        }
    }

    /** The JSON path of the field a mapping failed at, e.g. {@code edges[0].posterior}. */
    static String fieldPath(com.fasterxml.jackson.databind.JsonMappingException e) {
        StringBuilder sb = new StringBuilder();
        for (com.fasterxml.jackson.databind.JsonMappingException.Reference r : e.getPath()) {
            if (r.getFieldName() != null) {
                sb.append(sb.length() == 0 ? "" : ".").append(r.getFieldName());
            } else if (r.getIndex() >= 0) {
                sb.append('[').append(r.getIndex()).append(']');
            }
        }
        return sb.length() == 0 ? "the top level" : sb.toString();
    }
}
