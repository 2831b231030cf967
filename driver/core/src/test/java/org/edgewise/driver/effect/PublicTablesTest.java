package org.edgewise.driver.effect;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.analysis.EffectAnalysis;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.result.EffectResult;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * Effects on two public tables typed in from R's {@code datasets} package, with their natural tiers,
 * against the adjustment formula computed by hand from the counts (Pearl 2000, Causality, §3.3:
 * P(y | do(x)) = Σ_z P(y | x, z) P(z) for a set z that blocks every back-door path; with tiers, the
 * variables of earlier tiers are such a set, and for a variable of the first tier the set is empty,
 * so P(y | do(x)) = P(y | x)). The model averages over every DAG the tiers admit with posterior-mean
 * parameters, so it meets the hand figure within its credible interval, not to the digit. Also: the
 * split over "no directed path" / "a path" sums to 1 and its parts add up to the association.
 */
public class PublicTablesTest {
    static final EffectEngine.Settings ENGINE = new EffectEngine.Settings(1000, 17L, 1_000_000L);

    /**
     * UCBAdmissions (R datasets; Bickel, Hammel &amp; O'Connell 1975, Science 187:398–404): graduate
     * admissions at Berkeley, 1973, the six largest departments. {admitted, rejected} per
     * department A–F, men then women.
     */
    public static final int[][][] UCB = {
        {{512, 313}, {89, 19}}, {{353, 207}, {17, 8}}, {{120, 205}, {202, 391}},
        {{138, 279}, {131, 244}}, {{53, 138}, {94, 299}}, {{22, 351}, {24, 317}}};

    static LocalScores ucb() {
        return LocalScores.build(ucbStore(), ScoringOptions.asStored());
    }

    /** The UCBAdmissions table as a store (d = 2, BDeu ESS 1): Gender, Dept, Admit, one row per applicant. */
    public static ScoreStore ucbStore() {
        List<Variable> vars = List.of(new Variable("Gender", List.of("Male", "Female")),
                new Variable("Dept", List.of("A", "B", "C", "D", "E", "F")),
                new Variable("Admit", List.of("Admitted", "Rejected")));
        List<int[]> rows = new ArrayList<>();
        for (int d = 0; d < 6; d++) {
            for (int g = 0; g < 2; g++) {
                for (int a = 0; a < 2; a++) {
                    EffectMeasuresTest.add(rows, UCB[d][g][a], g, d, a);
                }
            }
        }
        return InMemoryTally.tally(vars, rows.toArray(int[][]::new), 2, FamilyScore.withDefaults());
    }

    /**
     * Titanic (R datasets; Dawson 1995, Journal of Statistics Education 3(3)): the 2201 people aboard,
     * by class, sex, age and survival. [survived no/yes][age child/adult][sex male/female][class 1st, 2nd, 3rd, Crew].
     */
    public static final int[][][][] TITANIC = {
        {{{0, 0, 35, 0}, {0, 0, 17, 0}}, {{118, 154, 387, 670}, {4, 13, 89, 3}}},
        {{{5, 11, 13, 0}, {1, 13, 14, 0}}, {{57, 14, 75, 192}, {140, 80, 76, 20}}}};

    static LocalScores titanic() {
        return LocalScores.build(titanicStore(), ScoringOptions.asStored());
    }

    /** The Titanic table as a store (d = 3, BDeu ESS 1): Class, Sex, Age, Survived, one row per person aboard. */
    public static ScoreStore titanicStore() {
        List<Variable> vars = List.of(new Variable("Class", List.of("1st", "2nd", "3rd", "Crew")),
                new Variable("Sex", List.of("Male", "Female")), new Variable("Age", List.of("Child", "Adult")),
                new Variable("Survived", List.of("No", "Yes")));
        List<int[]> rows = new ArrayList<>();
        for (int s = 0; s < 2; s++) {
            for (int a = 0; a < 2; a++) {
                for (int x = 0; x < 2; x++) {
                    for (int c = 0; c < 4; c++) {
                        EffectMeasuresTest.add(rows, TITANIC[s][a][x][c], c, x, a, s);
                    }
                }
            }
        }
        return InMemoryTally.tally(vars, rows.toArray(int[][]::new), 3, FamilyScore.withDefaults());
    }

