package org.cryowarden.daemon.journal;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.Statement;
import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.OptionalDouble;
import java.util.OptionalLong;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.sqlite.SQLiteErrorCode;
import org.sqlite.SQLiteException;

class JournalTest {

    private static final Instant T0 = Instant.parse("2026-03-14T02:00:00Z");

    @TempDir
    Path folder;

    @Test
    void eventsGetConsecutiveSequenceNumbersFromOne() throws Exception {
        try (Journal journal = open()) {
            assertThat(journal.lastSeq()).isEmpty();
            long first = journal.append(raised("o2-low", T0));
            long second = journal.append(raised("lhe-level-low", T0.plusSeconds(1)));

            assertThat(List.of(first, second)).containsExactly(1L, 2L);
            assertThat(journal.lastSeq()).hasValue(2);
            assertThat(journal.eventsAfter(0, 10)).extracting(JournalEvent::seq, JournalEvent::kind,
                            e -> e.subject().orElseThrow(), JournalEvent::at)
                    .containsExactly(org.assertj.core.groups.Tuple.tuple(1L, "alarm.raised", "o2-low", T0),
                            org.assertj.core.groups.Tuple.tuple(2L, "alarm.raised", "lhe-level-low", T0.plusSeconds(1)));
        }
    }

    @Test
    void sequenceContinuesAfterReopeningWithoutRepeating() throws Exception {
        try (Journal journal = open()) {
            journal.append(raised("o2-low", T0));
            journal.append(raised("o2-low", T0));
        }
        try (Journal journal = open()) {
            assertThat(journal.append(raised("o2-low", T0))).isEqualTo(3);
        }
    }

    @Test
    void operatorEventsKeepWhoActed() throws Exception {
        try (Journal journal = open()) {
            journal.append(NewEvent.byOperator("operator.ack", T0, "o2-low", "kim",
                    "{\"note\":\"ventilation checked\"}"));

            JournalEvent ack = journal.eventsSince(T0, 10).get(0);
            assertThat(ack.operator()).hasValue("kim");
            assertThat(ack.payloadJson()).isEqualTo("{\"note\":\"ventilation checked\"}");
        }
    }

    @Test
    void eventLogRefusesChangesToWhatWasRecorded() throws Exception {
        try (Journal journal = open()) {
            journal.append(raised("o2-low", T0));
        }
        try (Connection raw = DriverManager.getConnection("jdbc:sqlite:" + file());
             Statement statement = raw.createStatement()) {
            assertThatThrownBy(() -> statement.execute("UPDATE event SET kind = 'x'"))
                    .hasMessageContaining("the event log is append-only");
            assertThatThrownBy(() -> statement.execute("DELETE FROM event"))
                    .hasMessageContaining("the event log is append-only");
        }
    }

    @Test
    void alarmStateChangesInTheSameTransactionAsItsEvent() throws Exception {
        try (Journal journal = open()) {
            long seq = journal.write("event alarm.raised for o2-low", tx -> {
                long s = tx.appendEvent(raised("o2-low", T0));
                tx.putAlarmState("o2-low", "{\"state\":\"UNACK_ACTIVE\"}", s, T0);
                return s;
            });

            AlarmStateRecord state = journal.alarmStates().get("o2-low");
            assertThat(state).isEqualTo(new AlarmStateRecord("o2-low", "{\"state\":\"UNACK_ACTIVE\"}", seq, T0));
        }
    }

    @Test
    void failedTransactionKeepsNothingAndLeavesNoGapInTheSequence() throws Exception {
        try (Journal journal = open()) {
            journal.append(raised("o2-low", T0));

            assertThatThrownBy(() -> journal.write("event alarm.cleared for o2-low", tx -> {
                long s = tx.appendEvent(NewEvent.about("alarm.cleared", T0, "o2-low", "{}"));
                tx.putAlarmState("o2-low", "not json", s, T0);
                return s;
            })).isInstanceOf(JournalException.class);

            assertThat(journal.lastSeq()).hasValue(1);
            assertThat(journal.alarmStates()).isEmpty();
            assertThat(journal.append(raised("o2-low", T0))).isEqualTo(2);
        }
    }

