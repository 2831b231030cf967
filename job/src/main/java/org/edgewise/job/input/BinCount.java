package org.edgewise.job.input;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.store.Variable;

/**
 * Columns that {@code --discretize} cut into fewer bins than asked: equal values always fall in one
 * bin, so a value repeated across a cut point leaves that cut point out (the store keeps the bins
 * obtained). One column left in a single bin is refused ({@link VariableStates#oneBin}); two or more
 * but fewer than asked are said in one warning line per column, naming the bins obtained.
 */
public final class BinCount {
    /** Most bin labels a warning lists. */
    static final int LISTED = 8;

    private BinCount() {
    }

    /** One warning per discretised variable of {@code variables} with fewer bins than {@code asked} for it. */
    public static List<String> warnings(List<Variable> variables, Map<String, Integer> asked) {
        List<String> out = new ArrayList<>();
        for (Variable v : variables) {
            Integer k = asked.get(v.name());
            if (k == null || v.binEdges() == null) {
                continue;
            }
            int bins = v.binEdges().size() + 1;
            if (bins < k) {
                List<String> labels = v.states().subList(0, bins);
                String listed = String.join(", ", labels.subList(0, Math.min(LISTED, bins)))
                        + (bins > LISTED ? ", … (" + (bins - LISTED) + " more)" : "");
                out.add("warning: --discretize " + v.name() + "=" + k + " cut column '" + v.name() + "' into " + bins
                        + " bins, not " + k + ": " + listed + "; equal values share a bin, so values repeated across a "
                        + "cut point leave fewer bins");
            }
        }
        return out;
    }
}
