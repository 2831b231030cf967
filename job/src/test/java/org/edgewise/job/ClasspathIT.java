package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.jar.JarFile;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;

/**
 * What ships (issue "layered build"): the classpaths the launcher builds for {@code tally} and
 * for the driver's commands hold no test-only jar, the project jars on them hold no benchmark or
 * test-fixture class, and a cluster's executors get exactly the job jar, the core jar and tally's
 * command-line parser. Runs after {@code package} (failsafe), through scripts/lib.sh itself.
 */
class ClasspathIT {
    /**
     * Test-only artifacts that must never be on a runtime classpath (NOTES-deps pitfall 8). Not
     * hive-storage-api: a compile dependency of spark-sql itself (its ORC vectors), not of Hive.
     */
    private static final Pattern TEST_ONLY = Pattern.compile(
            "/(junit-|junit-jupiter|junit-platform|opentest4j|apiguardian|scalatest|scalactic|spark-testing-base|"
                    + "spark-hive|hive-(?!storage-api)|derby|archunit)[^/]*\\.jar$");

    /** "" for the Spark 3.5 line, "-spark4" under -Pspark4: the jars' names say their line. */
    private static final String SUFFIX = System.getProperty("edgewise.lineSuffix", "");

    private static Path root() {
        return Path.of(System.getProperty("edgewise.projectRoot", "..")).toAbsolutePath().normalize();
    }

    private static List<String> launcher(String function) throws IOException, InterruptedException {
        Path out = Files.createTempFile("edgewise-cp", ".txt");
        try {
            Process p = new ProcessBuilder("bash", "-c", "root=\"$1\"; . \"$1/scripts/lib.sh\"; " + function, "x",
                    root().toString()).redirectOutput(out.toFile()).redirectErrorStream(false).start();
            assertTrue(p.waitFor(60, TimeUnit.SECONDS), function + " did not finish");
            assertEquals(0, p.exitValue(), function + " failed");
            String text = Files.readString(out, StandardCharsets.UTF_8).trim();
            return new ArrayList<>(Arrays.asList(text.split("[:,]")));
        } finally {
            Files.deleteIfExists(out);
        }
    }

    private static void noTestJars(String what, List<String> cp) {
        assertFalse(cp.isEmpty(), what + " is empty");
        for (String e : cp) {
            assertFalse(TEST_ONLY.matcher(e).find(), what + " holds a test-only jar: " + e);
            assertFalse(e.endsWith("-tests.jar") || e.endsWith("/test-classes"), what + " holds test classes: " + e);
        }
    }

    private static void noBenchmarkClasses(List<String> cp) throws IOException {
        for (String e : cp) {
            if (e.contains("/edgewise-") && e.endsWith(".jar")) {
                try (JarFile jar = new JarFile(e)) {
                    jar.stream().map(x -> x.getName()).forEach(name -> {
                        assertFalse(name.contains("/bench/") && name.endsWith(".class"), e + " ships a benchmark class: " + name);
                        assertFalse(name.endsWith("InMemoryTally.class"), e + " ships a test fixture: " + name);
                    });
                }
            }
        }
    }

    @Test
    void tallyClasspathHasNoTestJarsAndNoBenchmarks() throws Exception {
        List<String> cp = launcher("edgewise_job_classpath");
        noTestJars("tally's classpath", cp);
        noBenchmarkClasses(cp);
        // the Spark of the line being built (spark-sql_2.12-3.5.9.jar, or spark-sql_2.13-4.1.1.jar under -Pspark4)
        String sparkJar = System.getProperty("edgewise.sparkJar", "spark-sql_2.12-3.5.9.jar");
        assertTrue(cp.stream().anyMatch(e -> e.endsWith("/" + sparkJar)), "embedded Spark for local runs: " + sparkJar);
        String other = sparkJar.contains("_2.12-") ? "_2.13-" : "_2.12-";
        assertFalse(cp.stream().anyMatch(e -> e.contains(other)), "no jar of the other Scala line (" + other + ")");
        assertEquals("edgewise-job" + SUFFIX + ".jar", Path.of(cp.get(0)).getFileName().toString());
        assertFalse(cp.stream().anyMatch(e -> e.contains("/edgewise-cli")), "the job never needs the driver CLI");
    }

    @Test
    void driverClasspathHasNoTestJarsNoSparkAndNoBenchmarks() throws Exception {
        List<String> cp = launcher("edgewise_driver_classpath");
        noTestJars("the driver commands' classpath", cp);
        noBenchmarkClasses(cp);
        assertFalse(cp.stream().anyMatch(e -> e.contains("/spark-")), "the driver is Spark-free");
        assertEquals("edgewise-cli" + SUFFIX + ".jar", Path.of(cp.get(0)).getFileName().toString());
    }

    @Test
    void executorsGetTheJobTheCoreAndTheParserOnly() throws Exception {
        List<String> jars = launcher("edgewise_app_jars").stream().map(e -> Path.of(e).getFileName().toString()).toList();
        assertEquals("edgewise-job" + SUFFIX + ".jar", jars.get(0));
        assertEquals("edgewise-core" + SUFFIX + ".jar", jars.get(1));
        for (String j : jars.subList(2, jars.size())) {
            assertTrue(j.startsWith("picocli-") || j.startsWith("commons-csv-"), "unexpected shipped jar " + j);
        }
    }
}
