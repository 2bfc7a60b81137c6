package org.cryowarden.daemon.report;

import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Collection;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.function.Consumer;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.journal.MinuteAggregate;

/**
 * What a journal holds for a report's period: its events and, per channel, its minute aggregates. Read once; the
 * report's figures are pure functions of it.
 *
 * @param aggregates per channel, the minutes that start in the period, oldest first
 */
public record NightRecord(Path journalFile, ReportWindow window, List<JournalEvent> events,
                          Map<String, List<MinuteAggregate>> aggregates) {

    private static final int PAGE = 5_000;

    public NightRecord {
        events = List.copyOf(events);
        Map<String, List<MinuteAggregate>> copy = new LinkedHashMap<>();
        aggregates.forEach((channel, minutes) -> copy.put(channel, List.copyOf(minutes)));
        aggregates = java.util.Collections.unmodifiableMap(copy);
    }

    /**
     * Reads {@code journal} for the period from {@code since} to {@code until}; an open end defaults to the first
     * or last thing recorded. {@code channels} are read in that order, then any other channel with minutes.
     *
     * @throws IllegalArgumentException when the journal holds nothing for the period
     */
    public static NightRecord read(Journal journal, Optional<Instant> since, Optional<Instant> until,
            Collection<String> channels, Consumer<String> progress) throws JournalException {
        progress.accept("reading events");
        List<JournalEvent> all = new ArrayList<>();
        long after = 0;
        while (true) {
            List<JournalEvent> page = journal.eventsAfter(after, PAGE);
            all.addAll(page);
            if (page.size() < PAGE) {
                break;
            }
            after = page.get(page.size() - 1).seq();
        }
        List<String> ids = new ArrayList<>(channels);
        for (String channel : journal.aggregateChannels()) {
            if (!ids.contains(channel)) {
                ids.add(channel);
            }
        }
        Instant wide = Instant.ofEpochMilli(Long.MAX_VALUE);
        Map<String, List<MinuteAggregate>> minutes = new LinkedHashMap<>();
        Instant first = null;
        Instant lastMinute = null;
        for (int i = 0; i < ids.size(); i++) {
            progress.accept("reading minutes of channel " + (i + 1) + " of " + ids.size() + " (" + ids.get(i) + ")");
            List<MinuteAggregate> list = journal.aggregates(ids.get(i), since.map(Minutes::floor).orElse(Instant.EPOCH),
                    until.orElse(wide));
            minutes.put(ids.get(i), list);
            if (!list.isEmpty()) {
                first = min(first, list.get(0).minute());
                lastMinute = max(lastMinute, list.get(list.size() - 1).minute());
            }
        }
        for (JournalEvent event : all) {
            first = min(first, event.at());
        }
        Instant last = null;
        if (!all.isEmpty() && all.get(all.size() - 1).kind().equals("daemon.stopped")) {
            // A clean stop ends the night: no reading of the last minute came after it.
            Instant stop = all.get(all.size() - 1).at();
            last = lastMinute == null ? stop : max(stop, lastMinute);
        } else {
            if (lastMinute != null) {
                last = lastMinute.plus(Duration.ofMinutes(1));
            }
            if (!all.isEmpty()) {
                last = max(last, all.get(all.size() - 1).at().plusMillis(1));
            }
        }
        Instant from = since.orElse(first);
        Instant to = until.orElse(last);
        if (from == null || to == null || !to.isAfter(from)) {
            throw new IllegalArgumentException("the journal " + journal.file() + " holds nothing"
                    + (since.isPresent() || until.isPresent() ? " in the period asked for" : "")
                    + "; check the file (is it the one the daemon writes?) or the --since/--until times");
        }
        ReportWindow window = new ReportWindow(from, to);
        List<JournalEvent> inWindow = all.stream()
                .filter(e -> !e.at().isBefore(window.from()) && !e.at().isAfter(window.until())).toList();
        return new NightRecord(journal.file(), window, inWindow, minutes);
    }

    /** The events of one kind, in order. */
    public List<JournalEvent> eventsOf(String kind) {
        return events.stream().filter(e -> e.kind().equals(kind)).toList();
    }

    private static Instant min(Instant a, Instant b) {
        return a == null || b.isBefore(a) ? b : a;
    }

    private static Instant max(Instant a, Instant b) {
        return a == null || b.isAfter(a) ? b : a;
    }

    /** Minute arithmetic for aggregate queries. */
    static final class Minutes {
        private Minutes() {
        }

        static Instant floor(Instant at) {
            return Instant.ofEpochMilli(Math.floorDiv(at.toEpochMilli(), 60_000L) * 60_000L);
        }
    }
}
