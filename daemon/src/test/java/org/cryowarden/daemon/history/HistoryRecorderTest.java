package org.cryowarden.daemon.history;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import org.cryowarden.daemon.journal.BlockRow;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class HistoryRecorderTest {

    private static final Instant START = Instant.parse("2025-01-15T18:00:00Z");

    @TempDir
    Path folder;

    @Test
    void runThatStopsWithoutItsFinalFlushKeepsEverythingUpToTheLastFlushAndSaysSoAtRestart() throws Exception {
        Path file = folder.resolve("journal.db");
        try (Journal journal = Journal.open(file, JournalSettings.defaults())) {
            HistoryRecorder recorder = HistoryRecorder.open(journal.history(), HistorySettings.defaults());
            assertThat(recorder.restartNote()).isEqualTo(
                    "raw history: the previous run (if any) stopped cleanly; nothing was lost");
            for (int t = 0; t <= 95; t++) {
                recorder.record(reading(t), START.plusSeconds(t));
            }
            recorder.writePending();
            // no close(): the process dies here, the readings after the flush at 90 s are never written
        }
        try (Journal journal = Journal.open(file, JournalSettings.defaults())) {
            HistoryRecorder recorder = HistoryRecorder.open(journal.history(), HistorySettings.defaults());
            assertThat(recorder.restartNote()).isEqualTo("raw history: the previous run stopped without its final"
                    + " flush (killed or lost power?): readings after 2025-01-15T18:01:30Z, its last committed flush,"
                    + " are lost, at most 10s (the history flush interval) of 1 channel");
            assertThat(readings(journal)).hasSize(91).last().isEqualTo(reading(90));
        }
    }

    @Test
    void cleanCloseSealsTheOpenBlockWithEveryReading() throws Exception {
        Path file = folder.resolve("journal.db");
        try (Journal journal = Journal.open(file, JournalSettings.defaults())) {
            HistoryRecorder recorder = HistoryRecorder.open(journal.history(), HistorySettings.defaults());
            for (int t = 0; t < 95; t++) {
                recorder.record(reading(t), START.plusSeconds(t));
            }
            recorder.close();
        }
        try (Journal journal = Journal.open(file, JournalSettings.defaults())) {
            assertThat(journal.history().unsealed()).isEmpty();
            List<Reading> expected = new ArrayList<>();
            for (int t = 0; t < 95; t++) {
                expected.add(reading(t));
            }
            assertThat(readings(journal)).isEqualTo(expected);
        }
    }

    @Test
    void blockIsSealedAfterTheConfiguredNumberOfReadingsAndOldBlocksArePruned() throws Exception {
        try (Journal journal = Journal.open(folder.resolve("journal.db"), JournalSettings.defaults())) {
            HistorySettings settings = new HistorySettings(Duration.ofSeconds(10), Duration.ofHours(2),
                    Duration.ofHours(1), 600);
            HistoryRecorder recorder = HistoryRecorder.open(journal.history(), settings);
            for (int t = 0; t < 4 * 3600; t += 2) {
                recorder.record(reading(t), START.plusSeconds(t));
                if (t % 600 == 0) {
                    recorder.writePending();
                }
            }
            recorder.close();
            List<BlockRow> rows = journal.history().blocks("p_bath", START, START.plusSeconds(4 * 3600));
            // 600 readings every 2 s is 20 min per block; those ending more than 2 h before the newest are gone
            assertThat(rows).allSatisfy(row -> assertThat(row.count()).isLessThanOrEqualTo(600));
            assertThat(rows.get(0).last()).isAfterOrEqualTo(START.plusSeconds(3 * 3600).minus(Duration.ofHours(2)));
            assertThat(rows.get(rows.size() - 1).last()).isEqualTo(START.plusSeconds(4 * 3600 - 2));
        }
    }

    // ---- helpers -------------------------------------------------------------------------------------------------

    private static Reading reading(int second) {
        return Reading.good("p_bath", 1050 + (second % 7) * 0.1, Unit.MILLIBAR, START.plusSeconds(second));
    }

    private static List<Reading> readings(Journal journal) throws Exception {
        List<HistoryBlock> blocks = new ArrayList<>();
        for (BlockRow row : journal.history().blocks("p_bath", START, START.plusSeconds(1_000_000))) {
            blocks.add(HistoryBlock.parse("row " + row.id(), row.data()));
        }
        List<Reading> readings = new ArrayList<>();
        BlockReadings.of(blocks).forEachRemaining(readings::add);
        return readings;
    }
}
