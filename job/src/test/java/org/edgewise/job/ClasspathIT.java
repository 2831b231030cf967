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
                        assertFalse(name.contains("/bench/"), e + " ships a benchmark class: " + name);
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
        assertTrue(cp.stream().anyMatch(e -> e.endsWith("/spark-sql_2.12-3.5.9.jar")), "embedded Spark for local runs");
        assertFalse(cp.stream().anyMatch(e -> e.endsWith("/edgewise-cli.jar")), "the job never needs the driver CLI");
    }

    @Test
    void driverClasspathHasNoTestJarsNoSparkAndNoBenchmarks() throws Exception {
        List<String> cp = launcher("edgewise_driver_classpath");
        noTestJars("the driver commands' classpath", cp);
        noBenchmarkClasses(cp);
        assertFalse(cp.stream().anyMatch(e -> e.contains("/spark-")), "the driver is Spark-free");
    }

    @Test
    void executorsGetTheJobTheCoreAndTheParserOnly() throws Exception {
        List<String> jars = launcher("edgewise_app_jars").stream().map(e -> Path.of(e).getFileName().toString()).toList();
        assertEquals("edgewise-job.jar", jars.get(0));
        assertEquals("edgewise-core.jar", jars.get(1));
        for (String j : jars.subList(2, jars.size())) {
            assertTrue(j.startsWith("picocli-") || j.startsWith("commons-csv-"), "unexpected shipped jar " + j);
        }
    }
}
