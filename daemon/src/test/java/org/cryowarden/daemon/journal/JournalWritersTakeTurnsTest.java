package org.cryowarden.daemon.journal;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.TimeUnit;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The journal's three connections (records, aggregates, history) write to one SQLite file, which takes one writer
 * at a time. They take turns in the process instead of leaning on SQLite's busy handler: with a busy timeout of
 * zero, a writer that found another one writing would fail at once with SQLITE_BUSY.
 */
class JournalWritersTakeTurnsTest {

    private static final Instant T0 = Instant.parse("2026-02-11T01:00:00Z");
    private static final int ROUNDS = 300;

    @TempDir
    Path folder;

    @Test
    void recordsAggregatesAndHistoryWriteAtOnceWithoutABusyTimeout() throws Exception {
        JournalSettings noWaiting = new JournalSettings(Duration.ZERO, Duration.ofDays(1));
        try (Journal journal = Journal.open(folder.resolve("journal.db"), noWaiting)) {
            ExecutorService writers = Executors.newFixedThreadPool(3);
            try {
                List<Callable<Integer>> work = List.of(
                        () -> {
                            for (int i = 0; i < ROUNDS; i++) {
                                journal.append(NewEvent.about("alarm.raised", T0.plusSeconds(i), "o2-cellar-2",
                                        "{\"value\": 18.1}"));
                            }
                            return ROUNDS;
                        },
                        () -> {
                            for (int i = 0; i < ROUNDS; i++) {
                                journal.history().write(List.of(new BlockRow(0, "t-stage-4k", T0.plusSeconds(i),
                                        T0.plusSeconds(i + 1), 2, true, new byte[64])), T0.plusSeconds(i));
                            }
                            return ROUNDS;
                        },
                        () -> {
                            for (int i = 0; i < ROUNDS; i++) {
                                // A new minute per round, so that every flush writes a row.
                                journal.recordReading(Reading.good("p-vent-line", 101.2, Unit.KILOPASCAL,
                                        T0.plus(Duration.ofMinutes(i))));
                                journal.flushAggregates();
                            }
                            return ROUNDS;
                        });
                List<Future<Integer>> done = writers.invokeAll(work, 2, TimeUnit.MINUTES);
                List<Integer> rounds = new ArrayList<>();
                for (Future<Integer> future : done) {
                    rounds.add(future.get()); // throws with the writer's JournalException if one was refused
                }
                assertThat(rounds).containsExactly(ROUNDS, ROUNDS, ROUNDS);
            } finally {
                writers.shutdownNow();
            }
            assertThat(journal.lastSeq()).hasValue(ROUNDS);
        }
    }
}
