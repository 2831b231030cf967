package org.edgewise.driver.query;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.store.InputInfo;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/** {@code --case ''} meant P() = 1; a state holding a comma could not be named. Messages word for word. */
class CaseParserTest {
    static final Manifest M = Manifest.of("edgewise", "t", "2026-01-01T00:00:00Z",
            new InputInfo(List.of("x.csv"), "csv", 1, 0, "error", "00"),
            List.of(new Variable("city", List.of("Paris", "Rome, Italy")), new Variable("b", List.of("0", "1"))),
            1, null, List.of(), List.of(), List.of(), "bdeu", 1);

    @Test
    void anEmptyCaseIsRefused() {
        UserError e = assertThrows(UserError.class, () -> CaseParser.parse(M, " ", "--case"));
        assertEquals("--case is empty; give name=state pairs, e.g. city=Paris", e.getMessage());
    }

    @Test
    void aQuotedPairMayHoldAComma() {
        assertArrayEquals(new int[] {1, 0}, CaseParser.parse(M, "\"city=Rome, Italy\",b=0", "--case"));
        assertArrayEquals(new int[] {0, 1}, CaseParser.parse(M, " city = Paris , b=1", "--case"));
    }
}
