# Shared by the scripts: where the jars are, how to build them, the JVM flags Spark needs.
# shellcheck shell=bash
root=${root:-$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)}
export SPARK_LOCAL_IP=${SPARK_LOCAL_IP:-127.0.0.1}

edgewise_build_if_needed() {
  if [ "${EDGEWISE_REBUILD:-0}" = "1" ] || [ ! -f "$root/driver/target/edgewise-driver.jar" ] \
     || [ ! -f "$root/job/target/edgewise-job.jar" ] || [ ! -f "$root/job/target/classpath.txt" ]; then
    echo "edgewise: building (mvn -DskipTests package; first time takes a few minutes)…" >&2
    (cd "$root" && mvn -B -q -DskipTests package >&2)
  fi
}

# Spark 3.5 on Java 17 needs these module flags (org.apache.spark.launcher.JavaModuleOptions).
edgewise_java17_flags() {
  echo "-XX:+IgnoreUnrecognizedVMOptions --add-opens=java.base/java.lang=ALL-UNNAMED --add-opens=java.base/java.lang.invoke=ALL-UNNAMED --add-opens=java.base/java.lang.reflect=ALL-UNNAMED --add-opens=java.base/java.io=ALL-UNNAMED --add-opens=java.base/java.net=ALL-UNNAMED --add-opens=java.base/java.nio=ALL-UNNAMED --add-opens=java.base/java.util=ALL-UNNAMED --add-opens=java.base/java.util.concurrent=ALL-UNNAMED --add-opens=java.base/java.util.concurrent.atomic=ALL-UNNAMED --add-opens=java.base/jdk.internal.ref=ALL-UNNAMED --add-opens=java.base/sun.nio.ch=ALL-UNNAMED --add-opens=java.base/sun.nio.cs=ALL-UNNAMED --add-opens=java.base/sun.security.action=ALL-UNNAMED --add-opens=java.base/sun.util.calendar=ALL-UNNAMED --add-exports=java.base/sun.nio.ch=ALL-UNNAMED -Djdk.reflect.useDirectMethodHandle=false"
}

edgewise_driver_classpath() {
  echo "$root/driver/target/edgewise-driver.jar:$(cat "$root/driver/target/classpath.txt")"
}

edgewise_job_classpath() {
  echo "$root/job/target/edgewise-job.jar:$root/driver/target/edgewise-driver.jar:$(cat "$root/job/target/classpath.txt")"
}

# The jars a cluster's executors need beyond the Spark it ships, comma-separated (the value of
# spark.jars / spark-submit --jars): the thin job jar, the Spark-free driver library and those
# of the driver's dependencies that a Spark distribution lacks. Executors fetch them from the
# driver; nothing of Edgewise has to be installed on the workers.
edgewise_app_jars() {
  local extra
  extra=$(tr ':' '\n' < "$root/job/target/classpath.txt" \
    | grep -E '/(picocli|progressbar|jline-[a-z]+)-[0-9][^/]*\.jar$' | paste -sd, -)
  echo "$root/job/target/edgewise-job.jar,$root/driver/target/edgewise-driver.jar${extra:+,$extra}"
}

