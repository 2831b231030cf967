package org.edgewise.driver;

import java.io.IOException;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.Comparator;
import java.util.UUID;
import java.util.stream.Stream;

/**
 * The one way outputs are written: to a hidden temporary sibling of the target
 * ({@code .<name>.tmp-<uuid>}, same directory, so the same filesystem), renamed into place only
 * when complete. A failed or killed writer leaves the target as it was, never half-written; a
 * leftover hidden temporary never looks like an output and is ignored by the next run.
 */
public final class AtomicWrite {
    private AtomicWrite() {
    }

    /** Writes the content into the temporary path it is given. */
    @FunctionalInterface
    public interface Content {
        void writeTo(Path tmp) throws IOException;
    }

    /** Writes a file: {@code content} writes {@code tmp}; it then replaces {@code target}. */
    public static void file(Path target, Content content) throws IOException {
        Path abs = target.toAbsolutePath().normalize();
        Path tmp = temporarySibling(abs, "tmp");
        try {
            content.writeTo(tmp);
            Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
        } finally {
            deleteTree(tmp);
        }
    }

    /** Writes {@code text} (UTF-8) as a file. */
    public static void text(Path target, String text) throws IOException {
        file(target, tmp -> Files.writeString(tmp, text));
    }

    /**
     * Writes a directory: {@code content} fills the fresh directory {@code tmp}, which is then
     * renamed to {@code target}. An existing target is replaced only when {@code overwrite}
     * (moved aside, the new one moved in, the old one deleted); else a {@link UserError}.
     */
    public static void directory(Path target, boolean overwrite, Content content) throws IOException {
        Path abs = target.toAbsolutePath().normalize();
        if (Files.exists(abs) && !overwrite) {
            throw new UserError("output " + target + " already exists; pass --overwrite to replace it");
        }
        Path tmp = temporarySibling(abs, "tmp");
        try {
            Files.createDirectory(tmp);
            content.writeTo(tmp);
            publish(tmp, abs, overwrite);
        } finally {
            deleteTree(tmp);
        }
    }

    private static Path temporarySibling(Path abs, String kind) throws IOException {
        Path parent = abs.getParent();
        Files.createDirectories(parent);
        return parent.resolve("." + abs.getFileName() + "." + kind + "-" + UUID.randomUUID());
    }

    private static void publish(Path tmp, Path target, boolean overwrite) throws IOException {
        Path old = null;
        if (Files.exists(target)) {
            if (!overwrite) {
                throw new UserError("output " + target + " already exists; pass --overwrite to replace it");
            }
            old = target.resolveSibling("." + target.getFileName() + ".old-" + UUID.randomUUID());
            Files.move(target, old, StandardCopyOption.ATOMIC_MOVE);
        }
        try {
            Files.move(tmp, target, StandardCopyOption.ATOMIC_MOVE);
        } catch (FileAlreadyExistsException e) {
            throw new UserError("output " + target + " appeared while writing; nothing was replaced");
        } catch (AtomicMoveNotSupportedException e) {
            throw new IOException("the filesystem of " + target + " cannot rename atomically", e);
        }
        deleteTree(old);
    }

    /** Deletes a file or directory tree, best effort (a leftover hidden temporary is harmless). */
    public static void deleteTree(Path dir) {
        if (dir == null || !Files.exists(dir)) {
            return;
        }
        try (Stream<Path> walk = Files.walk(dir)) {
            walk.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
        } catch (IOException ignored) {
            // best effort: a leftover hidden temporary never looks like an output
        }
    }
}
