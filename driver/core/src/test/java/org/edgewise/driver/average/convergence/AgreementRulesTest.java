package org.edgewise.driver.average.convergence;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.edgewise.driver.average.mcmc.DrawStore;
import org.junit.jupiter.api.Test;

/**
 * The verdict's rules for quantities whose draws agree (issue 20), on constructed chains: four chains
 * of 2,000 draws with an iid normal log score and two quantities — quantity 0 iid Bernoulli(0.5)
 * draws (which meet R̂ and ESS, so that only quantity 1 decides), quantity 1 as each case sets it.
 * The reference is the rules themselves: chains that started on both sides of a value and agree
 * settle it (over-dispersed starts, Gelman &amp; Rubin 1992, "Inference from iterative simulation using
 * multiple sequences", Statistical Science 7, sec. 2; a start within the settle span of the value
 * counts on both sides); a value every chain started on one side of, or at and never left, is a
 * shared trap unless its Rao-Blackwellised probability is below 1e-6 in every chain.
 */
class AgreementRulesTest {
    private static final int CHAINS = 4;
    private static final int DRAWS = 2000;

    /** The chains: quantity 1 of chain c is {@code value[c]} in every draw, and {@code start[c]} at its start. */
    private static List<DrawStore> chains(double[] value, double[] start) {
        SplittableRandom rng = new SplittableRandom(11);
        List<DrawStore> out = new ArrayList<>();
        for (int c = 0; c < CHAINS; c++) {
            DrawStore d = new DrawStore(2, DRAWS, 1, 0);
            d.start(new float[] {1f, (float) start[c]}, null);
            for (int s = 1; s <= DRAWS; s++) {
                double g = Math.sqrt(-2 * Math.log(1 - rng.nextDouble())) * Math.cos(2 * Math.PI * rng.nextDouble());
                d.add(s, new float[] {rng.nextDouble() < 0.5 ? 1f : 0f, (float) value[c]}, g, null);
            }
            out.add(d);
        }
        return out;
    }

    private static MultiChainDiagnostics.Report evaluate(double[] value, double[] start, boolean rb) {
        return MultiChainDiagnostics.evaluate(chains(value, start), 0, MultiChainDiagnostics.rows(q -> "edge q" + q, 2, rb),
                ConvergenceTargets.DEFAULTS);
    }

    private static double[] all(double v) {
        return new double[] {v, v, v, v};
    }

    @Test
    void aValueChainsReachedFromBothSidesIsSettledAndDoesNotBlock() {
        // constant 0 in every draw; two chains started where the edge had weight 0.7 and 0.3 (mirrored starts)
        MultiChainDiagnostics.Report r = evaluate(all(0), new double[] {0, 0.7, 0, 0.3}, true);
        assertEquals(ChainDiagnostics.State.SETTLED, r.quantities()[1].state());
        assertTrue(r.converged(), "settled quantities do not count against convergence");
        assertEquals(1, r.settled());
        assertEquals(1, r.constant());
        assertEquals(0, r.traps());
        // the same from above: constant 0.42, starts 1 and 0
        MultiChainDiagnostics.Report mid = evaluate(all(0.42), new double[] {1, 0, 1, 0}, true);
        assertEquals(ChainDiagnostics.State.SETTLED, mid.quantities()[1].state());
        assertTrue(mid.converged());
    }

    @Test
    void aValueEveryChainStartedAtAndKeptIsASharedTrapUnlessNegligible() {
        // constant 0.42 in every draw, every chain started at 0.42: nothing shows the other side was ever tried
        MultiChainDiagnostics.Report trap = evaluate(all(0.42), all(0.42), true);
        assertEquals(ChainDiagnostics.State.TRAP, trap.quantities()[1].state());
        assertFalse(trap.converged(), "a shared trap blocks convergence");
        assertEquals(1, trap.traps());
        assertEquals("edge q1", trap.worst().get(0).quantity());
        assertEquals(ChainDiagnostics.State.TRAP, trap.worst().get(0).state());
        // every chain started far below (0) and all came to 0.3: none started above, a trap
        MultiChainDiagnostics.Report below = evaluate(all(0.3), all(0), true);
        assertEquals(ChainDiagnostics.State.TRAP, below.quantities()[1].state());
        assertFalse(below.converged());
        // started at 0, now 1e-3: within the settle span of every start, so on both sides — settled
        MultiChainDiagnostics.Report near = evaluate(all(1e-3), all(0), true);
        assertEquals(ChainDiagnostics.State.SETTLED, near.quantities()[1].state());
        assertTrue(near.converged());
        // an indicator (not Rao-Blackwellised) equal to 0 in every draw of chains that all started at 0: a trap,
        // its draws say nothing about how probable the other value is
        MultiChainDiagnostics.Report indicator = evaluate(all(0), all(0), false);
        assertEquals(ChainDiagnostics.State.TRAP, indicator.quantities()[1].state());
        assertFalse(indicator.converged());
    }

    @Test
    void aRaoBlackwellisedValueBelowOneInAMillionInEveryChainIsNegligible() {
        // every chain started where the edge had weight 0.6 and left it for values below 1e-6
        MultiChainDiagnostics.Report low = evaluate(new double[] {3e-9, 2e-7, 0, 5e-10}, all(0.6), true);
        assertEquals(ChainDiagnostics.State.NEGLIGIBLE, low.quantities()[1].state());
        assertTrue(low.converged(), "a negligible quantity does not keep a sharp-data run from converging");
        assertEquals(1, low.negligible());
        // near 1 alike (the other value, absence, is the negligible one)
        MultiChainDiagnostics.Report high = evaluate(all(1), all(1), true);
        assertEquals(ChainDiagnostics.State.NEGLIGIBLE, high.quantities()[1].state());
        assertTrue(high.converged());
        // one chain at 2e-6: not below the bound in every chain
        MultiChainDiagnostics.Report one = evaluate(new double[] {3e-9, 2e-6, 0, 5e-10}, all(0.6), true);
        assertEquals(ChainDiagnostics.State.TRAP, one.quantities()[1].state());
        assertFalse(one.converged());
    }

    @Test
    void withoutKnownStartsAgreeingDrawsKeepTheEarlierRules() {
        MultiChainDiagnostics.Report r = MultiChainDiagnostics.evaluate(chains(all(0.42), all(Double.NaN)), 0,
                MultiChainDiagnostics.rows(q -> "edge q" + q, 2, true), ConvergenceTargets.DEFAULTS);
        assertEquals(ChainDiagnostics.State.CONSTANT, r.quantities()[1].state());
        assertTrue(r.converged());
    }

    @Test
    void everyRaoBlackwellisedEstimateCarriesAtLeastTheOneDrawFloor() {
        // 4 × 2,000 draws: no estimate resolves mass below 1/8,000, however small its draws
        MultiChainDiagnostics.Report r = evaluate(all(1e-19), all(0.5), true);
        assertEquals(1.0 / (CHAINS * DRAWS), r.quantities()[1].mcse(), 1e-12);
        MultiChainDiagnostics.Report zero = evaluate(all(0), all(0.5), true);
        assertEquals(1.0 / (CHAINS * DRAWS), zero.quantities()[1].mcse(), 1e-12);
    }
}
