package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.List;
import org.edgewise.driver.ErrorReport;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.mcmc.DrawStore;
import org.edgewise.driver.average.mcmc.McmcMemory;
import org.edgewise.driver.average.convergence.MultiChainDiagnostics;
import org.junit.jupiter.api.Test;

/** The CLI words the core's typed user errors with its own option names; other failures pass through. */
class CliNamesTest {
    /** Two chains with {@code draws} stored draws each (one quantity, steps 1, 2, …). */
    private static List<DrawStore> chains(int draws) {
        DrawStore a = new DrawStore(1, 100, 1, 0);
        DrawStore b = new DrawStore(1, 100, 1, 0);
        for (int s = 1; s <= draws; s++) {
            a.add(s, new float[] {0.25f * s}, 0, null);
            b.add(s, new float[] {0.5f * s}, 0, null);
        }
        return List.of(a, b);
    }

    @Test
    void tooFewDrawsNamesTheDrawsOption() {
        MultiChainDiagnostics.TooFewDraws e = assertThrows(MultiChainDiagnostics.TooFewDraws.class,
                () -> MultiChainDiagnostics.evaluate(chains(2), 0, MultiChainDiagnostics.rows(q -> "q" + q, 1), 1.01));
        // the core in the Java API's words; the CLI in its own (the message users read, word for word)
        assertEquals("only 2 draws per chain were stored after the warm-up; run more steps or store more draws (draws)",
                e.getMessage());
        StringWriter err = new StringWriter();
        int status = ErrorReport.report("edges", CliNames.worded(new RuntimeException("wrapped", e)), new PrintWriter(err));
        assertEquals(ErrorReport.USER_MISTAKE, status);
        assertEquals("edges: only 2 draws per chain were stored after the warm-up; run more steps or store more draws (--draws)\n",
                err.toString().replace(System.lineSeparator(), "\n"));
    }

    @Test
    void tooLittleHeapNamesTheLaunchersHeapSettingAndTheOptionsThatLowerTheNeed() {
        // 8 MiB of tables + 4 chains × (1 MiB of state + 32 MiB of draws) = 140 MiB, 100 MiB free
        McmcMemory plan = new McmcMemory(8L << 20, 200, 0, 1L << 20, 0, 32L << 20, 4, 1);
        McmcMemory.TooLittleHeap e = assertThrows(McmcMemory.TooLittleHeap.class, () -> plan.check(100L << 20, 512L << 20));
        StringWriter err = new StringWriter();
        int status = ErrorReport.report("edges", CliNames.worded(e), new PrintWriter(err));
        assertEquals(ErrorReport.USER_MISTAKE, status);
        assertEquals("edges: the MCMC run needs about 140.0 MiB (per-child tables 8.0 MiB for 200 of 200 children, "
                        + "draw stores 128.0 MiB, chain state 4.0 MiB) but the heap has 100.0 MiB free of 512.0 MiB; "
                        + "raise it with EDGEWISE_JAVA_OPTS=-Xmx…, or lower --draws or --chains\n",
                err.toString().replace(System.lineSeparator(), "\n"));
    }

    @Test
    void otherFailuresPassUnchanged() {
        UserError plain = new UserError("--order: variable 'a' appears more than once");
        assertSame(plain, CliNames.worded(plain));
        IllegalStateException bug = new IllegalStateException("a bug");
        assertSame(bug, CliNames.worded(bug));
    }
}