    /**
     * esoph (R datasets; Breslow &amp; Day 1980, Statistical Methods in Cancer Research, vol. I, IARC
     * Scientific Publications 32, appendix I; the Ille-et-Vilaine case-control study of oesophageal
     * cancer, Tuyns, Péquignot &amp; Jensen 1977): the 88 cells R lists, each {age group, alcohol group,
     * tobacco group, cases, controls}, with R's labels shortened ("0-39g/day" → "0-39", "0-9g/day" →
     * "0-9"); cells R leaves out have no subjects. Margins checked in {@link #esophMargins}: 200 cases,
     * 775 controls, and 96 cases / 109 controls at 80 g/day or more (Breslow &amp; Day's dichotomised
     * table, {@code EffectMeasuresTest}).
     */
    static final String[] AGE = {"25-34", "35-44", "45-54", "55-64", "65-74", "75+"};
    static final String[] ALCOHOL = {"0-39", "40-79", "80-119", "120+"};
    static final String[] TOBACCO = {"0-9", "10-19", "20-29", "30+"};
    public static final int[][] ESOPH = {
        {0, 0, 0, 0, 40}, {0, 0, 1, 0, 10}, {0, 0, 2, 0, 6}, {0, 0, 3, 0, 5}, {0, 1, 0, 0, 27}, {0, 1, 1, 0, 7},
        {0, 1, 2, 0, 4}, {0, 1, 3, 0, 7}, {0, 2, 0, 0, 2}, {0, 2, 1, 0, 1}, {0, 2, 3, 0, 2}, {0, 3, 0, 0, 1},
        {0, 3, 1, 1, 0}, {0, 3, 2, 0, 1}, {0, 3, 3, 0, 2},
        {1, 0, 0, 0, 60}, {1, 0, 1, 1, 13}, {1, 0, 2, 0, 7}, {1, 0, 3, 0, 8}, {1, 1, 0, 0, 35}, {1, 1, 1, 3, 20},
        {1, 1, 2, 1, 13}, {1, 1, 3, 0, 8}, {1, 2, 0, 0, 11}, {1, 2, 1, 0, 6}, {1, 2, 2, 0, 2}, {1, 2, 3, 0, 1},
        {1, 3, 0, 2, 1}, {1, 3, 1, 0, 3}, {1, 3, 2, 2, 2},
        {2, 0, 0, 1, 45}, {2, 0, 1, 0, 18}, {2, 0, 2, 0, 10}, {2, 0, 3, 0, 4}, {2, 1, 0, 6, 32}, {2, 1, 1, 4, 17},
        {2, 1, 2, 5, 10}, {2, 1, 3, 5, 2}, {2, 2, 0, 3, 13}, {2, 2, 1, 6, 8}, {2, 2, 2, 1, 4}, {2, 2, 3, 2, 2},
        {2, 3, 0, 4, 0}, {2, 3, 1, 3, 1}, {2, 3, 2, 2, 1}, {2, 3, 3, 4, 0},
        {3, 0, 0, 2, 47}, {3, 0, 1, 3, 19}, {3, 0, 2, 3, 9}, {3, 0, 3, 4, 2}, {3, 1, 0, 9, 31}, {3, 1, 1, 6, 15},
        {3, 1, 2, 4, 13}, {3, 1, 3, 3, 3}, {3, 2, 0, 9, 9}, {3, 2, 1, 8, 7}, {3, 2, 2, 3, 3}, {3, 2, 3, 4, 0},
        {3, 3, 0, 5, 5}, {3, 3, 1, 6, 1}, {3, 3, 2, 2, 1}, {3, 3, 3, 5, 1},
        {4, 0, 0, 5, 43}, {4, 0, 1, 4, 10}, {4, 0, 2, 2, 5}, {4, 0, 3, 0, 2}, {4, 1, 0, 17, 17}, {4, 1, 1, 3, 7},
        {4, 1, 2, 5, 4}, {4, 2, 0, 6, 7}, {4, 2, 1, 4, 8}, {4, 2, 2, 2, 1}, {4, 2, 3, 1, 0}, {4, 3, 0, 3, 1},
        {4, 3, 1, 1, 1}, {4, 3, 2, 1, 0}, {4, 3, 3, 1, 0},
        {5, 0, 0, 1, 17}, {5, 0, 1, 2, 4}, {5, 0, 3, 1, 2}, {5, 1, 0, 2, 3}, {5, 1, 1, 1, 2}, {5, 1, 2, 0, 3},
        {5, 1, 3, 1, 0}, {5, 2, 0, 1, 0}, {5, 2, 1, 1, 0}, {5, 3, 0, 2, 0}, {5, 3, 1, 1, 0}};

