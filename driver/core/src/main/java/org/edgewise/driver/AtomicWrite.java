package org.edgewise.driver;

import java.io.IOException;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.DirectoryStream;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.FileSystemException;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.Comparator;
import java.util.Set;
import java.util.UUID;
import java.util.concurrent.ConcurrentHashMap;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

/**
 * The one way outputs are written: to a hidden temporary sibling of the target
 * ({@code .<name>.tmp-<pid>-<uuid>}, same directory, so the same filesystem), renamed into place
 * only when complete. A failed or killed writer leaves the target as it was, never half-written.
 *
 * <p>Leftovers: a temporary is deleted when the write fails, by a shutdown hook on any exit the
 * JVM sees (SIGTERM, Ctrl-C, {@code System.exit}), and — after a {@code kill -9}, which no hook
 * sees — by the next write to the same target, which removes every temporary of a process that is
 * no longer alive. An old store moved aside ({@code .<name>.old-<pid>-<uuid>}) by a writer killed
 * before the new one was in place is moved back, never deleted.
 */
public final class AtomicWrite {
    /** {@code .<name>.(tmp|old)-<pid>-<uuid>}; group 1 the kind, group 2 the pid. */
    private static final String LEFTOVER = "\\.(tmp|old)-(\\d+)-[0-9a-f-]{36}";
    private static final Set<Path> IN_PROGRESS = ConcurrentHashMap.newKeySet();

    static {
        Runtime.getRuntime().addShutdownHook(new Thread(() -> IN_PROGRESS.forEach(AtomicWrite::deleteTree),
                "edgewise-temporary-cleanup"));
    }

    private AtomicWrite() {
    }

    /** Writes the content into the temporary path it is given. */
    @FunctionalInterface
    public interface Content {
        void writeTo(Path tmp) throws IOException;
    }

    /**
     * Checks an output file before any work: an existing {@code target} is replaced only with
     * {@code overwrite} and only when it is a file, and its directory must be writable.
     *
     * @param option          how the caller names the target ({@code --out}), for the message
     * @param overwriteOption how the caller names the permission to replace it ({@code --overwrite})
     */
    public static void checkFile(Path target, boolean overwrite, String option, String overwriteOption) {
        if (Files.isDirectory(target)) {
            throw new UserError(option + " " + target + " is a directory; give a file name");
        }
        String kind = notRegular(target);
        if (kind != null) {
            throw new UserError(option + " " + target + " is " + kind + ", not a regular file; give a file name");
        }
        if (Files.exists(target) && !overwrite) {
            throw new UserError(option + " " + target + " already exists; pass " + overwriteOption + " to replace it");
        }
        checkWritable(target, option);
    }

    /**
     * Checks that a target can be created: the nearest existing ancestor directory of its parent is
     * a directory this process can create files in (tried with an empty probe file, removed at once).
     */
    public static void checkWritable(Path target, String option) {
        Path abs = target.toAbsolutePath().normalize();
        Path dir = abs.getParent();
        while (dir != null && !Files.exists(dir)) {
            dir = dir.getParent();
        }
        if (dir == null || !Files.isDirectory(dir)) {
            throw new UserError("cannot write " + option + " " + target + ": " + (dir == null ? "no parent directory"
                    : dir + " is not a directory"));
        }
        removeDeadProbes(dir);
        // named with the pid like a temporary: removed by the shutdown hook, and after a kill -9 by the next check
        Path probe = dir.resolve(leftoverName(abs, "probe"));
        IN_PROGRESS.add(probe);
        try {
            Files.createFile(probe);
            Files.delete(probe);
        } catch (IOException e) {
            throw new UserError("cannot write " + option + " " + target + ": directory " + dir + " is not writable ("
                    + reason(e) + ")");
        } finally {
            IN_PROGRESS.remove(probe);
        }
    }

    /** {@code .<name>.probe-<pid>-<uuid>}: group 1 the pid. */
    private static final Pattern PROBE = Pattern.compile("\\..+\\.probe-(\\d+)-[0-9a-f-]{36}");

