package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.junit.jupiter.api.Test;

/**
 * Options and inputs that were accepted although they contradict themselves (issue 23, item 14):
 * each is refused in one line, with exit status 2, writing nothing and leaving its inputs as they were.
 */
class ContradictoryInputTest extends StoreFixture {
    @Override
    long seed() {
        return 23_014L;
    }

    /** The store's files, name and bytes, to show that a refusal left them as they were. */
    private List<String> storeBytes() throws Exception {
        try (var files = Files.list(store)) {
            return files.sorted().map(f -> {
                try {
                    return f.getFileName() + ":" + java.util.Arrays.hashCode(Files.readAllBytes(f));
                } catch (java.io.IOException e) {
                    throw new java.io.UncheckedIOException(e);
                }
            }).toList();
        }
    }

    @Test
    void aStepCapOfZeroIsRefusedWithTheFirstCheck() throws Exception {
        List<String> before = storeBytes();
        Path out = dir.resolve("e.json");
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--method", "mcmc", "--max-steps", "0", "--out", out.toString());
        assertEquals(2, r.status());
        assertEquals("edges: --max-steps 0 is below the first convergence check, after 20000 steps per chain: give at least 20000",
                r.errLine());
        assertFalse(Files.exists(out));
        assertEquals(before, storeBytes());
        // the library refuses the same cap instead of raising it to the first check
        UserError e = assertThrows(UserError.class, () -> new UnknownOrderSettings(UnknownOrderSettings.Method.MCMC, List.of(), 5,
                4, null, null, 100, null, 0L, null, false, false, 1, 0, null, false));
        assertEquals("the step cap 0 is below the first convergence check, after 20000 steps per chain: give at least 20000",
                e.getMessage());
    }

    @Test
    void aNetworkWithTextAfterItsObjectIsRefused() throws Exception {
        for (String tail : List.of("\ngarbage\n", "{}", "\n{\"edgewiseNetwork\":1}\n")) {
            Path net = dir.resolve("net.json");
            byte[] bytes = (OptionWalkTest.TRUTH + tail).getBytes(java.nio.charset.StandardCharsets.UTF_8);
            Files.write(net, bytes);
            Path out = dir.resolve("data.csv");
            CliRun r = CliRun.of("simulate", "--network", net.toString(), "--rows", "5", "--out", out.toString());
            assertEquals(2, r.status(), tail);
            assertEquals("simulate: network file " + net + " has text after its JSON object, which ends at line 1, column "
                    + OptionWalkTest.TRUTH.length() + ": a network file holds one object and nothing else", r.errLine());
            assertEquals("", r.out());
            assertFalse(Files.exists(out));
            org.junit.jupiter.api.Assertions.assertArrayEquals(bytes, Files.readAllBytes(net));
        }
        // white space after the object is fine
        Path net = dir.resolve("spaced.json");
        Files.writeString(net, OptionWalkTest.TRUTH + "\n\n  \n");
        assertEquals(0, CliRun.of("simulate", "--network", net.toString(), "--rows", "5").status());
    }
}