    @Test
    void payloadThatIsNotJsonIsRefusedNamingTheFileAndTheEvent() throws Exception {
        try (Journal journal = open()) {
            assertThatThrownBy(() -> journal.append(NewEvent.about("alarm.raised", T0, "o2-low", "{oops")))
                    .isInstanceOf(JournalException.class)
                    .hasMessageStartingWith("journal " + file() + ": could not record event alarm.raised for o2-low: ")
                    .hasMessageEndingWith("; it is not in the journal");
        }
    }

    @Test
    void outboxHandsOutUndeliveredEntriesOfOneSinkInOrder() throws Exception {
        try (Journal journal = open()) {
            long[] ids = new long[3];
            for (int i = 0; i < 3; i++) {
                int n = i;
                ids[i] = journal.write("event " + n, tx -> {
                    long seq = tx.appendEvent(raised("o2-low", T0));
                    tx.enqueue("mail", "safety@example.org", "mail " + n, OptionalLong.of(seq), T0);
                    return tx.enqueue("mqtt", "site/event", "{\"seq\":" + seq + "}", OptionalLong.of(seq), T0);
                });
            }
            journal.recordAttempt(ids[0], T0.plusSeconds(1));
            journal.markDelivered(ids[0], T0.plusSeconds(2));
            journal.recordAttempt(ids[1], T0.plusSeconds(3));

            List<OutboxEntry> pending = journal.undelivered("mqtt", 10);

            assertThat(pending).extracting(OutboxEntry::id, OutboxEntry::payload, OutboxEntry::attempts)
                    .containsExactly(org.assertj.core.groups.Tuple.tuple(ids[1], "{\"seq\":2}", 1),
                            org.assertj.core.groups.Tuple.tuple(ids[2], "{\"seq\":3}", 0));
            assertThat(pending.get(0).seq()).hasValue(2);
            assertThat(journal.outboxDepth("mqtt")).isEqualTo(2);
            assertThat(journal.outboxDepth("mail")).isEqualTo(3);
            assertThat(journal.pruneDelivered(T0.plusSeconds(10))).isEqualTo(1);
        }
    }

    @Test
    void minuteAggregateHoldsMinMeanMaxOfGoodReadingsAndCountsAll() throws Exception {
        try (Journal journal = open()) {
            // Check values by hand (arithmetic): GOOD 20.1, 20.9, 20.5 -> min 20.1, mean 20.5, max 20.9.
            journal.recordReading(Reading.good("o2-room-12", 20.1, Unit.PERCENT, T0.plusSeconds(1)));
            journal.recordReading(Reading.good("o2-room-12", 20.9, Unit.PERCENT, T0.plusSeconds(2)));
            journal.recordReading(Reading.bad("o2-room-12", Unit.PERCENT, T0.plusSeconds(3), "bad CRC"));
            journal.recordReading(Reading.good("o2-room-12", 20.5, Unit.PERCENT, T0.plusSeconds(59)));
            journal.recordReading(Reading.bad("lhe-level", Unit.PERCENT, T0.plusSeconds(5), "timeout"));
            journal.flushAggregates();

            MinuteAggregate o2 = journal.aggregates("o2-room-12", T0, T0.plusSeconds(60)).get(0);
            assertThat(o2.minute()).isEqualTo(T0);
            assertThat(o2.min()).hasValue(20.1);
            assertThat(o2.mean().getAsDouble()).isCloseTo(20.5, org.assertj.core.data.Offset.offset(1e-9));
            assertThat(o2.max()).hasValue(20.9);
            assertThat(o2.goodCount()).isEqualTo(3);
            assertThat(o2.totalCount()).isEqualTo(4);
            MinuteAggregate level = journal.aggregates("lhe-level", T0, T0.plusSeconds(60)).get(0);
            assertThat(level.min()).isEqualTo(OptionalDouble.empty());
            assertThat(level.mean()).isEqualTo(OptionalDouble.empty());
            assertThat(level.totalCount()).isEqualTo(1);
        }
    }

