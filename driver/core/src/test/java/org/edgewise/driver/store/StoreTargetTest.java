package org.edgewise.driver.store;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.UUID;
import java.util.stream.Stream;
import org.edgewise.driver.UserError;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Nothing is lost by a wrong {@code --out}: {@code --overwrite} replaces only a score store, never
 * an input, a file or someone's directory; leftovers of killed writers are cleaned by the next
 * write. Messages word for word; every refused target is still there, byte for byte.
 */
class StoreTargetTest {
    @TempDir
    Path dir;

    static String refused(Path out, boolean overwrite, List<String> inputs) {
        return assertThrows(UserError.class, () -> StoreTarget.check(out, overwrite, inputs, "--out", "--overwrite")).getMessage();
    }

    @Test
    void overwriteReplacesOnlyAStore() throws Exception {
        Path victim = Files.writeString(dir.resolve("victim.csv"), "a,b\n1,2\n");
        byte[] before = Files.readAllBytes(victim);
        assertEquals("--overwrite replaces only a score store; " + victim + " is a file, not a store; choose another --out",
                refused(victim, true, List.of("other.csv")));
        assertArrayEquals(before, Files.readAllBytes(victim));

        Path notes = Files.createDirectory(dir.resolve("notes"));
        Files.writeString(notes.resolve("todo.txt"), "keep me");
        assertEquals("--overwrite replaces only a score store; " + notes + " is a directory without manifest.json;"
                + " choose another --out", refused(notes, true, List.of("other.csv")));

        Path store = dir.resolve("store");
        StoreWriter.write(store, StoreRoundTripTest.manifest(), StoreRoundTripTest.families(), new double[] {-1, -2, -3, -4},
                false);
        StoreTarget.check(store, true, List.of("other.csv"), "--out", "--overwrite"); // a store may be replaced
        assertEquals("output " + store + " already exists; pass --overwrite to replace it",
                refused(store, false, List.of("other.csv")));
        Files.writeString(store.resolve("thesis.tex"), "years of work");
        assertEquals("--overwrite replaces only a score store; " + store + " also holds thesis.tex, which is not part of"
                + " a store; choose another --out", refused(store, true, List.of("other.csv")));
        Files.writeString(notes.resolve("manifest.json"), "{\"name\": \"my project\"}");
        assertEquals("--overwrite replaces only a score store; " + notes + "/manifest.json is not a store manifest;"
                + " choose another --out", refused(notes, true, List.of("other.csv")));
        assertEquals("keep me", Files.readString(notes.resolve("todo.txt")));
    }

    @Test
    void theInputIsNeverTheOutput() throws Exception {
        Path data = Files.createDirectory(dir.resolve("data"));
        Files.writeString(data.resolve("part-1.csv"), "a\n1\n");
        assertEquals("--out " + data + " is the input " + data + "; write the store elsewhere",
                refused(data, true, List.of(data.toString())));
        String inside = data.resolve("part-1.csv").toString();
        assertEquals("--out " + data + " holds the input " + inside + "; write the store elsewhere",
                refused(data, true, List.of(inside)));
        assertEquals("--out " + data + " holds the input file:" + inside + "; write the store elsewhere",
                refused(data, false, List.of("file:" + inside)));
        // hdfs: inputs cannot be in a local directory
        StoreTarget.check(dir.resolve("new"), false, List.of("hdfs://namenode/data"), "--out", "--overwrite");
        assertTrue(Files.exists(data.resolve("part-1.csv")));
    }

    @Test
    void theOutputIsNeverInsideTheInput() throws Exception {
        Path data = Files.createDirectory(dir.resolve("data"));
        Files.writeString(data.resolve("part-1.csv"), "a\n1\n");
        Path inside = data.resolve("store");
        assertEquals("--out " + inside + " is inside the input " + data + "; write the store elsewhere",
                refused(inside, false, List.of(data.toString())));
        Path viaLink = Files.createSymbolicLink(dir.resolve("data-link"), data).resolve("store");
        assertEquals("--out " + viaLink + " is inside the input " + data + "; write the store elsewhere",
                refused(viaLink, false, List.of(data.toString())));
        assertFalse(Files.exists(inside));
        try (Stream<Path> s = Files.list(data)) {
            assertEquals(List.of("part-1.csv"), s.map(x -> x.getFileName().toString()).toList());
        }
    }

