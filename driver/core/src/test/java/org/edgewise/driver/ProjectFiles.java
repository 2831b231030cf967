package org.edgewise.driver;

import java.nio.file.Files;
import java.nio.file.Path;

/** Files of the project checkout (sample data, docs) for tests, wherever the module sits. */
public final class ProjectFiles {
    private ProjectFiles() {
    }

    /** {@code first/more…} under the project root (surefire's {@code edgewise.projectRoot}, else the first parent holding sample-data/). */
    public static Path path(String first, String... more) {
        String p = System.getProperty("edgewise.projectRoot");
        Path root = p != null ? Path.of(p) : null;
        if (root == null || !Files.isDirectory(root.resolve("sample-data"))) {
            root = Path.of("").toAbsolutePath();
            while (root != null && !Files.isDirectory(root.resolve("sample-data"))) {
                root = root.getParent();
            }
        }
        if (root == null) {
            throw new IllegalStateException("cannot find the project root (no sample-data/ above " + Path.of("").toAbsolutePath() + ")");
        }
        return root.resolve(Path.of(first, more));
    }
}
