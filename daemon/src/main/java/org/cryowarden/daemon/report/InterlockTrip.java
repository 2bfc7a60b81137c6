package org.cryowarden.daemon.report;

import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.daemon.journal.JournalEvent;

/**
 * One trip of an interlock and its reset.
 *
 * @param causeAlarm the alarm that tripped it
 * @param resetAt    empty while still tripped at the end of the period
 * @param resetBy    the operator who reset it
 */
public record InterlockTrip(String interlockId, Instant trippedAt, String causeAlarm, Optional<Instant> resetAt,
                            Optional<String> resetBy) {

    public InterlockTrip {
        Objects.requireNonNull(interlockId, "interlockId");
        Objects.requireNonNull(trippedAt, "trippedAt");
        Objects.requireNonNull(causeAlarm, "causeAlarm");
        Objects.requireNonNull(resetAt, "resetAt");
        Objects.requireNonNull(resetBy, "resetBy");
    }

    /** Each {@code interlock.tripped} among {@code events} with the {@code interlock.reset} that followed it. */
    static List<InterlockTrip> of(List<JournalEvent> events) {
        Map<String, Integer> open = new LinkedHashMap<>();
        List<InterlockTrip> trips = new ArrayList<>();
        for (JournalEvent event : events) {
            if (event.subject().isEmpty()) {
                continue;
            }
            String id = event.subject().get();
            if (event.kind().equals("interlock.tripped")) {
                String cause = JournalAlarms.payload(event).path("cause_alarm").asText("");
                open.put(id, trips.size());
                trips.add(new InterlockTrip(id, event.at(), cause, Optional.empty(), Optional.empty()));
            } else if (event.kind().equals("interlock.reset")) {
                Integer index = open.remove(id);
                if (index != null) {
                    InterlockTrip trip = trips.get(index);
                    trips.set(index, new InterlockTrip(id, trip.trippedAt(), trip.causeAlarm(),
                            Optional.of(event.at()), event.operator()));
                }
            }
        }
        return trips;
    }
}
