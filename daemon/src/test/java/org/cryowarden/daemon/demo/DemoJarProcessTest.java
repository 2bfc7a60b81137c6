package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The README's first command from the built jar, as a process with no terminal and nothing but Java: a short
 * quench night with the embedded broker on the first free port from 1883 (the machine's own broker may hold
 * 1883: the demo must start anyway). It must say what it is not, and end with the summary.
 */
class DemoJarProcessTest {

    @TempDir
    Path folder;

    @Test
    void demoFromTheJarPrintsTheCautionTheNightAndItsSummary() throws Exception {
        Path journal = folder.resolve("demo.db");
        try (JarProcess demo = JarProcess.start(folder.resolve("demo.log"), "demo", "--fast", "--duration", "25min",
                "--journal", journal.toString())) {
            assertThat(demo.awaitExit(Duration.ofSeconds(150))).as("demo ended within 150 s").isTrue();
            String out = demo.output();
            assertThat(demo.process.exitValue()).as(out).isZero();

            assertThat(out).contains("cryowarden demo: Harbour Hall magnet quench");
            // First and last: the supervisory-layer caution.
            assertThat(out.indexOf(Caution.TEXT)).isNotNegative().isLessThan(out.indexOf("MQTT broker: "));
            assertThat(out.lastIndexOf(Caution.TEXT)).isGreaterThan(out.indexOf("Night summary"));
            assertThat(out).containsPattern("MQTT broker: tcp://127\\.0\\.0\\.1:\\d+ \\(embedded\\)");
            assertThat(out).containsPattern("Watch it: {4}mosquitto_sub -h 127\\.0\\.0\\.1 -p \\d+ -t 'cryowarden/#' -v");
            assertThat(out).contains("alarm.raised o2-magnet-hall-evacuate",
                    "interlock.tripped magnet-hall-ventilation");
            assertThat(out).containsPattern("Night summary \\(25min simulated in \\d+ s\\):\\n");
            assertThat(out).containsPattern("  alarms raised +([2-9]|\\d\\d)\\n");
            assertThat(out).containsPattern("  interlock trips +1\\n");
            assertThat(out).containsPattern("  events journaled +\\d+\\n");
            // The quench takes the hall's air below the 18 %vol evacuation level (the rule set's limit).
            assertThat(out).containsPattern("  lowest oxygen seen +1[0-7]\\.\\d %vol");
            assertThat(Files.size(journal)).isPositive();
        }
    }
}
