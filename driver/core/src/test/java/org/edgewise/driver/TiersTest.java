package org.edgewise.driver;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.junit.jupiter.api.Test;

/** One meaning of a tiers option: ';' within a value and a repeated value both separate tiers; one refusal per mistake. */
class TiersTest {
    private static final List<String> VARS = List.of("a", "b", "c", "d");

    @Test
    void semicolonsAndRepeatedValuesAreTheSame() {
        List<List<String>> one = Tiers.parse(List.of("a,b;c"), "tiers");
        List<List<String>> two = Tiers.parse(List.of("a,b", "c"), "tiers");
        assertEquals(List.of(List.of("a", "b"), List.of("c")), one);
        assertEquals(one, two);
        assertEquals(List.of(List.of("a"), List.of("b"), List.of("c", "d")), Tiers.parse(List.of(" a ;b", "c, d"), "tiers"));
        assertEquals(List.of(), Tiers.parse(List.of(), "tiers"));
        assertArrayEquals(new int[] {0, 0, 1, -1}, Tiers.resolve(VARS, one, "tiers"));
    }

    @Test
    void refusalsNameTheVariable() {
        assertEquals("--tiers: empty variable name in 'a,;c'", refused(() -> Tiers.parse(List.of("a,;c"), "--tiers")));
        assertEquals("--tiers: empty variable name in 'a;'", refused(() -> Tiers.parse(List.of("a;"), "--tiers")));
        assertEquals("--tiers: empty variable name in ''", refused(() -> Tiers.parse(List.of(""), "--tiers")));
        assertEquals("--tiers: unknown variable 'z' (variables: a, b, c, d)",
                refused(() -> Tiers.resolve(VARS, List.of(List.of("a"), List.of("z")), "--tiers")));
        assertEquals("--tiers: variable 'a' is in tiers 1 and 2",
                refused(() -> Tiers.resolve(VARS, List.of(List.of("a", "b"), List.of("c", "a")), "--tiers")));
        assertEquals("--tiers: variable 'b' is named twice in tier 1",
                refused(() -> Tiers.resolve(VARS, List.of(List.of("b", "b")), "--tiers")));
        assertEquals("tier: empty variable name in 'a, '",
                refused(() -> Tiers.resolve(VARS, List.of(List.of("a", " ")), "tier")));
    }

    private static String refused(org.junit.jupiter.api.function.Executable call) {
        return assertThrows(UserError.class, call).getMessage();
    }
}
