package org.edgewise.driver.store;

import java.util.List;

/**
 * Where the store's counts came from: the input paths and format, the rows counted, the rows
 * dropped for missing values, the missing-value policy, and a fingerprint of the encoded data
 * (an order- and partition-independent 64-bit hash of every encoded row, hex) so two stores can
 * be checked to come from the same data.
 */
public record InputInfo(List<String> paths, String format, long rows, long droppedRows,
                        String missingPolicy, String fingerprint) {
    public InputInfo {
        paths = List.copyOf(paths);
    }
}
