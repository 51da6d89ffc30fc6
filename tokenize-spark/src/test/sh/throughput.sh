#!/bin/sh
# Runs the hand-run timing harness dev.morsel.tokenize.spark.EncodeThroughput (test sources) with
# the same JVM options as the tests. Run from the worktree root. Compiles, never installs.
set -e
./mvnw -B -q -o -pl tokenize-spark -am test-compile dependency:build-classpath \
  -Dmdep.includeScope=test -Dmdep.outputFile=target/throughput.classpath
CP="tokenize-spark/target/test-classes:tokenize-spark/target/classes:$(cat tokenize-spark/target/throughput.classpath)"
SPARK_LOCAL_IP=127.0.0.1 exec java -Xmx2g -XX:+IgnoreUnrecognizedVMOptions \
  --add-modules=jdk.incubator.vector \
  --add-opens=java.base/java.lang=ALL-UNNAMED \
  --add-opens=java.base/java.lang.invoke=ALL-UNNAMED \
  --add-opens=java.base/java.lang.reflect=ALL-UNNAMED \
  --add-opens=java.base/java.io=ALL-UNNAMED \
  --add-opens=java.base/java.net=ALL-UNNAMED \
  --add-opens=java.base/java.nio=ALL-UNNAMED \
  --add-opens=java.base/java.util=ALL-UNNAMED \
  --add-opens=java.base/java.util.concurrent=ALL-UNNAMED \
  --add-opens=java.base/java.util.concurrent.atomic=ALL-UNNAMED \
  --add-opens=java.base/jdk.internal.ref=ALL-UNNAMED \
  --add-opens=java.base/sun.nio.ch=ALL-UNNAMED \
  --add-opens=java.base/sun.nio.cs=ALL-UNNAMED \
  --add-opens=java.base/sun.security.action=ALL-UNNAMED \
  --add-opens=java.base/sun.util.calendar=ALL-UNNAMED \
  --add-opens=java.security.jgss/sun.security.krb5=ALL-UNNAMED \
  -Dio.netty.tryReflectionSetAccessible=true \
  -cp "$CP" dev.morsel.tokenize.spark.EncodeThroughput
