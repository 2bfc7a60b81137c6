package org.cryowarden.daemon.replay;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.time.Duration;
import java.time.Instant;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.NoSuchElementException;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.daemon.history.BlockReadings;
import org.cryowarden.daemon.history.HistoryBlock;
import org.cryowarden.daemon.history.MergedReadings;
import org.cryowarden.daemon.journal.BlockRow;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.engine.AlarmState;
import org.cryowarden.rules.model.Priority;

/**
 * What a journal recorded of a past period, in the forms a replay takes: the raw history as one time-ordered stream,
 * the operator commands the engine accepted ({@code command.accepted}), the alarm transitions it journaled, and the
 * run's start and tick period ({@code daemon.started}).
 */
public final class JournalHistory {

    /** Alarms the daemon raises itself (an output that did not take its command), not the engine: never replayed. */
    static final String DAEMON_ALARM_SUFFIX = "-command-disagree";

    private static final ObjectMapper JSON = new ObjectMapper();
    private static final int PAGE = 10_000;

    /**
     * The run of the daemon that covers a period: when it started, its tick period and its site file.
     *
     * @param siteFile empty when the journal did not record it
     */
    public record Run(Instant started, Duration tickPeriod, Optional<String> siteFile) {
    }

    private final Journal journal;

    public JournalHistory(Journal journal) {
        this.journal = journal;
    }

    /**
     * The last {@code daemon.started} at or before {@code at}, or the first one after it; empty when the journal
     * has none.
     */
    public Optional<Run> runAt(Instant at) throws JournalException {
        Optional<Run> before = Optional.empty();
        for (JournalEvent event : events(Instant.EPOCH)) {
            if (!event.kind().equals("daemon.started")) {
                continue;
            }
            JsonNode payload = payload(event);
            Duration tick = Duration.ofMillis(100);
            if (payload.hasNonNull("tick_period")) {
                try {
                    tick = Duration.parse(payload.get("tick_period").asText());
                } catch (DateTimeParseException e) {
                    // older journals: the daemon's default
                }
            }
            Run run = new Run(event.at(), tick, Optional.ofNullable(payload.path("site_file").textValue()));
            if (event.at().isAfter(at)) {
                return before.isPresent() ? before : Optional.of(run);
            }
            before = Optional.of(run);
        }
        return before;
    }

    /**
     * The stored readings of {@code channels} in {@code [from, until]}, merged in time order; at equal instants in the
     * order of {@code channels} (give the order in which the daemon polled them: the site's bus, instrument and point
     * order). Decodes one block per channel at a time.
     *
     * @throws org.cryowarden.daemon.history.CorruptBlockException (when iterating) naming the journal row
     */
    public Iterator<Reading> readings(List<String> channels, Instant from, Instant until) throws JournalException {
        List<Iterator<Reading>> streams = new ArrayList<>();
        for (String channel : channels) {
            List<BlockRow> rows = journal.history().blocks(channel, from, until);
            List<HistoryBlock> blocks = new ArrayList<>(rows.size());
            for (BlockRow row : rows) {
                blocks.add(HistoryBlock.parse("journal " + journal.file() + " history block " + row.id(),
                        row.data()));
            }
            streams.add(within(BlockReadings.of(blocks), from, until));
        }
        return MergedReadings.of(streams);
    }

    /** The alarm transitions the engine journaled in {@code [from, until]}, in journal order. */
    public List<AlarmChange> alarmChanges(Instant from, Instant until) throws JournalException {
        List<AlarmChange> changes = new ArrayList<>();
        for (JournalEvent event : events(from)) {
            if (event.at().isAfter(until)) {
                break;
            }
            if (!event.kind().startsWith("alarm.") || event.subject().isEmpty()
                    || event.subject().get().endsWith(DAEMON_ALARM_SUFFIX)) {
                continue;
            }
            JsonNode payload = payload(event);
            Optional<AlarmState> fromState = AlarmState.fromWire(payload.path("from").asText());
            Optional<AlarmState> toState = AlarmState.fromWire(payload.path("to").asText());
            Optional<Priority> priority = priority(payload.path("priority").asText());
            if (fromState.isPresent() && toState.isPresent() && priority.isPresent()) {
                changes.add(new AlarmChange(event.at(), event.subject().get(), fromState.get(), toState.get(),
                        priority.get()));
            }
        }
        return changes;
    }