    @Test
    void minuteIsWrittenWhenALaterMinuteStartsAndLaterPartsMergeIn() throws Exception {
        try (Journal journal = open()) {
            journal.recordReading(Reading.good("t-bath", 4.20, Unit.KELVIN, T0.plusSeconds(10)));
            journal.flushAggregates();
            journal.recordReading(Reading.good("t-bath", 4.30, Unit.KELVIN, T0.plusSeconds(20)));
            assertThat(journal.aggregates("t-bath", T0, T0.plusSeconds(60)).get(0).goodCount()).isEqualTo(1);

            journal.recordReading(Reading.good("t-bath", 4.25, Unit.KELVIN, T0.plusSeconds(61)));

            MinuteAggregate first = journal.aggregates("t-bath", T0, T0.plusSeconds(60)).get(0);
            assertThat(first.goodCount()).isEqualTo(2);
            assertThat(first.min()).hasValue(4.20);
            assertThat(first.max()).hasValue(4.30);
            assertThat(journal.aggregates("t-bath", T0.plusSeconds(60), T0.plusSeconds(120))).isEmpty();
        }
    }

    @Test
    void aggregatesOlderThanTheRetentionArePruned() throws Exception {
        try (Journal journal = Journal.open(file(), JournalSettings.defaults().withAggregateRetention(Duration.ofHours(1)))) {
            journal.recordReading(Reading.good("t-bath", 4.2, Unit.KELVIN, T0));
            journal.recordReading(Reading.good("t-bath", 4.2, Unit.KELVIN, T0.plus(Duration.ofMinutes(30))));
            journal.flushAggregates();

            int pruned = journal.pruneAggregates(T0.plus(Duration.ofMinutes(70)));

            assertThat(pruned).isEqualTo(1);
            assertThat(journal.aggregates("t-bath", T0.minusSeconds(1), T0.plus(Duration.ofHours(2))))
                    .extracting(MinuteAggregate::minute).containsExactly(T0.plus(Duration.ofMinutes(30)));
        }
    }

    @Test
    void recordConnectionSyncsFullyAndAggregateConnectionNormallyInWalMode() throws Exception {
        try (Journal journal = open()) {
            // PRAGMA synchronous reports 2 for FULL and 1 for NORMAL (SQLite documentation, PRAGMA synchronous).
            assertThat(journal.pragma("synchronous", false)).isEqualTo("2");
            assertThat(journal.pragma("synchronous", true)).isEqualTo("1");
            assertThat(journal.pragma("journal_mode", false)).isEqualTo("wal");
            assertThat(journal.pragma("busy_timeout", false)).isEqualTo("5000");
            assertThat(journal.pragma("user_version", false)).isEqualTo(Integer.toString(Schema.latestVersion()));
        }
    }

    @Test
    void deliveryMarksKeepAfterReopeningAndLeaveEventCommitsFullySynchronous() throws Exception {
        long[] ids = new long[3];
        try (Journal journal = open()) {
            for (int i = 0; i < 3; i++) {
                ids[i] = journal.write("event " + i, tx -> {
                    long seq = tx.appendEvent(raised("o2-low", T0));
                    return tx.enqueue("mqtt", "site/event", "{\"seq\":" + seq + "}", OptionalLong.of(seq), T0);
                });
            }
            journal.markDelivered(List.of(ids[0], ids[1]), T0.plusSeconds(1));
            journal.markDelivered(ids[2], T0.plusSeconds(2));

            // PRAGMA synchronous reports 2 for FULL (SQLite documentation, PRAGMA synchronous).
            assertThat(journal.pragma("synchronous", false)).isEqualTo("2");
            assertThat(journal.append(raised("o2-low", T0.plusSeconds(3)))).isEqualTo(4);
        }
        try (Journal journal = open()) {
            assertThat(journal.undelivered("mqtt", 10)).isEmpty();
            assertThat(journal.pragma("synchronous", false)).isEqualTo("2");
        }
    }

    @Test
    void fullDiskNamesTheFileAndWhatWasNotRecorded() throws Exception {
        try (Journal journal = open()) {
            journal.limitPages(journal.pageCount());
            String big = "{\"note\":\"" + "x".repeat(20_000) + "\"}";

            assertThatThrownBy(() -> journal.append(NewEvent.byOperator("operator.ack", T0, "o2-low", "kim", big)))
                    .isInstanceOf(JournalException.class)
                    .hasMessage("journal " + file() + ": could not record event operator.ack for o2-low: the disk is"
                            + " full (SQLITE_FULL); free space on the disk that holds it; it is not in the journal");
        }
    }

