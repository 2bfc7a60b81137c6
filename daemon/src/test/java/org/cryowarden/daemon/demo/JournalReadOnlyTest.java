package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.daemon.demo.JournalTrouble.STALE;
import static org.cryowarden.daemon.demo.JournalTrouble.failures;
import static org.cryowarden.daemon.demo.JournalTrouble.gaplessWithOneGap;
import static org.cryowarden.daemon.demo.JournalTrouble.last;
import static org.cryowarden.daemon.demo.JournalTrouble.recordedAgain;
import static org.cryowarden.daemon.demo.JournalTrouble.toggle;
import static org.cryowarden.daemon.demo.JournalTrouble.unrecorded;
import static org.cryowarden.daemon.demo.Subscriber.json;

import ch.qos.logback.classic.Level;
import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.read.ListAppender;
import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.stream.Stream;
import org.cryowarden.daemon.history.HistoryRecorder;
import org.cryowarden.daemon.journal.ImmutableFiles;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.mqtt.TcpRelay;
import org.cryowarden.simulator.emulators.Instrument;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.slf4j.LoggerFactory;

/**
 * The journal becomes read-only while the daemon runs: the test sets the immutable attribute on the journal's
 * folder and every file in it ({@link ImmutableFiles}: needs root and a file system that has it, skipped
 * otherwise), so that writes through the descriptors SQLite already holds fail ({@code EPERM}) and no file can be
 * created. Alarms still reach the dashboard marked not recorded, with a reason that says read-only
 * rather than full; once the attribute is cleared the same daemon, without a restart, records again and its first
 * event counts what was lost.
 */
class JournalReadOnlyTest {

    @TempDir
    Path folder;

    /** Cleared after every run, passed or not, so the folder can be deleted. */
    private final ImmutableFiles immutable = new ImmutableFiles();

    @BeforeAll
    static void mosquittoRuns() throws Exception {
        Night.mosquittoRuns();
    }

    @AfterEach
    void thaw() throws Exception {
        immutable.close();
    }

    @Test
    void alarmsRaisedWhileTheJournalIsReadOnlyArePublishedNotRecordedAndTheJournalRecordsAgainWithoutARestart()
            throws Exception {
        Path journalFolder = Files.createDirectories(folder.resolve("journal"));
        Path journalFile = journalFolder.resolve("journal.db");
        Logger historyLog = (Logger) LoggerFactory.getLogger(HistoryRecorder.class);
        ListAppender<ILoggingEvent> history = new ListAppender<>();
        history.start();
        historyLog.addAppender(history);
        try (Night night = Night.start(folder, Night.MOSQUITTO, false, journalFile);
             Subscriber dashboard = new Subscriber(Night.MOSQUITTO, night.prefix + "/#")) {
            Instrument aim = night.simulator.instrument("aim-1").orElseThrow();
            night.stepUntil(night.daemon::acceptingCommands, 100);
            night.steps(20);
            long failuresBefore = failures(night);

            List<String> frozen = immutable.freeze(journalFolder);
            toggle(night, aim);
            assertThat(failures(night)).as("journal failures once read-only").isGreaterThan(failuresBefore);
            night.stepUntil(() -> unrecorded(dashboard, night.prefix).stream()
                    .anyMatch(e -> e.path("kind").asText().equals("alarm.cleared")), 100);

            List<JsonNode> lost = unrecorded(dashboard, night.prefix);
            JsonNode raised = lost.stream().filter(e -> e.path("kind").asText().equals("alarm.raised")
                    && e.path("subject").asText().equals(STALE)).findFirst().orElseThrow();
            assertThat(raised.has("seq")).isFalse();
            assertThat(raised.path("recorded").asBoolean(true)).isFalse();
            // EPERM on write(2) to an immutable file (Linux chattr(1), ioctl_iflags(2): FS_IMMUTABLE_FL)
            assertThat(raised.path("not_recorded_because").asText()).contains(journalFile.toString())
                    .contains("read-only").doesNotContain("disk is full");
            JsonNode journalState = json(last(dashboard, night.prefix + "/journal"));
            assertThat(journalState.path("state").asText()).isEqualTo("not recording");
            assertThat(journalState.path("problem").asText()).contains("read-only").contains("writable")
                    .doesNotContain("full");
            // The engine went on evaluating: the stale alarm rose and cleared, and its retained document says so.
            assertThat(lost).anyMatch(e -> e.path("kind").asText().equals("alarm.cleared")
                    && e.path("subject").asText().equals(STALE));
            assertThat(json(last(dashboard, night.prefix + "/alarm/" + STALE)).path("condition_active").asBoolean())
                    .isFalse();
            try (Stream<Path> files = Files.list(journalFolder)) {
                assertThat(files.map(p -> p.getFileName().toString()).toList())
                        .as("nothing created beside the frozen journal").containsExactlyInAnyOrderElementsOf(frozen);
            }

            immutable.close();
            int rounds = 0;
            while (!recordedAgain(night) && rounds++ < 10) {
                toggle(night, aim);
            }
            assertThat(recordedAgain(night)).as("journal.gap recorded after %d rounds", rounds).isTrue();
            night.stepUntil(() -> json(last(dashboard, night.prefix + "/journal")).path("state").asText()
                    .equals("recording"), 100);
            int published = unrecorded(dashboard, night.prefix).size();
            night.daemon.awaitQuiet(Duration.ofSeconds(5));
            List<JournalEvent> all = gaplessWithOneGap(journalFile, published, "read-only");
            JournalEvent gap = all.stream().filter(e -> e.kind().equals("journal.gap")).findFirst().orElseThrow();
            assertThat(all).as("events recorded after the gap").anyMatch(e -> e.seq() > gap.seq()
                    && e.kind().startsWith("alarm."));
            // The history writer retries at each flush and says so once, not once per attempt.
            assertThat(history.list).filteredOn(e -> e.getLevel() == Level.ERROR).hasSize(1);
            assertThat(history.list).extracting(ILoggingEvent::getFormattedMessage)
                    .anyMatch(line -> line.startsWith("raw history: writes again after"));
            System.out.printf("journal read-only: %d journal failures, %d events not recorded and all %d"
                    + " published marked; %d events recorded, gapless%n", failures(night) - failuresBefore,
                    published, published, all.size());
        } finally {
            historyLog.detachAppender(history);
        }
    }

