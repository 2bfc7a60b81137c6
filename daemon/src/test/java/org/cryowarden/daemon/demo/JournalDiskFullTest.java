package org.cryowarden.daemon.demo;

import static org.cryowarden.daemon.demo.Subscriber.json;
import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assumptions.assumeThat;
import static org.cryowarden.daemon.demo.JournalTrouble.STALE;
import static org.cryowarden.daemon.demo.JournalTrouble.failures;
import static org.cryowarden.daemon.demo.JournalTrouble.gaplessWithOneGap;
import static org.cryowarden.daemon.demo.JournalTrouble.last;
import static org.cryowarden.daemon.demo.JournalTrouble.recordedAgain;
import static org.cryowarden.daemon.demo.JournalTrouble.toggle;
import static org.cryowarden.daemon.demo.JournalTrouble.unrecorded;

import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.read.ListAppender;
import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.simulator.emulators.Instrument;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.slf4j.LoggerFactory;

/**
 * The journal's disk fills up while the daemon runs: the journal lives on a small tmpfs of the test's own (so
 * the test needs root; it is skipped otherwise), which the test fills with a file. The oxygen module then falls
 * silent and its stale alarms are raised and cleared: they still reach the dashboard, marked not recorded, the
 * retained {@code journal} topic says why, and the log names each event not recorded. Once space is freed the
 * journal records again and its first event tells how many were lost and since when; the sequence has no gap.
 */
class JournalDiskFullTest {

    @TempDir
    Path folder;

    private Path disk;

    @BeforeAll
    static void mosquittoRuns() throws Exception {
        Night.mosquittoRuns();
    }

    @AfterEach
    void unmount() throws Exception {
        if (disk != null) {
            new ProcessBuilder("umount", disk.toString()).inheritIO().start().waitFor();
        }
    }

    @Test
    void alarmsRaisedWhileTheJournalDiskIsFullArePublishedMarkedNotRecordedAndTheGapIsJournaledAfterwards()
            throws Exception {
        disk = Files.createDirectories(folder.resolve("disk"));
        int mounted = new ProcessBuilder("mount", "-t", "tmpfs", "-o", "size=2m", "tmpfs", disk.toString())
                .redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start().waitFor();
        if (mounted != 0) {
            disk = null;
        }
        assumeThat(mounted).as("a tmpfs of the test's own (needs root)").isZero();
        Logger sinkLog = (Logger) LoggerFactory.getLogger("org.cryowarden.daemon.run.JournalSink");
        Logger eventLog = (Logger) LoggerFactory.getLogger("org.cryowarden.event");
        ListAppender<ILoggingEvent> log = new ListAppender<>();
        log.start();
        sinkLog.addAppender(log);
        eventLog.addAppender(log);
        Path journalFile = disk.resolve("journal.db");
        try (Night night = Night.start(folder, Night.MOSQUITTO, false, journalFile);
             Subscriber dashboard = new Subscriber(Night.MOSQUITTO, night.prefix + "/#")) {
            Instrument aim = night.simulator.instrument("aim-1").orElseThrow();
            night.stepUntil(night.daemon::acceptingCommands, 100);
            night.steps(20);

            Path filler = disk.resolve("filler");
            fill(filler);
            // Silence and voice by turns: each round raises and clears the stale alarms (10 s timeout), until a
            // batch of them cannot be recorded (SQLite may first reuse space its write-ahead log already holds).
            int rounds = 0;
            while (failures(night) == 0 && rounds++ < 20) {
                toggle(night, aim);
            }
            assertThat(failures(night)).as("journal failures after %d rounds", rounds).isPositive();
            night.stepUntil(() -> unrecorded(dashboard, night.prefix).stream()
                    .anyMatch(e -> e.path("kind").asText().startsWith("alarm.")), 200);

            List<JsonNode> lost = unrecorded(dashboard, night.prefix);
            JsonNode first = lost.get(0);
            assertThat(first.has("seq")).isFalse();
            assertThat(first.path("not_recorded_because").asText()).contains(journalFile.toString())
                    .contains("the disk is full (SQLITE_FULL)"); // SQLite result codes: SQLITE_FULL (13)
            JsonNode journalState = json(last(dashboard, night.prefix + "/journal"));
            assertThat(journalState.path("state").asText()).isEqualTo("not recording");
            assertThat(journalState.path("problem").asText()).contains("free space on the disk that holds it");
            assertThat(log.list).extracting(ILoggingEvent::getFormattedMessage)
                    .anyMatch(line -> line.startsWith("NOT RECORDED event 0 " + first.path("kind").asText()));
            // The alarm itself, retained, reached the dashboard: the engine went on evaluating.
            assertThat(dashboard.on(night.prefix + "/alarm/" + STALE)).isNotEmpty();

            Files.delete(filler);
            rounds = 0;
            long before = failures(night);
            while (!recordedAgain(night) && rounds++ < 20) {
                toggle(night, aim);
            }
            assertThat(recordedAgain(night)).isTrue();
            night.stepUntil(() -> json(last(dashboard, night.prefix + "/journal")).path("state").asText()
                    .equals("recording"), 100);
            int published = unrecorded(dashboard, night.prefix).size();
            night.daemon.awaitQuiet(Duration.ofSeconds(5));
            // Every event the journal could not take went out marked, and the gap counts exactly those.
            List<JournalEvent> all = gaplessWithOneGap(journalFile, published, "SQLITE_FULL");
            System.out.printf("journal disk full: %d journal failures, %d events not recorded and all %d"
                    + " published marked; %d events recorded, gapless%n", before, published, published, all.size());
        } finally {
            sinkLog.detachAppender(log);
            eventLog.detachAppender(log);
        }
    }

    // ---- helpers ----

    private static void fill(Path filler) {
        byte[] block = new byte[64 * 1024];
        try (OutputStream out = Files.newOutputStream(filler)) {
            while (true) {
                out.write(block);
            }
        } catch (IOException full) {
            // No space left on the device: that is the point.
        }
    }
}
