package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import org.edgewise.driver.UserError;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/** Exit statuses: a user mistake is one line and 2; anything else — IllegalArgumentException too — a bug, 1. */
class ExitStatusTest {
    @Command(name = "boom")
    static final class Boom implements Runnable {
        @CommandLine.Option(names = "--what")
        String what = "bug";

        @Override
        public void run() {
            if (what.equals("user")) {
                throw new RuntimeException(new UserError("input x.csv line 3: 'q' is not a state"));
            }
            throw new IllegalArgumentException("order has 3 variables, expected 4");
        }
    }

    static CliRun run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int status = EdgewiseCli.configure(new CommandLine(new Boom()), new PrintWriter(out, true),
                new PrintWriter(err, true)).execute(args);
        return new CliRun(status, out.toString(), err.toString());
    }

    @Test
    void illegalArgumentIsABugWithItsTrace() {
        CliRun r = run();
        assertEquals(1, r.status());
        assertEquals("boom: internal error (please report, with the command line and this trace): "
                + "java.lang.IllegalArgumentException: order has 3 variables, expected 4", r.err().lines().findFirst().orElseThrow());
        assertTrue(r.err().contains("\tat "), r.err());
    }

    @Test
    void userErrorIsOneLineAndStatusTwo() {
        CliRun r = run("--what", "user");
        assertEquals(2, r.status());
        assertEquals("boom: input x.csv line 3: 'q' is not a state\n", r.err());
    }

    @Test
    void badOptionIsStatusTwo() {
        CliRun r = run("--nope");
        assertEquals(2, r.status());
        assertEquals("boom: Unknown option: '--nope' (see boom --help)", r.errLine());
    }

    @Test
    void topLevelHelpListsTallyWithoutACommandForIt() {
        CliRun help = CliRun.of("--help");
        assertEquals(0, help.status());
        assertTrue(help.out().contains("  tally     Scan a table once and write a score store"), help.out());
        CliRun tally = CliRun.of("tally");
        assertEquals(2, tally.status());
        assertTrue(tally.err().startsWith("edgewise: Unmatched argument at index 0: 'tally'"), tally.err());
    }

    @Test
    void unknownScoreIsAUserMistake() {
        CliRun r = CliRun.of("scores", "--store", "nowhere", "--score", "bic");
        assertEquals(2, r.status());
    }
    /**
     * Issue 11: a file name the JVM cannot represent (a NUL — no POSIX file name holds one — or an
     * unpaired UTF-16 surrogate, which no UTF-8 byte sequence encodes) is one line naming the option,
     * exit 2, not the name of a Java exception.
     */
    @Test
    void aPathTheSystemCannotRepresentIsOneLineNamingTheOption() {
        CliRun nul = CliRun.of("edges", "--store", "st\u0000ore");
        assertEquals(2, nul.status());
        assertEquals("edges: --store: 'st\\u0000ore' is not a file name this system can use: it holds a NUL character",
                nul.errLine());
        CliRun out = CliRun.of("simulate", "--network", "net.json", "--out", "x\uD800.csv");
        assertEquals(2, out.status());
        assertEquals("simulate: --out: 'x\\uD800.csv' is not a file name this system can use: it holds a character the"
                + " platform encoding " + System.getProperty("sun.jnu.encoding") + " cannot represent", out.errLine());
        assertTrue(!out.err().contains("Exception"), out.err());
    }
}
