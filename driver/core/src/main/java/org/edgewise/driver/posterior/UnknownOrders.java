package org.edgewise.driver.posterior;

import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.UnknownOrderSettings;

/**
 * What every posterior over unknown orders holds: the local scores, the request's settings, the
 * order constraints they give (tiers, required edges) and where progress goes.
 */
abstract sealed class UnknownOrders implements StructurePosterior permits ExactSum, OrderChains, PartitionChains {
    final LocalScores ls;
    final UnknownOrderSettings s;
    final OrderConstraints oc;
    final ProgressListener progress;

    UnknownOrders(LocalScores ls, UnknownOrderSettings s, ProgressListener progress) {
        this.ls = ls;
        this.s = s;
        this.oc = s.constraints(ls);
        this.progress = progress;
    }

    @Override
    public final LocalScores scores() {
        return ls;
    }

    @Override
    public final List<List<String>> tiers() {
        return oc.tierNames().isEmpty() ? null : oc.tierNames();
    }
}
