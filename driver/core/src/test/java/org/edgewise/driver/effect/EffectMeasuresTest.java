package org.edgewise.driver.effect;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.analysis.EffectAnalysis;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * Effect measures, raw frequencies and the case-control design on a classic case-control table:
 * the Ille-et-Vilaine study of oesophageal cancer (Tuyns, Péquignot &amp; Jensen 1977), as tabulated
 * with alcohol dichotomised at 80 g/day in Breslow &amp; Day (1980), Statistical Methods in Cancer
 * Research, vol. I (IARC Scientific Publications 32), ch. 4 (chapter and table number from memory;
 * the counts and the crude odds ratio 5.64 are the textbook's well-known figures):
 * <pre>
 *              ≥ 80 g/day   &lt; 80 g/day   total
 *   cases          96          104         200
 *   controls      109          666         775
 * </pre>
 * Crude odds ratio (ad)/(bc) = 96·666 / (104·109) = 63 936 / 11 336 = 5.640.
 */
class EffectMeasuresTest {
    static final int CASES_HEAVY = 96;
    static final int CASES_LIGHT = 104;
    static final int CONTROLS_HEAVY = 109;
    static final int CONTROLS_LIGHT = 666;
    /** (ad)/(bc) by hand from the four counts above. */
    static final double CRUDE_OR = 63_936.0 / 11_336.0;
    static final EffectEngine.Settings ENGINE = new EffectEngine.Settings(2000, 21L, 1_000_000L);

    /** alcohol (light, heavy), status (control, case): one row per subject. */
    static LocalScores esoph() {
        List<Variable> vars = List.of(new Variable("alcohol", List.of("light", "heavy")),
                new Variable("status", List.of("control", "case")));
        List<int[]> rows = new ArrayList<>();
        add(rows, CASES_HEAVY, 1, 1);
        add(rows, CASES_LIGHT, 0, 1);
        add(rows, CONTROLS_HEAVY, 1, 0);
        add(rows, CONTROLS_LIGHT, 0, 0);
        ScoreStore s = InMemoryTally.tally(vars, rows.toArray(int[][]::new), 1, FamilyScore.withDefaults());
        return LocalScores.build(s, ScoringOptions.asStored());
    }

    static void add(List<int[]> rows, int count, int... row) {
        for (int i = 0; i < count; i++) {
            rows.add(row.clone());
        }
    }

    static EffectResult run(LocalScores ls, String versus, EffectAnalysis.CaseControl cc, String measure) {
        return EffectAnalysis.run(new EffectAnalysis.Request(ls, new int[] {0, 1}, null,
                List.of(new EffectAnalysis.Question("alcohol=heavy", "status=case", null, versus, "")), ENGINE, cc, measure, null),
                ProgressListener.NONE).get(0);
    }

    static EffectAnalysis.CaseControl caseControl(String prevalence) {
        return new EffectAnalysis.CaseControl("status", prevalence, "--outcome", "--prevalence");
    }

    static void contains(EffectResult.Measure m) {
        assertTrue(m.interval().lower() <= m.estimate() && m.estimate() <= m.interval().upper(), m.toString());
    }

    @Test
    void rawFrequenciesAreTheTablesAndTheOddsRatioCoversTheCrudeOne() {
        EffectResult r = run(esoph(), "alcohol=light", null, null);
        EffectResult.Observed o = r.observed();
        // the table's rows: 96 cases among 205 heavy drinkers, 104 among 770 light ones
        assertEquals(96, o.events());
        assertEquals(205, o.rows());
        assertEquals(104, o.versusEvents());
        assertEquals(770, o.versusRows());
        assertEquals(96.0 / 205, o.probability(), 1e-15);
        assertEquals(104.0 / 770, o.versusProbability(), 1e-15);
        assertEquals(CRUDE_OR, o.oddsRatio(), 1e-12);
        assertEquals("status <- alcohol", o.family());
        assertTrue(o.label().startsWith("raw frequencies from the store's counts"), o.label());
        assertTrue(r.observational().label().startsWith("the model's conditional"), r.observational().label());
        // the model's odds ratio (BDeu, ESS 1: α = 1/4 per cell shrinks it a little) beside the crude one
        EffectResult.Measure or = r.oddsRatio();
        assertEquals("model", or.estimateOf());
        assertTrue(or.interval().lower() <= CRUDE_OR && CRUDE_OR <= or.interval().upper(), or.toString());
        assertEquals(CRUDE_OR, or.estimate(), 0.02 * CRUDE_OR);
        for (EffectResult.Measure m : List.of(r.riskDifference(), r.riskRatio(), or)) {
            contains(m);
            assertEquals(0.95, m.interval().level());
        }
        assertEquals(r.difference(), r.riskDifference().estimate(), 1e-15);
        assertEquals(r.ratio(), r.riskRatio().estimate(), 1e-12);
        assertEquals("riskDifference", r.leadingMeasure());
        assertNull(r.design());
    }

    @Test
    void caseControlWithoutPrevalenceReportsTheOddsRatioOnly() {
        LocalScores ls = esoph();
        EffectResult plain = run(ls, "alcohol=light", null, null);
        EffectResult r = run(ls, "alcohol=light", caseControl(null), null);
        assertNull(r.probability());
        assertNull(r.versus().probability());
        assertNull(r.difference());
        assertNull(r.riskDifference());
        assertNull(r.riskRatio());
        assertNull(r.observational().probability());
        assertEquals(plain.oddsRatio(), r.oddsRatio()); // sampling on the outcome leaves the odds ratio as it is
        assertEquals("oddsRatio", r.leadingMeasure());
        assertEquals(r.oddsRatio().interval(), r.interval());
        assertEquals("case-control sample drawn on status: only the odds ratio is reported for effects on status, because risks, "
                + "risk differences and risk ratios are not estimable when the sample was drawn on the outcome (its share of "
                + "cases was chosen by design), while sampling on the outcome leaves the odds ratio unchanged", r.design().note());
        assertEquals(200.0 / 975, r.design().sampleShare(), 1e-15);
        assertTrue(r.assumptions().get(1).startsWith("selection on the outcome only"), r.assumptions().toString());
        // the raw frequencies stay, labelled as shares in the sample
        assertEquals(96.0 / 205, r.observed().probability(), 1e-15);
        assertTrue(r.observed().label().endsWith("shares in the case-control sample, not risks in the population"));
    }

    @Test
    void prevalenceReweightsCasesAndControlsAsByHand() {
        LocalScores ls = esoph();
        double pi = 0.01; // a population prevalence chosen for the arithmetic
        double share = 200.0 / 975;
        double wCase = pi / share;
        double wControl = (1 - pi) / (1 - share);
        // by hand: each stratum's cases weighted by π/π̂, its controls by (1 − π)/(1 − π̂)
        double heavy = wCase * CASES_HEAVY / (wCase * CASES_HEAVY + wControl * CONTROLS_HEAVY);
        double light = wCase * CASES_LIGHT / (wCase * CASES_LIGHT + wControl * CONTROLS_LIGHT);
        for (String prev : List.of("status=case:0.01", "status=0.01", "status=control:0.99")) {
            EffectResult r = run(ls, "alcohol=light", caseControl(prev), "risk-difference");
            assertEquals(heavy, r.observed().reweighted(), 1e-12, prev);
            assertEquals(light, r.observed().reweightedVersus(), 1e-12, prev);
            assertEquals(pi, r.design().prevalence(), 1e-12, prev);
            // the model's re-weighted risks against the hand computation from the counts (α = 1/4 per cell)
            assertEquals(heavy, r.probability(), 0.02 * heavy, prev);
            assertEquals(light, r.versus().probability(), 0.02 * light, prev);
            EffectResult.Measure rd = r.riskDifference();
            assertTrue(rd.interval().lower() <= heavy - light && heavy - light <= rd.interval().upper(), rd.toString());
            EffectResult.Measure rr = r.riskRatio();
            assertTrue(rr.interval().lower() <= heavy / light && heavy / light <= rr.interval().upper(), rr.toString());
            for (EffectResult.Measure m : List.of(rd, rr, r.oddsRatio())) {
                contains(m);
            }
            assertEquals(run(ls, "alcohol=light", null, null).oddsRatio().estimate(), r.oddsRatio().estimate(), 1e-9);
            assertEquals("riskDifference", r.leadingMeasure());
        }
    }

    @Test
    void refusalsWordForWord() {
        LocalScores ls = esoph();
        assertEquals("--outcome: unknown variable 'smoking' (variables: alcohol, status)", assertThrows(UserError.class,
                () -> run(ls, "alcohol=light", new EffectAnalysis.CaseControl("smoking", null, "--outcome", "--prevalence"), null))
                .getMessage());
        assertEquals("--prevalence: the prevalence must lie strictly between 0 and 1, got 1.5",
                assertThrows(UserError.class, () -> run(ls, "alcohol=light", caseControl("status=case:1.5"), null)).getMessage());
        assertEquals("--prevalence: the prevalence must lie strictly between 0 and 1, got 0",
                assertThrows(UserError.class, () -> run(ls, "alcohol=light", caseControl("status=0"), null)).getMessage());
        assertEquals("--prevalence names 'alcohol', but the outcome is 'status'",
                assertThrows(UserError.class, () -> run(ls, "alcohol=light", caseControl("alcohol=0.1"), null)).getMessage());
        assertEquals("the risk of status is not estimable from a case-control sample drawn on status: give its population "
                        + "prevalence, or a reference intervention for an odds ratio",
                assertThrows(UserError.class, () -> run(ls, null, caseControl(null), null)).getMessage());
    }

    @Test
    void drawsPiledAtNoEffectGiveTheEffectGivenThatThereIsOne() {
        // invented, for the arithmetic: 990 of 1000 draws without a path, 10 with p = 0.6 + i/100, p0 = 0.3
        int k = 1000;
        PairDraws d = new PairDraws(new double[k], new double[k], new boolean[k]);
        for (int i = 0; i < k; i++) {
            d.noPath()[i] = i >= 10;
            d.probability()[i] = i < 10 ? 0.6 + i / 100.0 : 0.4;
            d.versus()[i] = i < 10 ? 0.3 : 0.4;
        }
        EffectMeasures.Measure rd = EffectMeasures.of(EffectMeasures.Kind.RISK_DIFFERENCE, 0.4032, 0.4, d, 1, 0.95);
        assertEquals(0.99, rd.noEffectProbability(), 1e-15);
        assertEquals("draws with an effect", rd.intervalOf());
        assertEquals(0.0032, rd.overallEstimate(), 1e-15);
        // the draws with a path: 0.30, 0.31, …, 0.39; median 0.345; type-7 quantiles 0.30225 and 0.38775
        assertEquals(0.345, rd.estimate(), 1e-12);
        assertEquals(0.30225, rd.lower(), 1e-12);
        assertEquals(0.38775, rd.upper(), 1e-12);
        EffectMeasures.Measure or = EffectMeasures.of(EffectMeasures.Kind.ODDS_RATIO, 0.4032, 0.4, d, 1, 0.95);
        assertTrue(or.lower() <= or.estimate() && or.estimate() <= or.upper() && or.lower() > 1, or.toString());
        // below the pile-up threshold the interval is of all draws and contains the model's estimate
        for (int i = 0; i < 100; i++) {
            d.noPath()[i] = false;
            d.probability()[i] = 0.6;
            d.versus()[i] = 0.3;
        }
        EffectMeasures.Measure all = EffectMeasures.of(EffectMeasures.Kind.RISK_DIFFERENCE, 0.43, 0.4, d, 1, 0.95);
        assertNull(all.noEffectProbability());
        assertEquals("all draws", all.intervalOf());
        assertTrue(all.lower() <= all.estimate() && all.estimate() <= all.upper(), all.toString());
        assertNotNull(all.estimateOf());
    }

    @Test
    void rawFrequencyWithinAStratumAndNotAvailableWhenNoFamilyHoldsTheVariables() {
        // invented, for the arithmetic: x, y, z binary; rows (x, y, z) with these counts
        List<Variable> vars = List.of(new Variable("x", List.of("0", "1")), new Variable("y", List.of("0", "1")),
                new Variable("z", List.of("0", "1")));
        List<int[]> rows = new ArrayList<>();
        add(rows, 30, 1, 1, 0);
        add(rows, 10, 1, 0, 0);
        add(rows, 5, 0, 1, 0);
        add(rows, 15, 0, 0, 0);
        add(rows, 8, 1, 1, 1);
        add(rows, 12, 1, 0, 1);
        add(rows, 2, 0, 1, 1);
        add(rows, 18, 0, 0, 1);
        int[][] t = rows.toArray(int[][]::new);
        LocalScores d2 = LocalScores.build(InMemoryTally.tally(vars, t, 2, FamilyScore.withDefaults()), ScoringOptions.asStored());
        EffectResult r = EffectAnalysis.run(new EffectAnalysis.Request(d2, new int[] {2, 0, 1}, null,
                List.of(new EffectAnalysis.Question("x=1", "y=1", "z=0", "x=0", "")), ENGINE), ProgressListener.NONE).get(0);
        // within z = 0: 30 of 40 with x = 1, 5 of 20 with x = 0
        assertEquals(30, r.observed().events());
        assertEquals(40, r.observed().rows());
        assertEquals(0.75, r.observed().probability(), 1e-15);
        assertEquals(0.25, r.observed().versusProbability(), 1e-15);
        assertTrue(r.observed().label().endsWith("within the given stratum"), r.observed().label());
        LocalScores d1 = LocalScores.build(InMemoryTally.tally(vars, t, 1, FamilyScore.withDefaults()), ScoringOptions.asStored());
        EffectResult n = EffectAnalysis.run(new EffectAnalysis.Request(d1, new int[] {2, 0, 1}, null,
                List.of(new EffectAnalysis.Question("x=1", "y=1", "z=0", "x=0", "")), ENGINE), ProgressListener.NONE).get(0);
        assertNull(n.observed().probability());
        assertEquals("not available from the stored counts: no stored family contains x, y, z together (a larger maximum "
                + "number of parents would hold it)", n.observed().label());
        // without the stratum, the family y <- x serves: (30 + 8) of 60 and (5 + 2) of 40
        EffectResult m = EffectAnalysis.run(new EffectAnalysis.Request(d1, new int[] {2, 0, 1}, null,
                List.of(new EffectAnalysis.Question("x=1", "y=1", null, "x=0", "")), ENGINE), ProgressListener.NONE).get(0);
        assertEquals(38.0 / 60, m.observed().probability(), 1e-15);
        assertEquals(7.0 / 40, m.observed().versusProbability(), 1e-15);
    }
}