    /** --overwrite replaces a store, never a symbolic link (to a store or not), a FIFO or a device file. */
    @Test
    void aSpecialFileIsNeverReplaced() throws Exception {
        Path store = dir.resolve("store");
        StoreWriter.write(store, StoreRoundTripTest.manifest(), StoreRoundTripTest.families(), new double[] {-1, -2, -3, -4},
                false);
        Path link = Files.createSymbolicLink(dir.resolve("link"), store);
        assertEquals("--out " + link + " is a symbolic link, not a store; give a new name or a store",
                refused(link, true, List.of()));
        Path dangling = Files.createSymbolicLink(dir.resolve("dangling"), dir.resolve("nowhere"));
        assertEquals("--out " + dangling + " is a symbolic link, not a store; give a new name or a store",
                refused(dangling, true, List.of()));
        Path fifo = dir.resolve("fifo");
        assertEquals(0, new ProcessBuilder("mkfifo", fifo.toString()).start().waitFor());
        assertEquals("--out " + fifo + " is a FIFO, not a store; give a new name or a store", refused(fifo, true, List.of()));
        // the final move checks again: a link put in place after the check is not replaced
        UserError e = assertThrows(UserError.class, () -> StoreWriter.write(dangling, StoreRoundTripTest.manifest(),
                StoreRoundTripTest.families(), new double[] {-1, -2, -3, -4}, true));
        assertEquals("output " + dangling + " is a symbolic link, not a store; nothing was replaced", e.getMessage());
        assertTrue(Files.isSymbolicLink(link) && Files.isSymbolicLink(dangling) && !Files.exists(dangling));
        assertEquals(-1, StoreReader.read(store).logScore(0));
        try (Stream<Path> s = Files.list(dir)) {
            assertEquals(List.of("dangling", "fifo", "link", "store"), s.map(x -> x.getFileName().toString()).sorted().toList());
        }
    }

    @Test
    void anUnwritableDirectoryIsFoundBeforeAnyWork() throws Exception {
        Path file = Files.writeString(dir.resolve("plain"), "x");
        Path out = file.resolve("store");
        assertEquals("cannot write --out " + out + ": " + file + " is not a directory", refused(out, false, List.of()));
    }

    /** A writer killed with kill -9 leaves its temporary; the next write to the same target removes it. */
    @Test
    void theNextWriteRemovesLeftoversOfDeadWriters() throws Exception {
        Process p = new ProcessBuilder("true").start();
        p.waitFor();
        long dead = p.pid();
        Path store = dir.resolve("s");
        Path leftover = Files.createDirectory(dir.resolve(".s.tmp-" + dead + "-" + UUID.randomUUID()));
        Files.writeString(leftover.resolve(StoreFormat.COUNTS), "half");
        Path live = Files.createDirectory(dir.resolve(".s.tmp-" + ProcessHandle.current().pid() + "-" + UUID.randomUUID()));
        StoreWriter.write(store, StoreRoundTripTest.manifest(), StoreRoundTripTest.families(), new double[] {-1, -2, -3, -4},
                false);
        assertFalse(Files.exists(leftover), "the dead writer's temporary is gone");
        assertTrue(Files.exists(live), "a live writer's temporary is left alone");
        Files.delete(live);
        // killed between moving the old store aside and moving the new one in: the old one comes back
        Path old = dir.resolve(".s.old-" + dead + "-" + UUID.randomUUID());
        Files.move(store, old);
        StoreWriter.write(dir.resolve("t"), StoreRoundTripTest.manifest(), StoreRoundTripTest.families(),
                new double[] {-1, -2, -3, -4}, false);
        assertTrue(Files.exists(old), "another target's leftovers are not touched");
        assertThrows(UserError.class, () -> StoreWriter.write(store, StoreRoundTripTest.manifest(),
                StoreRoundTripTest.families(), new double[] {-1, -2, -3, -4}, false));
        assertFalse(Files.exists(old));
        assertEquals(-1, StoreReader.read(store).logScore(0), "the old store is back in place");
        try (Stream<Path> s = Files.list(dir)) {
            assertEquals(List.of("s", "t"), s.map(x -> x.getFileName().toString()).sorted().toList());
        }
    }
}