    /**
     * Removes the empty writability probes in {@code dir} left by checks that were killed ({@code kill
     * -9}: no hook runs) — those whose process is no longer alive; anything else is left alone.
     */
    static void removeDeadProbes(Path dir) {
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(dir, ".*.probe-*")) {
            for (Path c : ds) {
                Matcher m = PROBE.matcher(c.getFileName().toString());
                if (!m.matches() || ProcessHandle.of(Long.parseLong(m.group(1))).map(ProcessHandle::isAlive).orElse(false)) {
                    continue;
                }
                BasicFileAttributes a = Files.readAttributes(c, BasicFileAttributes.class, LinkOption.NOFOLLOW_LINKS);
                if (a.isRegularFile() && a.size() == 0) {
                    Files.deleteIfExists(c);
                }
            }
        } catch (IOException | NumberFormatException | SecurityException ignored) {
            // best effort: a hidden empty probe never looks like an output
        }
    }

    /** The path with symbolic links resolved as far as it exists (the rest appended as given, normalized). */
    public static Path realPath(Path p) {
        Path abs = p.toAbsolutePath().normalize();
        Path existing = abs;
        while (existing != null && !Files.exists(existing)) {
            existing = existing.getParent();
        }
        if (existing == null) {
            return abs;
        }
        try {
            return existing.toRealPath().resolve(existing.relativize(abs)).normalize();
        } catch (IOException | java.nio.file.InvalidPathException e) {
            return abs;
        }
    }

    /**
     * Refuses an output {@code target} that is one of a command's inputs, or lies inside an input
     * directory, by real path (symbolic links resolved, hard links compared): {@code inputs} maps how
     * the caller names each input (e.g. {@code --store}) to its path; {@code option} names the output.
     */
    public static void checkNotInput(Path target, String option, java.util.Map<String, Path> inputs) {
        Path out = realPath(target);
        for (java.util.Map.Entry<String, Path> in : inputs.entrySet()) {
            Path real = realPath(in.getValue());
            boolean same = out.equals(real);
            try {
                same |= Files.exists(target) && Files.exists(in.getValue()) && Files.isSameFile(target, in.getValue());
            } catch (IOException e) {
                // unreadable: the read of the input reports it
            }
            if (same) {
                throw new UserError(option + " " + target + " is the input " + in.getKey() + " " + in.getValue()
                        + "; write elsewhere");
            }
            if (out.startsWith(real) && Files.isDirectory(real)) {
                throw new UserError(option + " " + target + " is inside the input " + in.getKey() + " " + in.getValue()
                        + "; write elsewhere");
            }
        }
    }

    /**
     * What an existing {@code path} is when it is neither a regular file nor a directory ("a
     * symbolic link", "a FIFO", "a device file", "a socket"), links not followed; null when it is
     * missing, a regular file or a directory.
     */
    public static String notRegular(Path path) {
        BasicFileAttributes a;
        try {
            a = Files.readAttributes(path, BasicFileAttributes.class, LinkOption.NOFOLLOW_LINKS);
        } catch (IOException e) {
            return null; // missing (or unreadable: the write reports it)
        }
        if (a.isRegularFile() || a.isDirectory()) {
            return null;
        }
        if (a.isSymbolicLink()) {
            return "a symbolic link";
        }
        try {
            Object mode = Files.getAttribute(path, "unix:mode", LinkOption.NOFOLLOW_LINKS);
            int type = (Integer) mode & 0170000;
            return switch (type) {
                case 0010000 -> "a FIFO";
                case 0140000 -> "a socket";
                case 0020000, 0060000 -> "a device file";
                default -> "not a regular file";
            };
        } catch (IOException | UnsupportedOperationException | IllegalArgumentException e) {
            return "a special file";
        }
    }

    /**
     * Writes a file that replaces an existing {@code target}: {@code content} writes {@code tmp},
     * which then replaces {@code target} — only a regular file (a symbolic link, FIFO or device
     * file that took its place meanwhile is refused).
     */
    public static void file(Path target, Content content) throws IOException {
        file(target, true, content);
    }

    /**
     * Writes a file: {@code content} writes {@code tmp}, which is then put in place. With
     * {@code replace} it replaces a regular file {@code target} (never a symbolic link, FIFO or
     * device file); without, a {@code target} that appeared since the caller checked (another run
     * writing the same file) is kept and a {@link UserError} thrown: the new file is hard-linked
     * to the target name, which fails atomically when the name exists, and the temporary removed.
     */
    public static void file(Path target, boolean replace, Content content) throws IOException {
        Path abs = target.toAbsolutePath().normalize();
        Path tmp = temporarySibling(abs, "tmp");
        try {
            content.writeTo(tmp);
            if (replace) {
                refuseSpecial(target, abs);
                Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
            } else {
                publishNew(tmp, target, abs);
            }
        } finally {
            done(tmp);
        }
    }

    private static void refuseSpecial(Path target, Path abs) {
        if (Files.isDirectory(abs, LinkOption.NOFOLLOW_LINKS)) {
            throw new UserError("output " + target + " became a directory while writing; nothing was replaced");
        }
        String kind = notRegular(abs);
        if (kind != null) {
            throw new UserError("output " + target + " is " + kind + ", not a regular file; nothing was replaced");
        }
    }

    /** Puts {@code tmp} at {@code abs} unless a file of that name exists (then it is kept). */
    private static void publishNew(Path tmp, Path target, Path abs) throws IOException {
        try {
            Files.createLink(abs, tmp);
            return;
        } catch (FileAlreadyExistsException e) {
            throw appeared(target);
        } catch (UnsupportedOperationException | FileSystemException e) {
            if (e instanceof FileSystemException f && Files.exists(abs, LinkOption.NOFOLLOW_LINKS)) {
                throw appeared(target);
            }
            // no hard links on this filesystem: a move that refuses an existing target (a narrow window)
        }
        try {
            Files.move(tmp, abs);
        } catch (FileAlreadyExistsException e) {
            throw appeared(target);
        }
    }

    private static UserError appeared(Path target) {
        return new UserError("output " + target + " appeared while writing (another run writing it?); it was kept and"
                + " nothing was written");
    }

    /** Writes {@code text} (UTF-8) as a file, replacing a regular file {@code target}. */
    public static void text(Path target, String text) throws IOException {
        file(target, tmp -> Files.writeString(tmp, text));
    }

    /** Writes {@code text} (UTF-8) as a file; an existing {@code target} is replaced only with {@code replace}. */
    public static void text(Path target, boolean replace, String text) throws IOException {
        file(target, replace, tmp -> Files.writeString(tmp, text));
    }

    /**
     * Writes a directory: {@code content} fills the fresh directory {@code tmp}, which is then
     * renamed to {@code target}. An existing target is replaced only when {@code overwrite}
     * (moved aside, the new one moved in, the old one deleted); else a {@link UserError}.
     * What may be replaced is the caller's to check (a score store only: {@code StoreTarget}).
     * {@code overwriteOption} names the permission to replace in the message ({@code --overwrite}).
     */
    public static void directory(Path target, boolean overwrite, String overwriteOption, Content content)
            throws IOException {
        Path abs = target.toAbsolutePath().normalize();
        if (Files.isDirectory(abs.getParent())) {
            removeLeftovers(abs); // first: a store moved aside by a killed writer is back before the check
        }
        if (Files.exists(abs, LinkOption.NOFOLLOW_LINKS) && !overwrite) {
            throw new UserError("output " + target + " already exists; pass " + overwriteOption + " to replace it");
        }
        Path tmp = temporarySibling(abs, "tmp");
        try {
            Files.createDirectory(tmp);
            content.writeTo(tmp);
            publish(tmp, abs, overwrite, overwriteOption);
        } finally {
            done(tmp);
        }
    }

    private static Path temporarySibling(Path abs, String kind) throws IOException {
        Path parent = abs.getParent();
        Files.createDirectories(parent);
        removeLeftovers(abs);
        Path tmp = parent.resolve(leftoverName(abs, kind));
        IN_PROGRESS.add(tmp);
        return tmp;
    }

    private static String leftoverName(Path abs, String kind) {
        return "." + abs.getFileName() + "." + kind + "-" + ProcessHandle.current().pid() + "-" + UUID.randomUUID();
    }

    private static void done(Path tmp) {
        deleteTree(tmp);
        IN_PROGRESS.remove(tmp);
    }

    /**
     * Removes the temporaries of {@code target} left by writers that are no longer alive (killed with
     * {@code kill -9}); an old copy moved aside is moved back when the target is missing.
     */
    static void removeLeftovers(Path target) {
        Pattern p = Pattern.compile(Pattern.quote("." + target.getFileName()) + LEFTOVER);
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(target.getParent(), "." + target.getFileName() + ".*")) {
            for (Path c : ds) {
                Matcher m = p.matcher(c.getFileName().toString());
                if (!m.matches() || ProcessHandle.of(Long.parseLong(m.group(2))).map(ProcessHandle::isAlive).orElse(false)) {
                    continue;
                }
                if (m.group(1).equals("old") && !Files.exists(target)) {
                    Files.move(c, target, StandardCopyOption.ATOMIC_MOVE);
                } else {
                    deleteTree(c);
                }
            }
        } catch (IOException | NumberFormatException ignored) {
            // best effort: a leftover hidden temporary never looks like an output
        }
    }

    private static void publish(Path tmp, Path target, boolean overwrite, String overwriteOption) throws IOException {
        Path old = null;
        if (Files.exists(target, LinkOption.NOFOLLOW_LINKS)) {
            if (!overwrite) {
                throw new UserError("output " + target + " already exists; pass " + overwriteOption + " to replace it");
            }
            if (!Files.isDirectory(target, LinkOption.NOFOLLOW_LINKS)) {
                String kind = notRegular(target);
                throw new UserError("output " + target + " is " + (kind == null ? "a file" : kind) + ", not a store;"
                        + " nothing was replaced");
            }
            old = target.resolveSibling(leftoverName(target, "old"));
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

    /** An I/O failure as a reason a user can read: the message, or what the exception type says. */
    public static String reason(IOException e) {
        String what = switch (e.getClass().getSimpleName()) {
            case "AccessDeniedException" -> "permission denied";
            case "NoSuchFileException" -> "no such file or directory";
            case "FileSystemException" -> e.getMessage() == null ? "file system error" : e.getMessage();
            case "ReadOnlyFileSystemException" -> "read-only file system";
            default -> e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
        };
        if (e instanceof java.nio.file.FileSystemException f && f.getReason() != null) {
            return f.getReason();
        }
        return what;
    }
}
