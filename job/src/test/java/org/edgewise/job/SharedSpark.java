package org.edgewise.job;

import com.holdenkarau.spark.testing.JavaDatasetSuiteBase;
import org.apache.spark.SparkConf;
import org.apache.spark.sql.SparkSession;

/**
 * The one SparkSession every Spark test class shares ({@code local[2]}), started once per test JVM
 * through spark-testing-base and left to the JVM's shutdown.
 */
final class SharedSpark {
    private static Base base;

    private SharedSpark() {
    }

    static synchronized SparkSession session() {
        if (base == null) {
            base = new Base();
            base.runBefore();
            base.spark().sparkContext().setLogLevel("WARN");
        }
        return base.spark();
    }

    /** spark-testing-base's suite base with our configuration. */
    static final class Base extends JavaDatasetSuiteBase {
        @Override
        public SparkConf conf() {
            return new SparkConf().setMaster("local[2]").setAppName("edgewise-tests")
                    .set("spark.ui.enabled", "false")
                    .set("spark.driver.host", "127.0.0.1")
                    .set("spark.driver.bindAddress", "127.0.0.1")
                    .set("spark.sql.shuffle.partitions", "4");
        }

        @Override
        public boolean enableHiveSupport() {
            return false;
        }
    }
}
