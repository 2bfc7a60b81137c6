package org.cryowarden.daemon.broker;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.jar.JarEntry;
import java.util.jar.JarFile;
import org.junit.jupiter.api.Test;

/**
 * Checks the built runnable jar, not the class path: runs in the integration-test phase, after the shade
 * plugin, through {@code mvn -B -o -pl daemon -am verify}.
 */
class RunnableJarTest {

    private static final Path JAR = Path.of(System.getProperty("cryowarden.jar", "target/cryowarden.jar"));
    private static final Path TEST_CLASSES = Path.of(System.getProperty("cryowarden.testClasses", "target/test-classes"));
    private static final long SIZE_GOAL_BYTES = 50L * 1024 * 1024;

    @Test
    void embeddedBrokerStartsFromTheRunnableJarAndCarriesAMessage() throws Exception {
        Path log = Files.createTempFile("cryowarden-jar-check-", ".log");
        Process check = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-cp", JAR + java.io.File.pathSeparator + TEST_CLASSES, RunnableJarCheck.class.getName())
                .redirectErrorStream(true)
                .redirectOutput(log.toFile())
                .start();
        boolean ended = check.waitFor(180, TimeUnit.SECONDS);
        if (!ended) {
            check.destroyForcibly().waitFor(10, TimeUnit.SECONDS);
        }
        String text = Files.readString(log);
        Files.delete(log);
        System.out.println(text);

        assertThat(ended).as("check ended within 180 s: " + text).isTrue();
        assertThat(check.exitValue()).as(text).isZero();
        assertThat(text).contains("round trip ok").contains("logback.xml from jar:file:");
    }

    @Test
    void runnableJarCarriesOurLogbackConfigurationAndNoOther() throws Exception {
        try (JarFile jar = new JarFile(JAR.toFile())) {
            // Files named logback.xml (ours, or a dependency's that slipped in); run-logback.xml is our own too.
            List<String> logbacks = jar.stream().map(JarEntry::getName)
                    .filter(n -> n.equals("logback.xml") || n.endsWith("/logback.xml")).toList();
            assertThat(logbacks).containsExactly("logback.xml");
            try (InputStream in = jar.getInputStream(jar.getEntry("logback.xml"))) {
                assertThat(new String(in.readAllBytes(), StandardCharsets.UTF_8))
                        .isEqualTo(Files.readString(Path.of("src/main/resources/logback.xml")));
            }
        }
    }

    @Test
    void runnableJarLeavesOutNativeCodeTheInMemoryBrokerNeverLoads() throws Exception {
        try (JarFile jar = new JarFile(JAR.toFile())) {
            assertThat(jar.stream().map(JarEntry::getName))
                    .noneMatch(n -> n.startsWith("librocksdbjni"))
                    .noneMatch(n -> n.startsWith("jetbrains/exodus/"))
                    .noneMatch(n -> n.startsWith("org/bouncycastle/"))
                    .anyMatch(n -> n.equals("org/rocksdb/CompressionType.class"));
        }
    }

    @Test
    void runnableJarStaysUnderFiftyMegabytes() throws Exception {
        long size = Files.size(JAR);
        System.out.printf("runnable jar: %d bytes (%.1f MiB)%n", size, size / 1024.0 / 1024.0);
        assertThat(size).isLessThan(SIZE_GOAL_BYTES);
    }
}
