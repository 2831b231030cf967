package org.edgewise.driver.store;

/**
 * The Parquet parts of a store as recorded in its manifest: file names, how many rows each holds
 * and their SHA-256, so that a reader can tell a damaged or mismatched part from a good one.
 */
public record StoreParts(String scoresFile, long families, String scoresSha256,
                         String countsFile, long countRows, String countsSha256) {
}
