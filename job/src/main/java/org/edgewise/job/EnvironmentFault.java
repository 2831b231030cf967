package org.edgewise.job;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.edgewise.driver.UserError;

/**
 * A tally that failed because of the machine it ran on, not its input nor Edgewise: no space left,
 * a temporary directory where Spark's compression library cannot be unpacked, a heap too small for
 * Spark or for the counts, a master URL Spark does not know, an input on a filesystem whose Hadoop
 * connector is not on the classpath. Each is named in one line with what to do ({@link #of});
 * anything else stays what it is (a user's mistake already worded, or a bug).
 *
 * <p>Recognised by the exception's class and message anywhere in the cause chain, as Spark and
 * Hadoop word them in the Spark 3.5 and 4 lines (the texts matched are quoted beside each case).
 */
final class EnvironmentFault {
    /** What the run was doing, for the message: the master, the inputs, the store, Spark's scratch parent. */
    record Run(String master, List<String> inputs, Path out, Path scratchParent) {
    }

    private static final Pattern SYSTEM_MEMORY = Pattern.compile("System memory (\\d+) must be at least (\\d+)");
    private static final Pattern NO_SCHEME = Pattern.compile("No FileSystem for scheme \"?([A-Za-z0-9+.-]+)\"?");
    private static final Pattern NO_CLASS = Pattern.compile("Class (org\\.apache\\.hadoop\\.fs\\.[\\w.]+) not found");

    /** Connector jars of the common object stores, by URI scheme (Hadoop's own modules). */
    private static final Map<String, String> CONNECTORS = Map.of(
            "s3a", "org.apache.hadoop:hadoop-aws", "abfs", "org.apache.hadoop:hadoop-azure",
            "abfss", "org.apache.hadoop:hadoop-azure", "wasb", "org.apache.hadoop:hadoop-azure",
            "wasbs", "org.apache.hadoop:hadoop-azure", "gs", "com.google.cloud.bigdataoss:gcs-connector");

    private EnvironmentFault() {
    }

    /** The one-line refusal for {@code t} when it is a fault of the environment, else null. */
    static UserError of(Throwable t, Run run) {
        String text = chainText(t);
        // "[INVALID_DRIVER_MEMORY] System memory 209715200 must be at least 471859200. Please increase heap size …"
        Matcher m = SYSTEM_MEMORY.matcher(text);
        if (m.find()) {
            return new UserError(String.format(Locale.ROOT, "Spark needs a heap of at least %s to start; this JVM has %s: "
                    + "give it more (EDGEWISE_JAVA_OPTS=-Xmx2g, or spark-submit --driver-memory 2g)",
                    mib(Long.parseLong(m.group(2))), mib(Long.parseLong(m.group(1)))), t);
        }
        // "Could not parse Master URL: 'bogus://x'"
        if (text.contains("Could not parse Master URL")) {
            return new UserError("--master " + run.master() + ": not a master URL Spark knows; give local[*], local[N], "
                    + "spark://HOST:PORT, or yarn or k8s://… through scripts/submit", t);
        }
        // "No FileSystem for scheme \"foo\"", "java.lang.ClassNotFoundException: Class org.apache.hadoop.fs.s3a.S3AFileSystem not found"
        Matcher s = NO_SCHEME.matcher(text);
        Matcher c = NO_CLASS.matcher(text);
        boolean noScheme = s.find();
        if (noScheme || c.find()) {
            String scheme = noScheme ? s.group(1) : schemeOf(run.inputs());
            String input = inputWithScheme(run.inputs(), scheme);
            String connector = CONNECTORS.get(scheme == null ? "" : scheme.toLowerCase(Locale.ROOT));
            return new UserError((input == null ? "input" : "--input " + input) + ": no Hadoop filesystem for "
                    + (scheme == null ? "its scheme" : "'" + scheme + ":'") + " on the classpath"
                    + (noScheme ? "" : " (" + c.group(1) + " not found)") + "; run tally through scripts/submit with "
                    + "--packages " + (connector == null ? "the connector's Maven coordinates" : connector + ":"
                    + hadoopVersion()) + ", or copy the file to a local path", t);
        }
        // snappy-java unpacks its native library into java.io.tmpdir: "no snappyjava in java.library.path",
        // "Could not initialize class org.xerial.snappy.Snappy"
        if (text.contains("snappyjava") || text.contains("org.xerial.snappy.Snappy")) {
            Path tmp = Path.of(System.getProperty("org.xerial.snappy.tempdir", System.getProperty("java.io.tmpdir")));
            return new UserError("cannot unpack Spark's compression library (Snappy's native code) into the temporary "
                    + "directory " + tmp + free(tmp) + ": it is full or not writable; free space there or give another "
                    + "(EDGEWISE_JAVA_OPTS=-Djava.io.tmpdir=DIR)", t);
        }
        // java.io.IOException: "No space left on device", also inside Hadoop's FSError; "Disk quota exceeded"
        if (text.contains("No space left on device") || text.contains("Disk quota exceeded")) {
            return new UserError("no space left on device (" + spaceReport(run) + "); free space, or write the store "
                    + "elsewhere (--out) or give Spark another scratch folder (--conf spark.local.dir=DIR)", t);
        }
        // java.lang.OutOfMemoryError in this JVM, or named in a task's failure sent back by an executor
        if (hasOutOfMemory(t) || text.contains("java.lang.OutOfMemoryError")) {
            return new UserError("ran out of memory (this JVM's heap is " + mib(Runtime.getRuntime().maxMemory())
                    + "); give it more (EDGEWISE_JAVA_OPTS=-Xmx…, or spark-submit --driver-memory), or lower "
                    + "--memory-budget or --max-parents, or use --candidates K", t);
        }
        return null;
    }

