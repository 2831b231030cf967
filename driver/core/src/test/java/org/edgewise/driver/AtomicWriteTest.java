package org.edgewise.driver;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Outputs replace only regular files, and a file that appeared while a writer without permission
 * to replace was working is kept: exactly one of two racing writers wins, the other is refused in
 * one line, nothing is half-written or left behind. Messages word for word.
 */
class AtomicWriteTest {
    @TempDir
    Path dir;

    static String refused(Path out, boolean overwrite) {
        return assertThrows(UserError.class, () -> AtomicWrite.checkFile(out, overwrite, "--out", "--overwrite")).getMessage();
    }

    static void run(String... cmd) throws Exception {
        Process p = new ProcessBuilder(cmd).inheritIO().start();
        Assumptions.assumeTrue(p.waitFor() == 0, "cannot run " + String.join(" ", cmd));
    }

    @Test
    void onlyARegularFileIsReplaced() throws Exception {
        Path victim = Files.writeString(dir.resolve("victim.txt"), "keep me\n");
        Path link = Files.createSymbolicLink(dir.resolve("link"), victim);
        assertEquals("--out " + link + " is a symbolic link, not a regular file; give a file name", refused(link, true));
        assertEquals("--out " + link + " is a symbolic link, not a regular file; give a file name", refused(link, false));
        Path dangling = Files.createSymbolicLink(dir.resolve("dangling"), dir.resolve("nowhere"));
        assertEquals("--out " + dangling + " is a symbolic link, not a regular file; give a file name",
                refused(dangling, true));
        Path fifo = dir.resolve("fifo");
        run("mkfifo", fifo.toString());
        assertEquals("--out " + fifo + " is a FIFO, not a regular file; give a file name", refused(fifo, true));
        assertEquals("keep me\n", Files.readString(victim));
        assertTrue(Files.isSymbolicLink(link) && Files.isSymbolicLink(dangling));
        assertEquals("a FIFO", AtomicWrite.notRegular(fifo));
        assertEquals(null, AtomicWrite.notRegular(victim));
        assertEquals(null, AtomicWrite.notRegular(dir.resolve("missing")));
        assertEquals(List.of(".", "dangling", "fifo", "link", "victim.txt"), names());
    }

    @Test
    void aDeviceFileIsNeverReplaced() throws Exception {
        Path dev = dir.resolve("null-device");
        run("mknod", dev.toString(), "c", "1", "3");
        assertEquals("--out " + dev + " is a device file, not a regular file; give a file name", refused(dev, true));
        assertEquals("a device file", AtomicWrite.notRegular(dev));
        assertTrue(!Files.isRegularFile(dev, LinkOption.NOFOLLOW_LINKS) && Files.exists(dev, LinkOption.NOFOLLOW_LINKS));
    }

    /** A symbolic link that took the target's place after the check is not replaced by the final move. */
    @Test
    void aLinkThatAppearedMeanwhileIsNotReplaced() throws Exception {
        Path victim = Files.writeString(dir.resolve("victim.txt"), "keep me\n");
        Path out = dir.resolve("out.txt");
        AtomicWrite.checkFile(out, true, "--out", "--overwrite");
        UserError e = assertThrows(UserError.class, () -> AtomicWrite.file(out, true, tmp -> {
            Files.writeString(tmp, "new");
            Files.createSymbolicLink(out, victim);
        }));
        assertEquals("output " + out + " is a symbolic link, not a regular file; nothing was replaced", e.getMessage());
        assertTrue(Files.isSymbolicLink(out));
        assertEquals("keep me\n", Files.readString(victim));
        assertEquals(List.of(".", "out.txt", "victim.txt"), names());
    }

