package org.cryowarden.daemon.notify;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.run.DaemonEvent;

/**
 * Picks up the escalations a restart would otherwise forget. Escalation state lives in memory; the journal holds
 * every event it was decided from and every notice it queued. After a restart the recent events are fed again,
 * on a {@link ResumeClock} standing at each event's time, into a fresh {@link Escalation}: it ends in the state
 * the previous run had (cases still open, contacts told, stages reached, pacing), with its timers on the live
 * clock. Of the notices the replay decides, those the journal already queued are dropped; the rest fell due
 * while the daemon was down, or were decided and lost in the crash, and are returned to be queued now.
 *
 * <p>A watchdog stall still open belonged to the process that is gone: it ends at the restart, and whoever was
 * paged is told so.
 *
 * <p>The look-back is the longest escalation of the roster plus a day (the longest quiet hours can hold a
 * notice); an alarm raised before it has finished escalating, but an acknowledgement of it after the restart no
 * longer tells who took it.
 */
final class EscalationReplay {

    private static final ObjectMapper JSON = new ObjectMapper();
    private static final int PAGE = 5_000;
    private static final Set<String> DECIDING = Set.of("alarm.raised", "alarm.acknowledged", "alarm.shelved",
            "alarm.out-of-service", "alarm.cleared", "watchdog.stalled", "watchdog.recovered", "flood.started",
            "flood.ended");

    /** What the replay found: the notices to queue now, and how much it went through. */
    record Outcome(List<Message> missed, int events, int alreadyQueued, Set<String> open, long lastSeq) {
    }

    private EscalationReplay() {
    }

    static Outcome run(Escalation escalation, ResumeClock clock, Journal journal, Roster roster)
            throws JournalException {
        Instant now = clock.startReplay();
        try {
            Instant from = now.minus(lookBack(roster));
            List<Message> decided = new ArrayList<>();
            Set<String> queued = new HashSet<>();
            int events = 0;
            long lastSeq = 0;
            List<JournalEvent> page = journal.eventsSince(from, PAGE);
            while (!page.isEmpty()) {
                for (JournalEvent event : page) {
                    lastSeq = event.seq();
                    if (event.kind().equals("notify.queued")) {
                        queued.add(payload(event).path("notice").asText());
                    } else if (DECIDING.contains(event.kind())) {
                        events++;
                        advance(escalation, clock, clock.monoAt(event.at()), decided);
                        decided.addAll(escalation.onEvent(daemonEvent(event), event.seq()));
                    }
                }
                page = page.size() < PAGE ? List.of()
                        : journal.eventsAfter(page.get(page.size() - 1).seq(), PAGE);
            }
            advance(escalation, clock, clock.monoAt(now), decided);
            for (String alarm : escalation.escalating()) {
                if (alarm.startsWith(Escalation.WATCHDOG)) {
                    // The stall belonged to the process that is gone; tell whoever was paged that it is over.
                    decided.addAll(escalation.onEvent(new DaemonEvent("watchdog.recovered", now,
                            java.util.Optional.of(alarm.substring(Escalation.WATCHDOG.length())), java.util.Optional.empty(),
                            JSON.createObjectNode().put("cause", "the daemon restarted")), 0));
                }
            }
            List<Message> missed = decided.stream().filter(m -> !queued.contains(m.id())).toList();
            return new Outcome(missed, events, decided.size() - missed.size(), escalation.escalating(), lastSeq);
        } finally {
            clock.goLive();
        }
    }

    /** Fires every timer due up to {@code until}, each at its own moment, then stands at {@code until}. */
    private static void advance(Escalation escalation, ResumeClock clock, long until, List<Message> decided) {
        long due;
        while ((due = escalation.nextDue()) != Long.MAX_VALUE && until - due >= 0) {
            clock.replayTo(due);
            decided.addAll(escalation.tick());
        }
        clock.replayTo(until);
    }

    static Duration lookBack(Roster roster) {
        Duration longest = Duration.ZERO;
        for (Roster.Policy policy : roster.policies().values()) {
            Duration span = policy.repeatEvery().multipliedBy(policy.repeats()).plus(policy.fallbackAfter());
            for (Roster.Step step : policy.steps()) {
                span = span.plus(step.after());
            }
            longest = span.compareTo(longest) > 0 ? span : longest;
        }
        return longest.plus(roster.pacing()).plus(Duration.ofDays(1));
    }

    private static DaemonEvent daemonEvent(JournalEvent event) {
        JsonNode payload = payload(event);
        return new DaemonEvent(event.kind(), event.at(), event.subject(), event.operator(),
                payload instanceof ObjectNode object ? object : JSON.createObjectNode());
    }

    private static JsonNode payload(JournalEvent event) {
        try {
            return JSON.readTree(event.payloadJson());
        } catch (IOException e) {
            return JSON.createObjectNode();
        }
    }
}