    @Test
    void missingFolderIsAnErrorThatSaysWhatToDo() {
        Path missing = folder.resolve("no-such-folder").resolve("journal.db");

        assertThatThrownBy(() -> Journal.open(missing, JournalSettings.defaults()))
                .isInstanceOf(JournalException.class)
                .hasMessage("cannot open the journal " + missing + ": the folder " + missing.getParent()
                        + " does not exist; create it or choose another journal file; nothing can be recorded"
                        + " (no alarms, acknowledgements, trips or events) until this is fixed");
    }

    @Test
    void folderGivenAsTheJournalFileIsAnError() {
        assertThatThrownBy(() -> Journal.open(folder, JournalSettings.defaults()))
                .isInstanceOf(JournalException.class)
                .hasMessage("cannot open the journal " + folder + ": it is a folder, not a file; name a file inside"
                        + " it, e.g. " + folder.resolve("journal.db") + "; nothing can be recorded (no alarms,"
                        + " acknowledgements, trips or events) until this is fixed");
    }

    @Test
    void fileThatIsNotADatabaseIsAnError() throws Exception {
        Files.writeString(file(), "site: cryo-lab-b\nbuses: []\n".repeat(100), StandardCharsets.UTF_8);

        assertThatThrownBy(() -> Journal.open(file(), JournalSettings.defaults()))
                .isInstanceOf(JournalException.class)
                .hasMessage("cannot open the journal " + file() + ": the file is not an SQLite database"
                        + " (SQLITE_NOTADB); point the journal at another file, or move this one away; nothing can be"
                        + " recorded (no alarms, acknowledgements, trips or events) until this is fixed");
    }

    @Test
    void journalFromANewerVersionIsRefused() throws Exception {
        try (Connection raw = DriverManager.getConnection("jdbc:sqlite:" + file());
             Statement statement = raw.createStatement()) {
            statement.execute("PRAGMA user_version = 99");
        }

        assertThatThrownBy(() -> Journal.open(file(), JournalSettings.defaults()))
                .isInstanceOf(JournalException.class)
                .hasMessage("cannot open the journal " + file() + ": it was written by a newer cryowarden (schema"
                        + " version 99, this one knows up to " + Schema.latestVersion() + "); run that version, or"
                        + " choose another journal file; nothing can be recorded (no alarms, acknowledgements, trips"
                        + " or events) until this is fixed");
    }

    @Test
    void readOnlyAndPermissionProblemsAreExplainedWithWhatToDo() {
        // Root ignores file modes, so these causes are checked on the driver's own exceptions.
        assertThat(SqliteProblems.explain(new SQLiteException("attempt to write a readonly database",
                SQLiteErrorCode.SQLITE_READONLY)))
                .isEqualTo("the file or its folder is read-only (SQLITE_READONLY); make both writable for the user"
                        + " that runs cryowarden");
        assertThat(SqliteProblems.explain(new SQLiteException("unable to open database file",
                SQLiteErrorCode.SQLITE_CANTOPEN)))
                .isEqualTo("the file cannot be opened (SQLITE_CANTOPEN); check that its folder exists and is writable"
                        + " for the user that runs cryowarden");
        assertThat(SqliteProblems.explain(new SQLiteException("disk I/O error", SQLiteErrorCode.SQLITE_IOERR_WRITE)))
                .isEqualTo("the disk reported an I/O error (SQLITE_IOERR); check the disk and the system log");
    }

    @Test
    void closedJournalRefusesWritesNamingWhatWasNotRecorded() throws Exception {
        Journal journal = open();
        journal.close();

        assertThatThrownBy(() -> journal.append(raised("o2-low", T0)))
                .isInstanceOf(JournalException.class)
                .hasMessage("journal " + file() + " is closed; could not record event alarm.raised for o2-low");
    }

    // ---- helpers ----------------------------------------------------------------------------------------------

    private Path file() {
        return folder.resolve("journal.db");
    }

    private Journal open() throws JournalException {
        return Journal.open(file(), JournalSettings.defaults());
    }

    private static NewEvent raised(String alarm, Instant at) {
        return NewEvent.about("alarm.raised", at, alarm, "{\"priority\":\"HIGH\"}");
    }
}
