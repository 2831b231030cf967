package org.edgewise.job;

import org.apache.spark.sql.SparkSession;
import org.junit.jupiter.api.extension.ExtensionContext;
import org.junit.jupiter.api.extension.ParameterContext;
import org.junit.jupiter.api.extension.ParameterResolver;

/**
 * The one SparkSession every Spark test class shares ({@code local[2]}, loopback, no web UI, 4
 * shuffle partitions), started once per test JVM and left to the JVM's shutdown. A JUnit 5
 * extension: {@code @ExtendWith(SharedSpark.class)} hands it to a {@code SparkSession} parameter
 * (e.g. of a {@code @BeforeAll} method); {@link #session()} gives it to code outside JUnit's reach.
 *
 * <p>Plain Spark API only, so the same class serves the Spark 3.5 and the Spark 4 build
 * (spark-testing-base, which used to start this session, has no Spark 4 build).
 */
public final class SharedSpark implements ParameterResolver {
    private static SparkSession spark;

    static synchronized SparkSession session() {
        if (spark == null) {
            spark = SparkSession.builder().master("local[2]").appName("edgewise-tests")
                    .config("spark.ui.enabled", "false")
                    .config("spark.driver.host", "127.0.0.1")
                    .config("spark.driver.bindAddress", "127.0.0.1")
                    .config("spark.sql.shuffle.partitions", "4")
                    .getOrCreate();
            spark.sparkContext().setLogLevel("WARN");
        }
        return spark;
    }

    @Override
    public boolean supportsParameter(ParameterContext p, ExtensionContext c) {
        return p.getParameter().getType() == SparkSession.class;
    }

    @Override
    public Object resolveParameter(ParameterContext p, ExtensionContext c) {
        return session();
    }
}
