package org.cryowarden.daemon.history;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.BufferedReader;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import org.cryowarden.daemon.journal.BlockRow;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.rules.Reading;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A process recording raw history is killed with SIGKILL ({@code destroyForcibly}) mid-night: every reading up to its
 * last committed flush comes back bit for bit, and the next start says from when readings are lost and that at most
 * one flush interval is.
 */
class HistorySurvivesKillTest {

    @TempDir
    Path folder;

    @Test
    void killedRecorderKeepsEveryReadingUpToItsLastFlushAndTheRestartSaysWhatIsLost() throws Exception {
        Path file = folder.resolve("journal.db");
        Process child = new ProcessBuilder(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-cp", System.getProperty("java.class.path"), HistoryWriterProcess.class.getName(), file.toString())
                .redirectErrorStream(true)
                .start();
        int lastReported = -1;
        try (BufferedReader out = new BufferedReader(new InputStreamReader(child.getInputStream(),
                StandardCharsets.UTF_8))) {
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
            String line;
            // past 3600 readings, so that a sealed block and an open one are both on disk
            while (lastReported < 4000 && System.nanoTime() < deadline && (line = out.readLine()) != null) {
                if (line.startsWith("flushed ")) {
                    lastReported = Integer.parseInt(line.substring("flushed ".length()));
                }
            }
            // SIGKILL through the handle: Process.destroyForcibly would also close the pipe we still read from.
            child.toHandle().destroyForcibly();
            assertThat(child.waitFor(30, TimeUnit.SECONDS)).as("child is gone").isTrue();
            // The child may have flushed further before the kill landed; what it said is still in the pipe.
            while ((line = out.readLine()) != null) {
                if (line.startsWith("flushed ")) {
                    lastReported = Integer.parseInt(line.substring("flushed ".length()));
                }
            }
        } finally {
            child.destroyForcibly();
        }
        assertThat(lastReported).as("the child flushed past an hour before it was killed").isGreaterThanOrEqualTo(4000);

        try (Journal journal = Journal.open(file, JournalSettings.defaults())) {
            List<HistoryBlock> blocks = new ArrayList<>();
            for (BlockRow row : journal.history().blocks(HistoryWriterProcess.CHANNEL, HistoryWriterProcess.START,
                    HistoryWriterProcess.START.plusSeconds(1_000_000))) {
                blocks.add(HistoryBlock.parse("row " + row.id(), row.data()));
            }
            List<Reading> kept = new ArrayList<>();
            BlockReadings.of(blocks).forEachRemaining(kept::add);
            int last = kept.size() - 1;
            // Every flush the child reported is there; at most the one it was writing when killed is beyond it.
            assertThat(last).isGreaterThanOrEqualTo(lastReported).isLessThan(lastReported + 20);
            for (int t = 0; t <= last; t++) {
                Reading expected = HistoryWriterProcess.reading(t);
                assertThat(Double.doubleToRawLongBits(kept.get(t).value())).as("value bits of second %d", t)
                        .isEqualTo(Double.doubleToRawLongBits(expected.value()));
                assertThat(kept.get(t).timestamp()).isEqualTo(expected.timestamp());
            }

            HistoryRecorder restarted = HistoryRecorder.open(journal.history(), HistorySettings.defaults());

            // The default flush interval of 10 s bounds the loss (the recorder's own settings, HistorySettings).
            assertThat(restarted.restartNote()).isEqualTo("raw history: the previous run stopped without its final"
                    + " flush (killed or lost power?): readings after " + HistoryWriterProcess.reading(last).timestamp()
                    + ", its last committed flush, are lost, at most 10s (the history flush interval) of 1 channel");
        }
    }
}