    /** The esoph table as a store (d = 3, BDeu ESS 1): agegp, alcgp, tobgp, status (control, case), one row per subject. */
    public static ScoreStore esophStore() {
        List<Variable> vars = List.of(new Variable("agegp", List.of(AGE)), new Variable("alcgp", List.of(ALCOHOL)),
                new Variable("tobgp", List.of(TOBACCO)), new Variable("status", List.of("control", "case")));
        List<int[]> rows = new ArrayList<>();
        for (int[] c : ESOPH) {
            EffectMeasuresTest.add(rows, c[3], c[0], c[1], c[2], 1);
            EffectMeasuresTest.add(rows, c[4], c[0], c[1], c[2], 0);
        }
        return InMemoryTally.tally(vars, rows.toArray(int[][]::new), 3, FamilyScore.withDefaults());
    }

    static EffectResult effect(LocalScores ls, List<List<String>> tiers, String set, String target, String versus) {
        UnknownOrderSettings s = new UnknownOrderSettings(UnknownOrderSettings.Method.EXACT, tiers, 3L, 4, 1000L, null, 100, null,
                null, null, false, false, 1000, 0, DagPrior.STRUCTURE_MODULAR, false);
        return EffectAnalysis.run(new EffectAnalysis.Request(ls, null, s,
                List.of(new EffectAnalysis.Question(set, target, null, versus, "")), ENGINE), ProgressListener.NONE).get(0);
    }

    static void within(double hand, EffectResult r) {
        EffectResult.Measure rd = r.riskDifference();
        assertTrue(rd.interval().lower() <= hand && hand <= rd.interval().upper(),
                "hand " + hand + " outside " + rd.interval() + " (model " + rd.estimate() + ")");
    }

    /** The split: the two posteriors sum to 1, and direction + effect + confounding = the association. */
    static void splitAddsUp(EffectResult r) {
        EffectResult.Split s = r.split();
        assertNotNull(s);
        assertEquals(1.0, s.noEffect() + s.effect(), 1e-12);
        assertEquals(r.noPathProbability(), s.noEffect(), 1e-15);
        assertEquals(s.association(), s.directionPart() + s.setting() + s.confoundingPart(), 1e-12);
        if (r.difference() != null) {
            assertEquals(r.observational().difference(), s.association(), 1e-15);
            assertEquals(r.difference(), s.setting(), 1e-15);
        } else {
            // a case-control sample: the split is on the log odds ratio
            assertEquals(Math.log(r.observational().oddsRatio()), s.association(), 1e-12);
        }
    }

    @Test
    void admissionsByGenderWithTiersIsTheConditionalDifference() {
        // Gender is the first tier: no back-door path, the empty adjustment set, P(a | do(g)) = P(a | g).
        // By hand: women 557/1835 admitted, men 1198/2691.
        double hand = 557.0 / 1835 - 1198.0 / 2691;
        EffectResult r = effect(ucb(), List.of(List.of("Gender"), List.of("Dept"), List.of("Admit")),
                "Gender=Female", "Admit=Admitted", "Gender=Male");
        within(hand, r);
        assertEquals(557.0 / 1835, r.observed().probability(), 1e-15);
        assertEquals(1198.0 / 2691, r.observed().versusProbability(), 1e-15);
        splitAddsUp(r);
    }

    @Test
    void admissionsByDepartmentWithTiersIsTheAdjustmentOfTheNetworkThePosteriorFavours() {
        // Dept's back-door paths run through Gender (the earlier tier), and only if Gender → Admit is an
        // edge. Within departments admission hardly depends on gender (Bickel et al.'s finding), and
        // the posterior puts its weight on Gender → Dept → Admit: there the adjustment set is empty and
        // P(a | do(d)) = P(a | d) — by hand 601/933 admitted in A, 46/714 in F. The adjustment over
        // Gender, Σ_g P(a | d, g) P(g) (the figure if Gender → Admit were certain), is then outside.
        double empty = 601.0 / 933 - 46.0 / 714;
        double men = 2691.0 / 4526;
        double women = 1835.0 / 4526;
        double overGender = 512.0 / 825 * men + 89.0 / 108 * women - (22.0 / 373 * men + 24.0 / 341 * women);
        EffectResult r = effect(ucb(), List.of(List.of("Gender"), List.of("Dept"), List.of("Admit")),
                "Dept=A", "Admit=Admitted", "Dept=F");
        within(empty, r);
        assertTrue(overGender > r.riskDifference().interval().upper(), r.riskDifference().toString());
        splitAddsUp(r);
        // without tiers the direction between department and gender is open: the split still adds up
        EffectResult open = effect(ucb(), null, "Gender=Female", "Admit=Admitted", "Gender=Male");
        splitAddsUp(open);
    }

