package org.edgewise.driver.store;

import com.fasterxml.jackson.annotation.JsonInclude;
import java.util.List;

/**
 * Where the store's counts came from: the input paths and format, the rows counted, the rows
 * dropped for missing values, the missing-value policy, a fingerprint of the encoded data
 * (an order- and partition-independent 64-bit hash of every encoded row, hex) so two stores can
 * be checked to come from the same data, and the weight column when each input line stood for
 * that many rows (a table of counts; absent otherwise). With a weight column, {@code rows},
 * {@code droppedRows} and the fingerprint are those of the table expanded to one row per unit.
 */
public record InputInfo(List<String> paths, String format, long rows, long droppedRows,
                        String missingPolicy, String fingerprint,
                        @JsonInclude(JsonInclude.Include.NON_NULL) String weight) {
    public InputInfo {
        paths = List.copyOf(paths);
    }

    /** An input of one row per line (no weight column). */
    public InputInfo(List<String> paths, String format, long rows, long droppedRows,
                     String missingPolicy, String fingerprint) {
        this(paths, format, rows, droppedRows, missingPolicy, fingerprint, null);
    }
}
