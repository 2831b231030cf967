package org.edgewise.driver.store;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.net.URI;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.List;
import java.util.Set;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.UserError;

/**
 * Where a score store may be written, checked before any work: {@code --overwrite} replaces only
 * an existing <em>score store</em> — a directory holding an Edgewise {@code manifest.json} and
 * nothing but the store's parts — never a file, a directory holding anything else, or a directory
 * holding an input; and the directory must be writable. Nothing is lost by a wrong {@code --out}.
 */
public final class StoreTarget {
    /** What a store directory may hold. */
    static final Set<String> PARTS = Set.of(StoreFormat.MANIFEST, StoreFormat.SCORES, StoreFormat.COUNTS);
    private StoreTarget() {
    }

    /**
     * Refuses {@code out} unless it is new, or an existing store and {@code overwrite}; refuses an
     * {@code out} that is, holds or lies inside one of the local {@code inputs} (paths or {@code file:} URIs;
     * other filesystems cannot hold a local store); refuses an unwritable directory. {@code outName}
     * and {@code overwriteName} name the target and the permission to replace it in messages (the
     * CLI: {@code --out}, {@code --overwrite}).
     */
    public static void check(Path out, boolean overwrite, List<String> inputs, String outName, String overwriteName) {
        Path abs = real(out);
        for (String in : inputs) {
            Path p = localPath(in);
            if (p != null && real(p).startsWith(abs)) {
                throw new UserError(outName + " " + out + (real(p).equals(abs) ? " is" : " holds") + " the input " + in
                        + "; write the store elsewhere");
            }
            if (p != null && abs.startsWith(real(p))) {
                throw new UserError(outName + " " + out + " is inside the input " + in + "; write the store elsewhere");
            }
        }
        if (Files.exists(out, LinkOption.NOFOLLOW_LINKS)) {
            String kind = AtomicWrite.notRegular(out);
            if (kind != null) {
                throw new UserError(outName + " " + out + " is " + kind + ", not a store; give a new name or a store");
            }
            if (!overwrite) {
                throw new UserError("output " + out + " already exists; pass " + overwriteName + " to replace it");
            }
            checkIsStore(out, outName, overwriteName + " replaces only a score store; ");
        }
        AtomicWrite.checkWritable(out, outName);
    }

    private static void checkIsStore(Path out, String outName, String only) {
        if (!Files.isDirectory(out)) {
            throw new UserError(only + out + " is a file, not a store; choose another " + outName);
        }
        Path manifest = out.resolve(StoreFormat.MANIFEST);
        if (!Files.isRegularFile(manifest)) {
            throw new UserError(only + out + " is a directory without " + StoreFormat.MANIFEST + "; choose another " + outName);
        }
        try {
            if (Files.size(manifest) > org.edgewise.driver.JsonInput.MAX_BYTES) {
                throw new IOException("too large for a manifest");
            }
            JsonNode tree = org.edgewise.driver.JsonInput.mapper().readTree(manifest.toFile());
            if (tree == null || !tree.isObject() || !tree.has("formatVersion") || !tree.has("variables")) {
                throw new UserError(only + out + "/" + StoreFormat.MANIFEST + " is not a store manifest; choose another " + outName);
            }
        } catch (IOException e) {
            throw new UserError(only + out + "/" + StoreFormat.MANIFEST + " is not a store manifest; choose another " + outName);
        }
        try (DirectoryStream<Path> ds = Files.newDirectoryStream(out)) {
            for (Path c : ds) {
                String name = c.getFileName().toString();
                boolean sample = name.equals(MissingValues.SAMPLE) && Files.isDirectory(c)
                        && Files.isRegularFile(c.resolve("sample.json"));
                if (!sample && (!PARTS.contains(name) || !Files.isRegularFile(c))) {
                    throw new UserError(only + out + " also holds " + name + ", which is not part of a store;"
                            + " choose another " + outName);
                }
            }
        } catch (IOException e) {
            throw new UserError("cannot list " + outName + " " + out + ": " + AtomicWrite.reason(e));
        }
    }

    /** A local input as a path, or null for another filesystem ({@code hdfs:}, {@code s3a:} …). */
    static Path localPath(String input) {
        try {
            if (input.startsWith("file:")) {
                return Path.of(URI.create(input));
            }
            if (input.matches("[A-Za-z][A-Za-z0-9+.-]*://.*")) {
                return null;
            }
            return Path.of(input);
        } catch (IllegalArgumentException e) {
            return null; // InvalidPathException too: the input is refused, naming it, when it is read
        }
    }

    /** The path with symbolic links resolved as far as it exists. */
    static Path real(Path p) {
        return AtomicWrite.realPath(p);
    }
}
