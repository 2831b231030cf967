package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;

/**
 * Driver commands never replace an existing {@code --out} unless {@code --overwrite}, never a
 * directory, and check that they can write before any work; every ESS typed is checked alike
 * (NaN was silently read as "as stored" by edges and predict). Messages word for word.
 */
class OutputSafetyTest extends StoreFixture {
    @Override
    long seed() {
        return 11;
    }

    @Test
    void anExistingOutFileIsKeptWithoutOverwrite() throws Exception {
        Path notes = Files.writeString(dir.resolve("notes.txt"), "my notes\n");
        byte[] before = Files.readAllBytes(notes);
        String s = store.toString();
        for (String[] cmd : new String[][] {
            {"edges", "--store", s, "--order", EdgesCommandTest.ORDER},
            {"scores", "--store", s},
            {"predict", "--store", s, "--order", EdgesCommandTest.ORDER, "--case", "v1=s0"},
        }) {
            String[] args = concat(cmd, "--out", notes.toString());
            EdgesCommandTest.refused(cmd[0] + ": --out " + notes + " already exists; pass --overwrite to replace it", args);
            assertArrayEquals(before, Files.readAllBytes(notes), cmd[0]);
        }
        CliRun r = CliRun.of("scores", "--store", s, "--out", notes.toString(), "--overwrite");
        assertEquals(0, r.status(), r.err());
        assertTrue(Files.readString(notes).startsWith("{\n  \"formatVersion\""), "replaced with --overwrite");
    }

    @Test
    void aDirectoryIsNeverAnOutFile() throws Exception {
        EdgesCommandTest.refused("scores: --out " + dir + " is a directory; give a file name",
                "scores", "--store", store.toString(), "--out", dir.toString(), "--overwrite");
        EdgesCommandTest.refused("scores: --out " + store + " is the input --store " + store + "; write elsewhere",
                "scores", "--store", store.toString(), "--out", store.toString(), "--overwrite");
        assertTrue(Files.exists(store.resolve("manifest.json")));
        Path plain = Files.writeString(dir.resolve("plain"), "x");
        Path out = plain.resolve("r.json");
        EdgesCommandTest.refused("edges: cannot write --out " + out + ": " + plain + " is not a directory",
                "edges", "--store", store.toString(), "--order", EdgesCommandTest.ORDER, "--out", out.toString());
    }

    @Test
    void everyCommandRefusesTheSameBadEss() {
        String s = store.toString();
        EdgesCommandTest.refused("edges: --ess must be a number, got NaN",
                "edges", "--store", s, "--order", EdgesCommandTest.ORDER, "--ess", "NaN");
        EdgesCommandTest.refused("predict: --ess must be a number, got NaN",
                "predict", "--store", s, "--order", EdgesCommandTest.ORDER, "--case", "v1=s0", "--ess", "NaN");
        EdgesCommandTest.refused("scores: --ess must be a number, got NaN", "scores", "--store", s, "--ess", "NaN");
        String range = " must be between 1e-9 and 1e15, got 1.0E308 (beyond these the prior alone decides every score,"
                + " or the data alone)";
        EdgesCommandTest.refused("edges: --ess" + range, "edges", "--store", s, "--order", EdgesCommandTest.ORDER,
                "--ess", "1,1e308");
        EdgesCommandTest.refused("scores: --ess" + range, "scores", "--store", s, "--ess", "1e308");
    }

    static String[] concat(String[] a, String... b) {
        String[] out = java.util.Arrays.copyOf(a, a.length + b.length);
        System.arraycopy(b, 0, out, a.length, b.length);
        return out;
    }
}
