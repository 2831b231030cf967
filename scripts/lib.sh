# Shared by the scripts: where the jars are, how to build them, the JVM flags Spark needs.
# shellcheck shell=bash
root=${root:-$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)}
export SPARK_LOCAL_IP=${SPARK_LOCAL_IP:-127.0.0.1}

core_jar=$root/driver/core/target/edgewise-core.jar
cli_jar=$root/driver/cli/target/edgewise-cli.jar
job_jar=$root/job/target/edgewise-job.jar

edgewise_build_if_needed() {
  if [ "${EDGEWISE_REBUILD:-0}" = "1" ] || [ ! -f "$core_jar" ] || [ ! -f "$cli_jar" ] || [ ! -f "$job_jar" ] \
     || [ ! -f "$root/job/target/classpath-runtime.txt" ] || [ ! -f "$root/driver/cli/target/classpath-runtime.txt" ]; then
    echo "edgewise: building (mvn -DskipTests package; first time takes a few minutes)…" >&2
    (cd "$root" && mvn -B -q -DskipTests package >&2)
  fi
}

# A module's runtime classpath: its "compile" (compile + provided) and "runtime" (compile +
# runtime) classpath files joined, duplicates dropped, order kept. Never test-scoped jars
# (NOTES-deps pitfall 8): those are only in classpath-test.txt, which the benchmarks use.
edgewise_module_classpath() {
  local dir=$1
  { tr ':' '\n' < "$dir/target/classpath-compile.txt"; echo; tr ':' '\n' < "$dir/target/classpath-runtime.txt"; echo; } \
    | awk 'NF && !seen[$0]++' | paste -sd: -
}

# A module's benchmark classpath: its classes, test classes (src/bench/java is compiled with the
# tests) and every scope's jars.
edgewise_bench_classpath() {
  local dir=$1
  echo "$dir/target/test-classes:$dir/target/classes:$(cat "$dir/target/classpath-test.txt")"
}

# Spark 3.5 on Java 17 needs these module flags (org.apache.spark.launcher.JavaModuleOptions).
edgewise_java17_flags() {
  echo "-XX:+IgnoreUnrecognizedVMOptions --add-opens=java.base/java.lang=ALL-UNNAMED --add-opens=java.base/java.lang.invoke=ALL-UNNAMED --add-opens=java.base/java.lang.reflect=ALL-UNNAMED --add-opens=java.base/java.io=ALL-UNNAMED --add-opens=java.base/java.net=ALL-UNNAMED --add-opens=java.base/java.nio=ALL-UNNAMED --add-opens=java.base/java.util=ALL-UNNAMED --add-opens=java.base/java.util.concurrent=ALL-UNNAMED --add-opens=java.base/java.util.concurrent.atomic=ALL-UNNAMED --add-opens=java.base/jdk.internal.ref=ALL-UNNAMED --add-opens=java.base/sun.nio.ch=ALL-UNNAMED --add-opens=java.base/sun.nio.cs=ALL-UNNAMED --add-opens=java.base/sun.security.action=ALL-UNNAMED --add-opens=java.base/sun.util.calendar=ALL-UNNAMED --add-exports=java.base/sun.nio.ch=ALL-UNNAMED -Djdk.reflect.useDirectMethodHandle=false"
}

edgewise_driver_classpath() {
  echo "$cli_jar:$(edgewise_module_classpath "$root/driver/cli")"
}

edgewise_job_classpath() {
  echo "$job_jar:$(edgewise_module_classpath "$root/job")"
}

# The jars a cluster needs beyond the Spark it ships, comma-separated (spark.jars / spark-submit
# --jars): the thin job jar, the Spark-free core library, tally's command-line parser (picocli,
# used in the Spark driver JVM only) and Commons CSV (the core's CSV field reader; not in Spark).
# Executors fetch them from the driver; nothing of Edgewise has to be installed on the workers. The
# core's other dependencies (Commons Math, Jackson, Parquet, Hadoop, SLF4J, and the Commons IO and
# Codec that Commons CSV uses) are part of every Spark 3.5 distribution.
edgewise_app_jars() {
  local extra
  extra=$(tr ':' '\n' < "$root/job/target/classpath-runtime.txt" \
    | grep -E '/(picocli|commons-csv)-[0-9][^/]*\.jar$' | paste -sd, -)
  echo "$job_jar,$core_jar${extra:+,$extra}"
}
