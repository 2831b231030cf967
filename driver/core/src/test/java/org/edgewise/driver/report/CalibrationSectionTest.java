package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.result.TargetPredictions;
import org.junit.jupiter.api.Test;

/** The page of a predict --target result: one dot per non-empty bin where the table puts it, names escaped. */
class CalibrationSectionTest {
    static TargetPredictions.Calibration cal(String state, int... counts) {
        List<TargetPredictions.Bin> bins = new ArrayList<>();
        for (int b = 0; b < counts.length; b++) {
            double mid = (b + 0.5) / counts.length;
            bins.add(new TargetPredictions.Bin(b / (double) counts.length, (b + 1) / (double) counts.length, counts[b],
                    counts[b] == 0 ? null : mid, counts[b] == 0 ? null : Math.min(1, mid + 0.05)));
        }
        return new TargetPredictions.Calibration(state, bins);
    }

    @Test
    void dotsSitAtMeanPredictedAndObservedShare() {
        TargetPredictions.Scores s = new TargetPredictions.Scores(0.5, 0.3, 0.8, "one-vs-rest macro average",
                java.util.Arrays.asList(0.9, null, 0.7),
                List.of(cal("a", 3, 0, 5, 0, 1), cal("<b>", 0, 2, 0, 0, 0), cal("c", 1, 1, 1, 1, 1)));
        TargetPredictions r = new TargetPredictions("y&z", List.of("a", "<b>", "c"), "cases.csv", "truth", null, 10, 9, 1, "order",
                "every DAG consistent with the order", null, "exact", null, "bdeu", 1.0, "uniform", 2, 0, null, null, s, "note", List.of());
        String page = CalibrationSection.page(r, "r.json");
        assertEquals(3, page.split("<svg ", -1).length - 1, "one diagram per table");
        assertEquals(3 + 1 + 5, page.split("<circle ", -1).length - 1, "one dot per non-empty bin");
        // bin 3 of 5 of the first table: mean 0.5, observed 0.55 → (46 + 0.5·300, 312 − 0.55·300)
        assertTrue(page.contains("<circle cx=\"196.0\" cy=\"147.0\""), page);
        assertTrue(page.contains("y&amp;z") && page.contains("&lt;b&gt;") && !page.contains("<b>"), "names escaped");
        assertTrue(page.contains("(per state: a 0.900, &lt;b&gt; undefined, c 0.700)"));
        assertFalse(page.contains("null"));
    }
}
