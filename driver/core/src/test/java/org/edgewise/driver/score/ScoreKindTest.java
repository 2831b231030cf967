package org.edgewise.driver.score;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.edgewise.driver.UserError;
import org.junit.jupiter.api.Test;

/** "K2 has no ESS", said once: K2 uses α_ijk = 1 (Cooper &amp; Herskovits 1992), BDeu ESS/(q r) (Heckerman et al. 1995). */
class ScoreKindTest {
    @Test
    void k2HasNoEss() {
        assertTrue(ScoreKind.BDEU.usesEss());
        assertFalse(ScoreKind.K2.usesEss());
        assertEquals(2.5, ScoreKind.BDEU.reportedEss(2.5));
        assertNull(ScoreKind.K2.reportedEss(2.5));
        assertNull(FamilyScore.of(ScoreKind.K2, 1).reportedEss());
        assertEquals(1.0, ScoreKind.K2.cellAlpha(10, 3, 4), 0.0);
        assertEquals(10.0 / 12, ScoreKind.BDEU.cellAlpha(10, 3, 4), 0.0);
    }

    @Test
    void rescoringFollowsTheEssOnlyWhereItCounts() {
        assertFalse(ScoreKind.K2.rescores(ScoreKind.K2, 1, 5)); // another ESS changes nothing under K2
        assertTrue(ScoreKind.BDEU.rescores(ScoreKind.BDEU, 1, 5));
        assertFalse(ScoreKind.BDEU.rescores(ScoreKind.BDEU, 1, 1));
        assertTrue(ScoreKind.K2.rescores(ScoreKind.BDEU, 1, 1));
    }

    @Test
    void anEssGivenToK2IsRefused() {
        ScoreKind.BDEU.checkEss(true, "ess");
        ScoreKind.K2.checkEss(false, "ess");
        assertEquals("ess does not apply to score k2: K2 has no equivalent sample size (every Dirichlet parameter is 1)",
                assertThrows(UserError.class, () -> ScoreKind.K2.checkEss(true, "ess")).getMessage());
    }
}
