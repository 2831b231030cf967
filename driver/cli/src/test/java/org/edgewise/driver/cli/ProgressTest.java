package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import org.junit.jupiter.api.Test;

/** Progress stays silent off a terminal and draws a bar on one (common practice for CLIs). */
class ProgressTest {
    @Test
    void quietWhenNotOnATerminalAndVisibleOtherwise() {
        PrintStream saved = System.err;
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        System.setErr(new PrintStream(err, true));
        try {
            try (Progress p = Progress.start("quiet", 10, false)) {
                assertFalse(p.visible());
                p.step(5);
                p.extra("half");
            }
            assertTrue(err.size() == 0, "nothing written off a terminal");
            try (Progress p = Progress.start("shown", 10, true)) {
                assertTrue(p.visible());
                p.step(10);
                p.extra("done");
            }
        } finally {
            System.setErr(saved);
        }
        assertTrue(err.toString().contains("shown"), "the bar names its task: " + err);
    }
}
