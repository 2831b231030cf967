package org.edgewise.job.input;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;

/**
 * A numeric column whose values write one number several ways ({@code 0}, {@code 0.0}, {@code -0};
 * {@code 1}, {@code 1.0}, {@code 01}) keeps each spelling as its own state: the text is the state,
 * and the tally cannot know whether the writer meant one number or codes that happen to be digits
 * ({@code 007} and {@code 7}). It is not refused — a file of codes would have no way through — but
 * said in one line, so that a query naming {@code x=0} is not mistaken for all rows equal to zero.
 */
public final class SameNumber {
    private SameNumber() {
    }

    /**
     * One line naming the first column (in column order) with a number written several ways, its
     * spellings, and how many other columns do the same; null when none does. Discretised columns
     * ({@code binned}) are binned by value and never affected.
     */
    public static String warning(List<String> names, ColumnStats stats, Set<String> binned) {
        String first = null;
        List<String> spellings = null;
        int groups = 0;
        List<String> others = new ArrayList<>();
        for (int v = 0; v < names.size(); v++) {
            if (binned.contains(names.get(v)) || !stats.numeric(v)) {
                continue;
            }
            // + 0.0 makes -0.0 and 0.0 one key
            Map<Double, List<String>> byValue = new TreeMap<>();
            for (String x : stats.distinct(v)) {
                byValue.computeIfAbsent(ColumnStats.parse(x) + 0.0, k -> new ArrayList<>()).add(x);
            }
            Map<Double, List<String>> several = new LinkedHashMap<>();
            byValue.forEach((k, xs) -> {
                if (xs.size() > 1) {
                    xs.sort(null);
                    several.put(k, xs);
                }
            });
            if (several.isEmpty()) {
                continue;
            }
            if (first == null) {
                first = names.get(v);
                spellings = several.values().iterator().next();
                groups = several.size();
            } else {
                others.add("'" + names.get(v) + "'");
            }
        }
        if (first == null) {
            return null;
        }
        return "warning: column '" + first + "' writes one number " + spellings.size() + " ways (" + String.join(", ", spellings)
                + (groups > 1 ? "; " + (groups - 1) + " more " + (groups == 2 ? "number" : "numbers") + " likewise" : "")
                + "), kept as " + spellings.size() + " states since the text is the state; a query must name each as written"
                + (others.isEmpty() ? "" : " (also in column" + (others.size() == 1 ? " " : "s ") + String.join(", ", others) + ")")
                + "; write each number one way for one state";
    }
}
