package org.edgewise.driver.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.junit.jupiter.api.Test;

/**
 * The MCSE target applied to what a sampled result reports ({@link ReportedMcse}): a posterior
 * above the target turns a converged verdict into not converged and is named in the worst list;
 * and a structure-modular (partition MCMC) run that says converged meets it on every edge.
 */
class ReportedMcseTest {
    static EdgeResult result(double mcseAB, Double target, boolean converged) {
        EdgeResult.Diagnostics d = new EdgeResult.Diagnostics(4, 1000, 1000, 1, 0.5, 1.001, 900, converged, null, 1, 1.01, 400.0,
                target, 0.004, 800.0, "converged", 0, 0, 0, 0.005, List.of(), 500, 0.1, 1, 0.1, 0.1, null, null);
        return new EdgeResult("mcmc", List.of("a", "b"), null, null, "order-modular", null, null, null,
                List.of(new EdgeResult.Edge("a", "b", 0.5, mcseAB, 1.001), new EdgeResult.Edge("b", "a", 0.02, 0.002, 1.0)),
                null, null, d, List.of(new EdgeResult.Feature("ancestor", "a", "b", 0.5, 0.003)), null, "structure-modular", null);
    }

    @Test
    void aReportedPosteriorAboveTheTargetIsNotConvergedAndNamed() {
        EdgeResult r = ReportedMcse.check(result(0.0123, 0.01, true));
        assertFalse(r.diagnostics().converged());
        assertEquals(List.of(new EdgeResult.Worst("edge a -> b", 1.001, null, 0.0123, null, "varies")), r.diagnostics().worst());
        assertEquals(0.0123, r.diagnostics().mcse(), 0.0);
        EdgeResult ok = ReportedMcse.check(result(0.0099, 0.01, true));
        assertTrue(ok.diagnostics().converged());
        assertEquals(0.0099, ok.diagnostics().mcse(), 0.0);
        // without a target (a result from before it existed) nothing changes
        EdgeResult old = result(0.0123, null, true);
        assertSame(old, ReportedMcse.check(old));
    }

    @Test
    void structureModularMcmcMeetsTheTargetOnEveryReportedPosterior() {
        Network net = RandomNetwork.generate("v", 5, 2, 2, 5, 1.5, 0, 61);
        ScoreStore s = InMemoryTally.tally(RandomNetwork.variables(net), new ForwardSampler(net).sample(300, 62), 2,
                FamilyScore.withDefaults());
        LocalScores ls = LocalScores.build(s, ScoringOptions.asStored());
        double target = 0.007;
        UnknownOrderSettings st = new UnknownOrderSettings(UnknownOrderSettings.Method.MCMC, List.of(), 5, 4, null, null, 1000,
                null, null, 120.0, false, false, 10_000, 3, DagPrior.STRUCTURE_MODULAR, false, target);
        // partition MCMC: the reported posteriors are the chains' own Rao-Blackwellised estimates, held to the target
        EdgeResult r = EdgeAnalysis.edges(ls, null, st, ProgressListener.NONE);
        EdgeResult.Diagnostics d = r.diagnostics();
        assertEquals("structure-modular", r.dagPrior());
        assertTrue(d.converged(), d.worst().toString());
        assertEquals("converged", d.stopReason());
        assertEquals(target, d.mcseTarget(), 0.0);
        for (EdgeResult.Edge e : r.edges()) {
            assertTrue(e.mcse() <= target, e.toString());
        }
    }
}
