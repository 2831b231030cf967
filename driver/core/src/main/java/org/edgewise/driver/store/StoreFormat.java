package org.edgewise.driver.store;

import org.apache.parquet.schema.MessageType;
import org.apache.parquet.schema.MessageTypeParser;

/** Names, schemas and the version of the score-store format: defined here and nowhere else. */
public final class StoreFormat {
    /** Bumped whenever a reader of the previous version could misread a store. */
    public static final int VERSION = 1;
    public static final String MANIFEST = "manifest.json";
    public static final String SCORES = "scores.parquet";
    public static final String COUNTS = "counts.parquet";

    /** One row per family: its index, child and sorted parents (variable indices), log score. */
    public static final MessageType SCORES_SCHEMA = MessageTypeParser.parseMessageType(
            "message edgewise_family_score {\n"
            + "  required int32 family;\n"
            + "  required int32 child;\n"
            + "  repeated int32 parents;\n"
            + "  required double log_score;\n"
            + "}");

    /** One row per (family, observed parent configuration): N_ijk for every child state k. */
    public static final MessageType COUNTS_SCHEMA = MessageTypeParser.parseMessageType(
            "message edgewise_family_counts {\n"
            + "  required int32 family;\n"
            + "  required int64 config;\n"
            + "  repeated int64 counts;\n"
            + "}");

    private StoreFormat() {
    }
}
