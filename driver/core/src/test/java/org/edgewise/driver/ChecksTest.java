package org.edgewise.driver;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.PrintWriter;
import java.io.StringWriter;
import org.junit.jupiter.api.Test;

/** The argument checks' messages word for word, and how ErrorReport tells a user mistake from a bug. */
class ChecksTest {
    static String refused(Runnable r) {
        return assertThrows(UserError.class, r::run).getMessage();
    }

    @Test
    void messagesNameTheValueAsTheCallerKnowsIt() {
        assertEquals("--ess must be positive, got 0.0", refused(() -> Checks.ess(0, "--ess")));
        assertEquals("ESS must be a number, got NaN", refused(() -> Checks.ess(Double.NaN, "ESS")));
        assertEquals("--ess must be between 1e-9 and 1e15, got 1.0E308 (beyond these the prior alone decides every"
                + " score, or the data alone)", refused(() -> Checks.ess(1e308, "--ess")));
        assertEquals("--ess must be between 1e-9 and 1e15, got 1.0E-12 (beyond these the prior alone decides every"
                + " score, or the data alone)", refused(() -> Checks.ess(1e-12, "--ess")));
        assertEquals(1e15, Checks.ess(1e15, "--ess"));
        assertEquals("ESS must be finite, got Infinity", refused(() -> Checks.ess(Double.POSITIVE_INFINITY, "ESS")));
        assertEquals("--chains must be at least 1, got 0", refused(() -> Checks.atLeast(0, 1, "--chains")));
        assertEquals("the burn-in must not be negative, got -3", refused(() -> Checks.notNegative(-3, "the burn-in")));
        assertEquals("--top-parents must be 0 or more, got -1", refused(() -> Checks.zeroOrMore(-1, "--top-parents")));
        assertEquals("the tail mass must be in [0, 1), got 1.0", refused(() -> Checks.unitInterval(1, "the tail mass")));
        assertEquals(0.5, Checks.ess(0.5, "ESS"));
        assertEquals(0.0, Checks.unitInterval(0, "x"));
    }

    @Test
    void aUserErrorAnywhereInTheChainIsExitTwoOneLine() {
        StringWriter w = new StringWriter();
        int status = ErrorReport.report("edges", new RuntimeException(new UserError("store s is damaged: x")),
                new PrintWriter(w));
        assertEquals(ErrorReport.USER_MISTAKE, status);
        assertEquals(2, status);
        assertEquals("edges: store s is damaged: x" + System.lineSeparator(), w.toString());
    }

    @Test
    void anIllegalArgumentExceptionIsABug() {
        StringWriter w = new StringWriter();
        int status = ErrorReport.report("edges", new IllegalArgumentException("order has 3 variables, expected 4"),
                new PrintWriter(w));
        assertEquals(1, status);
        String first = w.toString().lines().findFirst().orElseThrow();
        assertEquals("edges: internal error (please report, with the command line and this trace): "
                + "java.lang.IllegalArgumentException: order has 3 variables, expected 4", first);
        assertEquals(true, w.toString().contains("\tat "), "with the stack trace");
    }
}
