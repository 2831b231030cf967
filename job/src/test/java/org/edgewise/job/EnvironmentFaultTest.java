package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import org.apache.spark.SparkException;
import org.junit.jupiter.api.Test;

/**
 * Issue 23 item 12: the faults of the machine are worded in one line with what to do, recognised by
 * the texts Spark 3.5 and Hadoop 3.3 throw (copied from runs of {@code scripts/bench refusals}, where
 * each is also produced for real through the launcher); anything else is left alone.
 */
class EnvironmentFaultTest {
    static final EnvironmentFault.Run RUN = new EnvironmentFault.Run("bogus://x", List.of("s3a://bucket/x.csv"),
            Path.of("store"), null);

    static String message(Throwable t) {
        return EnvironmentFault.of(t, RUN).getMessage();
    }

    @Test
    void faultsAreNamedWithWhatToDo() {
        // org.apache.spark.SparkIllegalArgumentException from UnifiedMemoryManager.getMaxMemory, as Spark 3.5.9 words it
        assertEquals("Spark needs a heap of at least 450 MiB to start; this JVM has 200 MiB: give it more "
                + "(EDGEWISE_JAVA_OPTS=-Xmx2g, or spark-submit --driver-memory 2g)", message(new IllegalArgumentException(
                "[INVALID_DRIVER_MEMORY] System memory 209715200 must be at least 471859200. Please increase heap size using "
                        + "the --driver-memory option or \"spark.driver.memory\" in Spark configuration.")));
        assertEquals("--master bogus://x: not a master URL Spark knows; give local[*], local[N], spark://HOST:PORT, or yarn or "
                + "k8s://… through scripts/submit", message(new SparkException("Could not parse Master URL: 'bogus://x'")));
        assertEquals("--input s3a://bucket/x.csv: no Hadoop filesystem for 's3a:' on the classpath "
                + "(org.apache.hadoop.fs.s3a.S3AFileSystem not found); run tally through scripts/submit with --packages "
                + "org.apache.hadoop:hadoop-aws:" + org.apache.hadoop.util.VersionInfo.getVersion() + ", or copy the file to a "
                + "local path", message(new RuntimeException(new ClassNotFoundException(
                        "Class org.apache.hadoop.fs.s3a.S3AFileSystem not found"))));
        String tmp = System.getProperty("java.io.tmpdir");
        String snappy = message(new UnsatisfiedLinkError("no snappyjava in java.library.path: /usr/lib"));
        assertEquals(true, snappy.startsWith("cannot unpack Spark's compression library (Snappy's native code) into the "
                + "temporary directory " + tmp + " ("), snappy);
        assertEquals(true, snappy.endsWith("free): it is full or not writable; free space there or give another "
                + "(EDGEWISE_JAVA_OPTS=-Djava.io.tmpdir=DIR)"), snappy);
        String full = message(new IllegalStateException(new IOException("No space left on device")));
        assertEquals(true, full.startsWith("no space left on device (the store's folder "), full);
        assertEquals(true, full.endsWith("); free space, or write the store elsewhere (--out) or give Spark another scratch "
                + "folder (--conf spark.local.dir=DIR)"), full);
    }

    @Test
    void otherFailuresAreLeftAlone() {
        assertNull(EnvironmentFault.of(new IllegalStateException("encoded 3 rows, expected 4"), RUN));
        assertNull(EnvironmentFault.of(new IOException("Connection reset"), RUN));
    }

    @Test
    void sizesInMebibytes() {
        assertEquals("200 MiB", EnvironmentFault.mib(209_715_200L)); // 200 × 2^20
        assertEquals("0.2 MiB", EnvironmentFault.mib(204_800L));     // 200 KiB
        assertEquals("78.4 GiB", EnvironmentFault.mib(84_181_656_371L));
    }
}