    /** Two writers without --overwrite, both past the start check: exactly one wins, the other keeps its hands off. */
    @Test
    void ofTwoRacingWritersExactlyOneWins() throws Exception {
        Path out = dir.resolve("e.json");
        for (int round = 0; round < 20; round++) {
            Files.deleteIfExists(out);
            CountDownLatch bothWriting = new CountDownLatch(2);
            ExecutorService pool = Executors.newFixedThreadPool(2);
            List<Future<String>> runs = new ArrayList<>();
            for (String who : List.of("first", "second")) {
                runs.add(pool.submit(() -> {
                    AtomicWrite.checkFile(out, false, "--out", "--overwrite");
                    try {
                        AtomicWrite.file(out, false, tmp -> {
                            bothWriting.countDown();
                            try {
                                bothWriting.await(10, TimeUnit.SECONDS);
                            } catch (InterruptedException e) {
                                throw new IllegalStateException(e);
                            }
                            Files.writeString(tmp, who + " ".repeat(100_000) + who);
                        });
                        return "won " + who;
                    } catch (UserError e) {
                        return e.getMessage();
                    }
                }));
            }
            List<String> results = new ArrayList<>();
            for (Future<String> f : runs) {
                results.add(f.get(30, TimeUnit.SECONDS));
            }
            pool.shutdown();
            List<String> won = results.stream().filter(r -> r.startsWith("won ")).toList();
            assertEquals(1, won.size(), results.toString());
            String winner = won.get(0).substring(4);
            String loser = results.stream().filter(r -> !r.startsWith("won ")).findFirst().orElseThrow();
            assertEquals("output " + out + " appeared while writing (another run writing it?); it was kept and nothing"
                    + " was written", loser);
            assertEquals(winner + " ".repeat(100_000) + winner, Files.readString(out), "the winner's file, whole");
            assertEquals(List.of(".", "e.json"), names(), "no temporary left behind");
        }
    }

    /** Without permission to replace, an existing file is kept byte for byte. */
    @Test
    void anExistingFileIsKeptWithoutReplace() throws Exception {
        Path out = Files.writeString(dir.resolve("notes.txt"), "my notes\n");
        byte[] before = Files.readAllBytes(out);
        UserError e = assertThrows(UserError.class, () -> AtomicWrite.text(out, false, "new"));
        assertEquals("output " + out + " appeared while writing (another run writing it?); it was kept and nothing"
                + " was written", e.getMessage());
        assertArrayEquals(before, Files.readAllBytes(out));
        AtomicWrite.text(out, true, "replaced\n");
        assertEquals("replaced\n", Files.readString(out));
        assertEquals(List.of(".", "notes.txt"), names());
    }

    private List<String> names() throws Exception {
        try (Stream<Path> s = Files.list(dir)) {
            List<String> n = new ArrayList<>(s.map(p -> p.getFileName().toString()).toList());
            n.add(".");
            return n.stream().sorted().toList();
        }
    }

    /** Issue 23: a writability probe left by a killed check is removed by the next check; a live writer's is kept. */
    @Test
    void aProbeLeftByAKilledCheckIsRemovedByTheNext() throws Exception {
        Process gone = new ProcessBuilder("true").start();
        gone.waitFor();
        long deadPid = gone.pid();
        Path left = Files.createFile(dir.resolve(".out.json.probe-" + deadPid + "-" + java.util.UUID.randomUUID()));
        Path live = Files.createFile(dir.resolve(".out.json.probe-" + ProcessHandle.current().pid() + "-"
                + java.util.UUID.randomUUID()));
        Path notEmpty = Files.writeString(dir.resolve(".mine.probe-" + deadPid + "-" + java.util.UUID.randomUUID()), "x");
        Path other = Files.writeString(dir.resolve("notes.txt"), "keep\n");
        AtomicWrite.checkWritable(dir.resolve("out.json"), "--out");
        org.junit.jupiter.api.Assertions.assertFalse(Files.exists(left), "dead check's probe removed");
        org.junit.jupiter.api.Assertions.assertTrue(Files.exists(live), "a live writer's probe kept");
        org.junit.jupiter.api.Assertions.assertEquals("x", Files.readString(notEmpty), "a non-empty file is never removed");
        org.junit.jupiter.api.Assertions.assertEquals("keep\n", Files.readString(other));
        try (var ls = Files.list(dir)) {
            org.junit.jupiter.api.Assertions.assertEquals(java.util.Set.of(live, notEmpty, other),
                    java.util.Set.copyOf(ls.toList()), "the check itself leaves nothing");
        }
    }
}