    private static boolean hasOutOfMemory(Throwable t) {
        for (Throwable c = t; c != null; c = c.getCause() == c ? null : c.getCause()) {
            if (c instanceof OutOfMemoryError) {
                return true;
            }
        }
        return false;
    }

    /** Free space where the run writes: the store's folder, Spark's scratch parent, the temporary directory, one entry per filesystem. */
    static String spaceReport(Run run) {
        Map<String, Path> places = new LinkedHashMap<>();
        Path outDir = run.out() == null ? null : run.out().toAbsolutePath().getParent();
        if (outDir != null) {
            places.put("the store's folder", outDir);
        }
        if (run.scratchParent() != null) {
            places.put("Spark's scratch folder", run.scratchParent());
        }
        places.put("the temporary directory", Path.of(System.getProperty("java.io.tmpdir")));
        List<String> parts = new ArrayList<>();
        List<Object> seen = new ArrayList<>();
        for (Map.Entry<String, Path> e : places.entrySet()) {
            Path p = existing(e.getValue());
            if (p == null) {
                continue;
            }
            try {
                Object store = Files.getFileStore(p);
                if (seen.contains(store)) {
                    continue;
                }
                seen.add(store);
                parts.add(e.getKey() + " " + e.getValue() + free(p));
            } catch (IOException | RuntimeException ignored) {
                // not reachable: left out of the report
            }
        }
        return String.join(", ", parts);
    }

    /** " (N MiB free)" for the filesystem holding {@code p}, or "" when unknown. */
    private static String free(Path p) {
        Path e = existing(p);
        if (e == null) {
            return "";
        }
        try {
            return " (" + mib(Files.getFileStore(e).getUsableSpace()) + " free)";
        } catch (IOException | RuntimeException ex) {
            return "";
        }
    }

    private static Path existing(Path p) {
        for (Path q = p.toAbsolutePath(); q != null; q = q.getParent()) {
            if (Files.isDirectory(q)) {
                return q;
            }
        }
        return null;
    }

    /** Bytes as MiB (one decimal below 10) or GiB. */
    static String mib(long bytes) {
        double m = bytes / (1024.0 * 1024.0);
        if (m >= 10240) {
            return String.format(Locale.ROOT, "%.1f GiB", m / 1024);
        }
        return String.format(Locale.ROOT, m < 10 ? "%.1f MiB" : "%.0f MiB", m);
    }

    /** The scheme of the first input not on the local filesystem (the one a missing filesystem class serves). */
    private static String schemeOf(List<String> inputs) {
        for (String in : inputs) {
            Matcher m = Pattern.compile("^([A-Za-z][A-Za-z0-9+.-]+):").matcher(in);
            if (m.find() && !m.group(1).equalsIgnoreCase("file")) {
                return m.group(1);
            }
        }
        return null;
    }

    private static String inputWithScheme(List<String> inputs, String scheme) {
        if (scheme == null) {
            return null;
        }
        for (String in : inputs) {
            if (in.toLowerCase(Locale.ROOT).startsWith(scheme.toLowerCase(Locale.ROOT) + ":")) {
                return in;
            }
        }
        return null;
    }

    private static String hadoopVersion() {
        try {
            return org.apache.hadoop.util.VersionInfo.getVersion();
        } catch (RuntimeException | LinkageError e) {
            return "<Hadoop version>";
        }
    }

    private static String chainText(Throwable t) {
        StringBuilder sb = new StringBuilder();
        for (Throwable c = t; c != null; c = c.getCause() == c ? null : c.getCause()) {
            sb.append(c).append('\n');
            for (Throwable s : c.getSuppressed()) {
                sb.append(s).append('\n');
                for (Throwable sc = s.getCause(); sc != null && sc != sc.getCause(); sc = sc.getCause()) {
                    sb.append(sc).append('\n');
                }
            }
        }
        return sb.toString();
    }
}