    @Test
    void eventsDeliveredWhileTheJournalCannotMarkThemAreNotSentAgain() throws Exception {
        Path journalFolder = Files.createDirectories(folder.resolve("journal"));
        try (TcpRelay relay = new TcpRelay(1883);
             Night night = Night.start(folder, relay.uri(), false, journalFolder.resolve("journal.db"));
             Subscriber dashboard = new Subscriber(Night.MOSQUITTO, night.prefix + "/#")) {
            Instrument aim = night.simulator.instrument("aim-1").orElseThrow();
            night.stepUntil(night.daemon::acceptingCommands, 100);
            night.steps(20);
            // The broker out of reach: the stale alarms are recorded and wait in the outbox.
            relay.accepting(false);
            relay.breakConnections();
            night.stepUntil(() -> !night.daemon.mqttConnected(), 100);
            toggle(night, aim);
            long waiting = night.daemon.eventsAfter(0, 100_000).size();

            immutable.freeze(journalFolder);
            relay.accepting(true);
            night.stepUntil(night.daemon::mqttConnected, 3000);
            // More events while read-only: each batch wakes the outbox sender. The journal is not read while its
            // files cannot be written (a WAL read writes its read mark into the mapped -shm, which would end the
            // process with SIGBUS), so the waiting events stay in the outbox until it can be read again.
            toggle(night, aim);
            immutable.close();
            toggle(night, aim);
            night.stepUntil(() -> recordedAgain(night), 100);
            night.stepUntil(() -> recorded(dashboard, night.prefix).stream().mapToLong(Long::longValue).max()
                    .orElse(0) >= waiting, 3000);

            List<Long> seqs = recorded(dashboard, night.prefix);
            assertThat(seqs).as("event seqs on the dashboard").doesNotHaveDuplicates()
                    .contains(waiting);
            System.out.printf("journal read-only with %d events in the outbox: %d published once each%n", waiting,
                    seqs.size());
        }
    }

    /** The seqs of the recorded events the dashboard received, in order of arrival. */
    private static List<Long> recorded(Subscriber dashboard, String prefix) {
        return dashboard.on(prefix + "/event").stream().map(Subscriber::json).filter(e -> e.has("seq"))
                .map(e -> e.path("seq").asLong()).toList();
    }
}
