package org.cryowarden.daemon.demo;

import com.fasterxml.jackson.databind.JsonNode;
import java.time.Duration;
import java.util.List;
import java.util.Optional;
import java.util.OptionalInt;
import org.cryowarden.simulator.emulators.Fault;
import org.cryowarden.simulator.emulators.FaultKind;
import org.cryowarden.simulator.emulators.Instrument;

/**
 * What the journal-fault tests share: the alarm they drive (the oxygen module falls silent and answers again by
 * turns, so its stale alarms rise and clear), the journal-failure meter, and the dashboard's view of events that
 * went out without being recorded.
 */
final class JournalTrouble {

    /** A stale alarm of the oxygen module, 10 s timeout (config-examples/harbour-hall-rules.yaml). */
    static final String STALE = "o2-magnet-hall-east-stale";

    private JournalTrouble() {
    }

    /** One round: 15 s of silence from the oxygen module (its stale alarms rise), then 15 s of answers. */
    static void toggle(Night night, Instrument aim) throws InterruptedException {
        aim.startFault(new Fault(FaultKind.SILENCE, 0, Duration.ZERO, OptionalInt.empty(),
                night.simulator.elapsed().toSeconds()));
        night.steps(15);
        aim.clearFault(Optional.of(FaultKind.SILENCE));
        night.steps(15);
    }

    static long failures(Night night) {
        return (long) night.daemon.meters().get("cryowarden_journal_failures").functionCounter().count();
    }

    /** Whether the journal holds a {@code journal.gap} event: it wrote again after failing. */
    static boolean recordedAgain(Night night) {
        try {
            return night.daemon.eventsAfter(0, 100_000).stream().anyMatch(e -> e.kind().equals("journal.gap"));
        } catch (Exception e) {
            return false;
        }
    }

    /** The events the dashboard received marked {@code "recorded": false}, in order. */
    static List<JsonNode> unrecorded(Subscriber dashboard, String prefix) {
        return dashboard.on(prefix + "/event").stream().map(Subscriber::json).filter(e -> e.has("recorded")).toList();
    }

    /** The last message on {@code topic}, or an empty document when none came. */
    static Subscriber.Message last(Subscriber dashboard, String topic) {
        List<Subscriber.Message> messages = dashboard.on(topic);
        return messages.isEmpty() ? new Subscriber.Message(topic, "{}", false, new byte[0])
                : messages.get(messages.size() - 1);
    }

    /**
     * Reads the journal after the trouble: every event numbered without a gap, and one {@code journal.gap} that
     * counts exactly the {@code published} events that went out unrecorded and names the {@code problem}.
     */
    static List<org.cryowarden.daemon.journal.JournalEvent> gaplessWithOneGap(java.nio.file.Path journalFile,
            int published, String problem) throws Exception {
        try (org.cryowarden.daemon.journal.Journal journal = org.cryowarden.daemon.journal.Journal.open(journalFile,
                org.cryowarden.daemon.journal.JournalSettings.defaults())) {
            List<org.cryowarden.daemon.journal.JournalEvent> all = journal.eventsAfter(0, 100_000);
            for (int i = 0; i < all.size(); i++) {
                org.assertj.core.api.Assertions.assertThat(all.get(i).seq()).as("seq of event %d", i)
                        .isEqualTo(i + 1L);
            }
            org.cryowarden.daemon.journal.JournalEvent gap = all.stream()
                    .filter(e -> e.kind().equals("journal.gap")).findFirst().orElseThrow();
            JsonNode payload = org.cryowarden.daemon.run.Payloads.JSON.readTree(gap.payloadJson());
            org.assertj.core.api.Assertions.assertThat(payload.path("not_recorded").asLong()).isEqualTo(published);
            org.assertj.core.api.Assertions.assertThat(payload.path("problem").asText()).contains(problem);
            return all;
        }
    }
}
