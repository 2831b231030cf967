# Shared by the scripts: where the jars are, how to build them, the JVM flags Spark needs.
# shellcheck shell=bash
root=${root:-$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)}
export SPARK_LOCAL_IP=${SPARK_LOCAL_IP:-127.0.0.1}

# Which Spark line: EDGEWISE_SPARK=3 (Spark 3.5 / Scala 2.12, the default build, jars in target/)
# or EDGEWISE_SPARK=4 (Spark 4 / Scala 2.13, `mvn -Pspark4`, jars edgewise-*-spark4.jar in
# target/spark4/). Unset: the Spark 3.5 line if its jars are built, else the Spark 4 line if its
# jars are, else the Spark 3.5 line (built on first use).
edgewise_line=${EDGEWISE_SPARK:-}
if [ -z "$edgewise_line" ]; then
  if [ ! -f "$root/job/target/edgewise-job.jar" ] && [ -f "$root/job/target/spark4/edgewise-job-spark4.jar" ]; then
    edgewise_line=4
  else
    edgewise_line=3
  fi
fi
case $edgewise_line in
  3) edgewise_target=target; edgewise_suffix=""; edgewise_profile="" ;;
  4) edgewise_target=target/spark4; edgewise_suffix="-spark4"; edgewise_profile="-Pspark4" ;;
  *) echo "edgewise: EDGEWISE_SPARK must be 3 or 4, got '$edgewise_line'" >&2; exit 2 ;;
esac

core_jar=$root/driver/core/$edgewise_target/edgewise-core$edgewise_suffix.jar
cli_jar=$root/driver/cli/$edgewise_target/edgewise-cli$edgewise_suffix.jar
job_jar=$root/job/$edgewise_target/edgewise-job$edgewise_suffix.jar

edgewise_build_if_needed() {
  if [ "${EDGEWISE_REBUILD:-0}" = "1" ] || [ ! -f "$core_jar" ] || [ ! -f "$cli_jar" ] || [ ! -f "$job_jar" ] \
     || [ ! -f "$root/job/$edgewise_target/classpath-runtime.txt" ] \
     || [ ! -f "$root/driver/cli/$edgewise_target/classpath-runtime.txt" ]; then
    echo "edgewise: building the Spark $edgewise_line line (mvn ${edgewise_profile:+$edgewise_profile }-DskipTests package; first time takes a few minutes)…" >&2
    (cd "$root" && mvn -B -q $edgewise_profile -DskipTests package >&2)
  fi
}

# A module's runtime classpath: its "compile" (compile + provided) and "runtime" (compile +
# runtime) classpath files joined, duplicates dropped, order kept. Never test-scoped jars
# (NOTES-deps pitfall 8): no classpath file lists them.
edgewise_module_classpath() {
  local dir=$1
  { tr ':' '\n' < "$dir/$edgewise_target/classpath-compile.txt"; echo; tr ':' '\n' < "$dir/$edgewise_target/classpath-runtime.txt"; echo; } \
    | awk 'NF && !seen[$0]++' | paste -sd: -
}

# A module's benchmark classpath: its classes and test classes (src/bench/java is compiled with the
# tests), the core's test fixtures (driver/core/target/test-classes) and its runtime jars — no
# test-scoped jar (JUnit and friends are not needed to run a benchmark).
edgewise_bench_classpath() {
  local dir=$1
  echo "$dir/$edgewise_target/test-classes:$dir/$edgewise_target/classes:$root/driver/core/$edgewise_target/test-classes:$(edgewise_module_classpath "$dir")"
}

# Spark 3.5 and 4 on Java 17 need these module flags (org.apache.spark.launcher.JavaModuleOptions).
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
# Codec that Commons CSV uses) are part of every Spark 3.5 and Spark 4 distribution.
edgewise_app_jars() {
  local extra
  extra=$(tr ':' '\n' < "$root/job/$edgewise_target/classpath-runtime.txt" \
    | grep -E '/(picocli|commons-csv)-[0-9][^/]*\.jar$' | paste -sd, -)
  echo "$job_jar,$core_jar${extra:+,$extra}"
}