    @Test
    void titanicClassWithTiersIsTheAdjustmentOverSexAndAge() {
        // Class's back-door paths run through Sex and Age (the earlier tier): Σ_{s,a} P(survived | c, s, a) P(s, a).
        double total = 2201;
        double first = 0;
        double third = 0;
        for (int a = 0; a < 2; a++) {
            for (int x = 0; x < 2; x++) {
                double stratum = 0;
                for (int c = 0; c < 4; c++) {
                    stratum += TITANIC[0][a][x][c] + TITANIC[1][a][x][c];
                }
                first += rate(a, x, 0) * stratum / total;
                third += rate(a, x, 2) * stratum / total;
            }
        }
        EffectResult r = effect(titanic(), List.of(List.of("Sex", "Age"), List.of("Class"), List.of("Survived")),
                "Class=1st", "Survived=Yes", "Class=3rd");
        within(first - third, r);
        splitAddsUp(r);
    }

    @Test
    void esophOddsRatioWithTiersIsTheAgeStandardisedOne() {
        // the case-control design on status: only the odds ratio; raw frequencies 45/67 and 29/415 and the
        // crude odds ratio (ad)/(bc) = 45·386 / (22·29) = 27.23 from the counts
        EffectAnalysis.CaseControl cc = new EffectAnalysis.CaseControl("status", null, "outcome", "prevalence");
        UnknownOrderSettings s = new UnknownOrderSettings(UnknownOrderSettings.Method.EXACT,
                List.of(List.of("agegp"), List.of("alcgp", "tobgp"), List.of("status")), 3L, 4, 1000L, null, 100, null,
                null, null, false, false, 1000, 0, DagPrior.STRUCTURE_MODULAR, false);
        EffectResult r = EffectAnalysis.run(new EffectAnalysis.Request(LocalScores.build(esophStore(), ScoringOptions.asStored()),
                null, s, List.of(new EffectAnalysis.Question("alcgp=120+", "status=case", null, "alcgp=0-39", "")), ENGINE, cc,
                null, null), ProgressListener.NONE).get(0);
        assertEquals(45, r.observed().events());
        assertEquals(67, r.observed().rows());
        assertEquals(29, r.observed().versusEvents());
        assertEquals(415, r.observed().versusRows());
        assertEquals(45.0 * 386 / (22.0 * 29), r.observed().oddsRatio(), 1e-12);
        assertEquals(null, r.riskDifference());
        // agegp is the earlier tier: the adjustment formula over it (Pearl 2000, §3.3), by hand on the sample's
        // shares as the model's are: Σ_a P(case | alcgp, a) P(a) for 120+ and 0-39, then their odds ratio
        double[] p = new double[2];
        for (int a = 0; a < AGE.length; a++) {
            long[] cases = new long[4];
            long[] all = new long[4];
            long age = 0;
            for (int[] c : ESOPH) {
                if (c[0] == a) {
                    cases[c[1]] += c[3];
                    all[c[1]] += c[3] + c[4];
                    age += c[3] + c[4];
                }
            }
            p[0] += (double) cases[3] / all[3] * age / 975;
            p[1] += (double) cases[0] / all[0] * age / 975;
        }
        double standardised = p[0] / (1 - p[0]) / (p[1] / (1 - p[1]));
        assertEquals(22.88, standardised, 0.005); // the figure an independent script gave
        EffectResult.Measure or = r.oddsRatio();
        assertTrue(or.interval().lower() <= standardised && standardised <= or.interval().upper(), or.toString());
        assertEquals("log odds ratio", r.split().scale());
        splitAddsUp(r);
    }

    @Test
    void esophMargins() {
        // 88 cells as R lists them; 200 cases and 775 controls (Breslow & Day 1980); at 80 g/day or more
        // 96 cases and 109 controls, the dichotomised table of EffectMeasuresTest
        int cases = 0;
        int controls = 0;
        int heavyCases = 0;
        int heavyControls = 0;
        for (int[] c : ESOPH) {
            cases += c[3];
            controls += c[4];
            heavyCases += c[1] >= 2 ? c[3] : 0;
            heavyControls += c[1] >= 2 ? c[4] : 0;
        }
        assertEquals(88, ESOPH.length);
        assertEquals(200, cases);
        assertEquals(775, controls);
        assertEquals(EffectMeasuresTest.CASES_HEAVY, heavyCases);
        assertEquals(EffectMeasuresTest.CONTROLS_HEAVY, heavyControls);
        assertEquals(975, esophStore().manifest().input().rows());
    }

    /** P(survived | age a, sex x, class c) from the table. */
    static double rate(int a, int x, int c) {
        return TITANIC[1][a][x][c] / (double) (TITANIC[0][a][x][c] + TITANIC[1][a][x][c]);
    }
}
