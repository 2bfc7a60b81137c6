package org.cryowarden.daemon.journal;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.BufferedReader;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.Instant;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class JournalSurvivesKillTest {

    @TempDir
    Path folder;

    @Test
    void sequenceIsGaplessUpToTheLastCommitAndContinuesAfterKillMinusNine() throws Exception {
        Path file = folder.resolve("journal.db");
        Process child = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-cp", System.getProperty("java.class.path"), JournalWriterProcess.class.getName(), file.toString())
                .redirectErrorStream(true)
                .start();
        long lastReported = 0;
        try (BufferedReader out = new BufferedReader(new InputStreamReader(child.getInputStream(), StandardCharsets.UTF_8))) {
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
            String line;
            while (lastReported < 300 && System.nanoTime() < deadline && (line = out.readLine()) != null) {
                if (line.startsWith("committed ")) {
                    lastReported = Long.parseLong(line.substring("committed ".length()));
                }
            }
            child.destroyForcibly();
            assertThat(child.waitFor(30, TimeUnit.SECONDS)).as("child is gone").isTrue();
        } finally {
            child.destroyForcibly();
        }
        assertThat(lastReported).as("the child committed events before it was killed").isGreaterThanOrEqualTo(300);

        try (Journal journal = Journal.open(file, JournalSettings.defaults())) {
            long last = journal.lastSeq().orElseThrow();
            // Every commit the child reported is there; at most the transactions it was in when killed are not.
            assertThat(last).isGreaterThanOrEqualTo(lastReported);
            List<JournalEvent> events = journal.eventsAfter(0, (int) last + 10);
            assertThat(events).hasSize((int) last);
            for (int i = 0; i < events.size(); i++) {
                assertThat(events.get(i).seq()).isEqualTo(i + 1L);
            }
            assertThat(journal.alarmStates().get("o2-low").seq()).isEqualTo(last);
            assertThat(journal.outboxDepth("mqtt")).isEqualTo(last);

            long next = journal.append(NewEvent.about("daemon.restarted", Instant.parse("2026-03-14T03:00:00Z"),
                    "cryowarden", "{}"));

            assertThat(next).isEqualTo(last + 1);
        }
    }
}
