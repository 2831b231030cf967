package org.edgewise.driver.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.ordermcmc.OrderMcmc;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.ResultJson;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.junit.jupiter.api.Test;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.average.mcmc.McmcSettings;

/** What the result JSON says about tempered chains and the planned memory. */
class TemperingDiagnosticsTest {
    private static LocalScores store() {
        Network net = RandomNetwork.generate("v", 7, 2, 2, 7, 1.5, 0, 5);
        return LocalScores.build(InMemoryTally.tally(RandomNetwork.variables(net), new ForwardSampler(net).sample(300, 6), 2,
                FamilyScore.withDefaults()), ScoringOptions.asStored());
    }

    @Test
    void temperedRunsNameTheirLadderAndEveryRunItsPlannedMemory() throws Exception {
        LocalScores ls = store();
        McmcSettings st = McmcSettings.defaults(2).withSteps(4000, 1000).withChains(4, 200);
        McmcResult tempered = OrderMcmc.run(ls, OrderConstraints.none(7), st.withTempering(3, 0.2), null);
        EdgeResult.Tempering t = ChainReport.tempering(tempered);
        assertEquals(3, t.rungs());
        assertEquals(0.2, t.betaMin(), 0.0);
        assertEquals(2, t.swapAcceptance().size());
        for (Double a : t.swapAcceptance()) {
            assertTrue(a > 0 && a <= 1, "swap acceptance " + a);
        }
        JsonNode json = ResultJson.MAPPER.readTree(ResultJson.toJson(t));
        assertEquals(3, json.get("rungs").asInt());
        assertEquals(2, json.get("swapAcceptance").size());
        // 7 variables at the default rule: round(4·√(7/200)) = round(0.75) = 1 rung, so no tempering block
        McmcResult plain = OrderMcmc.run(ls, OrderConstraints.none(7), st, null);
        assertNull(ChainReport.tempering(plain));
        assertEquals(1, plain.memory().rungs());
        assertEquals(0, plain.swapAcceptance().length);
        // the planned bytes: tables 7 × 8·2^6 = 3,584; index 4·7²; 4 chains × (84·7 state + 2·200 draws × (4·42 + 8·7 + 96))
        assertEquals(3584 + 4 * 49 + 4 * (84 * 7 + 400 * (4 * 42 + 56 + 96)), plain.memory().totalBytes());
    }
}