    /**
     * The operator commands the engine accepted in {@code [from, until]}, as actions at the exact instant they were
     * taken; {@code fills} are the ids a {@code reset} resets as a fill controller rather than an interlock.
     */
    public List<OperatorAction> actions(Instant from, Instant until, Set<String> fills) throws JournalException {
        List<OperatorAction> actions = new ArrayList<>();
        for (JournalEvent event : events(from)) {
            if (event.at().isAfter(until)) {
                break;
            }
            if (!event.kind().equals("command.accepted")) {
                continue;
            }
            JsonNode p = payload(event);
            String target = p.path("target").asText();
            if (target.endsWith(DAEMON_ALARM_SUFFIX)) {
                continue;
            }
            Instant at = event.at();
            try {
                at = Instant.parse(p.path("instant").asText());
            } catch (DateTimeParseException e) {
                // the millisecond instant of the event row
            }
            String operator = p.path("operator").asText();
            String reason = p.path("reason").asText("");
            Optional<Duration> duration = Optional.ofNullable(p.path("duration").textValue()).map(Duration::parse);
            OperatorAction action = switch (p.path("verb").asText()) {
                case "ack" -> new OperatorAction.Acknowledge(at, target, operator, p.path("note").asText(""));
                case "shelve" -> new OperatorAction.Shelve(at, target, operator, duration.orElseThrow(), reason);
                case "unshelve" -> new OperatorAction.Unshelve(at, target, operator);
                case "reset" -> fills.contains(target) ? new OperatorAction.ResetFill(at, target, operator)
                        : new OperatorAction.Reset(at, target, operator);
                case "bypass" -> new OperatorAction.Bypass(at, target, operator, reason, duration.orElseThrow());
                default -> null;
            };
            if (action != null) {
                actions.add(action);
            }
        }
        return actions;
    }

    private Iterable<JournalEvent> events(Instant from) throws JournalException {
        List<JournalEvent> all = new ArrayList<>();
        List<JournalEvent> page = journal.eventsSince(from, PAGE);
        while (!page.isEmpty()) {
            all.addAll(page);
            if (page.size() < PAGE) {
                break;
            }
            page = journal.eventsAfter(page.get(page.size() - 1).seq(), PAGE);
        }
        return all;
    }

    private static JsonNode payload(JournalEvent event) {
        try {
            return JSON.readTree(event.payloadJson());
        } catch (IOException e) {
            return JSON.createObjectNode();
        }
    }

    private static Optional<Priority> priority(String word) {
        for (Priority priority : Priority.values()) {
            if (priority.word().equals(word.toLowerCase(Locale.ROOT))) {
                return Optional.of(priority);
            }
        }
        return Optional.empty();
    }

    private static Iterator<Reading> within(Iterator<Reading> readings, Instant from, Instant until) {
        return new Iterator<>() {
            private Reading next = advance();

            private Reading advance() {
                while (readings.hasNext()) {
                    Reading reading = readings.next();
                    if (reading.timestamp().isAfter(until)) {
                        return null;
                    }
                    if (!reading.timestamp().isBefore(from)) {
                        return reading;
                    }
                }
                return null;
            }

            @Override
            public boolean hasNext() {
                return next != null;
            }

            @Override
            public Reading next() {
                if (next == null) {
                    throw new NoSuchElementException("no more readings");
                }
                Reading result = next;
                next = advance();
                return result;
            }
        };
    }
}
