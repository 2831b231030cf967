package org.edgewise.driver;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/** RFC 4180 (Shafranovich 2005, section 2) field reading through Commons CSV, and the quoting that writes it. */
class CsvFieldsTest {
    @Test
    void rfc4180FieldsWithDoubledQuotesUnescaped() {
        assertEquals(List.of("a", "b,c", "say \"hi\"", ""), CsvFields.split("a,\"b,c\",\"say \"\"hi\"\"\",", ','));
        assertEquals(List.of(""), CsvFields.split("", ','));
        assertEquals(List.of("x", "y"), CsvFields.split("x;y", ';'));
    }

    @Test
    void quoteThenSplitIsTheIdentity() {
        for (String s : List.of("plain", "with,comma", "with \"quote\"", "")) {
            assertEquals(List.of(s, "z"), CsvFields.split(CsvFields.quote(s) + ",z", ','));
        }
    }

    @Test
    void malformedQuotesNameTheirFieldAndOpeningCharacter() {
        CsvFields.Malformed e = assertThrows(CsvFields.Malformed.class, () -> CsvFields.split("s0,\"s1", ','));
        assertTrue(e.unterminated());
        assertEquals(2, e.column());
        assertEquals(4, e.quoteAt());
        e = assertThrows(CsvFields.Malformed.class, () -> CsvFields.split("a,\"b\"c,d", ','));
        assertFalse(e.unterminated());
        assertEquals(2, e.column());
        assertEquals(3, e.quoteAt());
    }
}
