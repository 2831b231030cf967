package org.edgewise.driver;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.util.Properties;

/** The program's version, from the build (Maven resource filtering), never a literal in code. */
public final class Version {
    /** The version this build was made as, e.g. {@code 0.1.0}. */
    public static final String PROGRAM = load();

    private Version() {
    }

    private static String load() {
        try (InputStream in = Version.class.getResourceAsStream("edgewise.properties")) {
            if (in == null) {
                throw new IllegalStateException("edgewise.properties is missing from the core jar (broken build)");
            }
            Properties p = new Properties();
            p.load(in);
            String v = p.getProperty("version", "");
            if (v.isBlank() || v.contains("${")) {
                throw new IllegalStateException("edgewise.properties was not filtered by the build: version=" + v);
            }
            return v;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
