package org.cryowarden.daemon.replay;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.model.Priority;

/**
 * One annunciation of an alarm: from the change that made it active to the change that ended it.
 *
 * @param end empty when the alarm was still active at the end of the events
 */
public record AlarmActivation(String alarmId, Priority priority, Instant start, Optional<Instant> end) {

    static final Comparator<AlarmActivation> ORDER = Comparator.comparing(AlarmActivation::start)
            .thenComparing(AlarmActivation::alarmId);

    public AlarmActivation {
        Objects.requireNonNull(alarmId, "alarmId");
        Objects.requireNonNull(priority, "priority");
        Objects.requireNonNull(start, "start");
        Objects.requireNonNull(end, "end");
    }

    /** How long it was active, counting an open activation up to {@code until}. */
    public Duration duration(Instant until) {
        Instant stop = end.orElse(until);
        return stop.isBefore(start) ? Duration.ZERO : Duration.between(start, stop);
    }

    /** The instant it ended, or {@code until} for one still active. */
    Instant endOr(Instant until) {
        return end.orElse(until);
    }

    /**
     * Every activation in {@code changes}, ordered by start, then alarm id. A change that ends an activation that
     * began before the list is ignored.
     */
    public static List<AlarmActivation> of(List<AlarmChange> changes) {
        Map<String, AlarmChange> open = new HashMap<>();
        List<AlarmActivation> result = new ArrayList<>();
        for (AlarmChange change : changes) {
            if (change.activates()) {
                AlarmChange previous = open.put(change.alarmId(), change);
                if (previous != null) {
                    result.add(closed(previous, change.instant()));
                }
            } else if (change.deactivates()) {
                AlarmChange started = open.remove(change.alarmId());
                if (started != null) {
                    result.add(closed(started, change.instant()));
                }
            }
        }
        for (AlarmChange started : open.values()) {
            result.add(new AlarmActivation(started.alarmId(), started.priority(), started.instant(), Optional.empty()));
        }
        result.sort(ORDER);
        return result;
    }

    private static AlarmActivation closed(AlarmChange start, Instant end) {
        return new AlarmActivation(start.alarmId(), start.priority(), start.instant(), Optional.of(end));
    }
}
