package org.cryowarden.daemon.replay;

import java.time.Duration;
import java.time.Instant;
import java.util.Objects;
import java.util.Optional;

/**
 * How one activation of an alarm differs between what was recorded and what the replay produced.
 *
 * @param recordedStart empty for a {@link Kind#NEW} activation
 * @param replayedStart empty for a {@link Kind#GONE} activation
 */
public record AlarmDifference(Kind kind, String alarmId, Optional<Instant> recordedStart,
                              Optional<Instant> replayedStart) {

    /** What changed. */
    public enum Kind {
        /** The replay raises an activation that was not recorded. */
        NEW,
        /** A recorded activation does not happen in the replay. */
        GONE,
        /** The activation happens in both, starting at another instant. */
        MOVED
    }

    public AlarmDifference {
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(alarmId, "alarmId");
        Objects.requireNonNull(recordedStart, "recordedStart");
        Objects.requireNonNull(replayedStart, "replayedStart");
    }

    /** How far the start moved (positive: later in the replay); empty unless {@link Kind#MOVED}. */
    public Optional<Duration> shift() {
        if (recordedStart.isEmpty() || replayedStart.isEmpty()) {
            return Optional.empty();
        }
        return Optional.of(Duration.between(recordedStart.get(), replayedStart.get()));
    }

    /** The earlier of the two starts: where this difference sits in time. */
    Instant at() {
        if (recordedStart.isEmpty()) {
            return replayedStart.orElseThrow();
        }
        if (replayedStart.isEmpty()) {
            return recordedStart.get();
        }
        return recordedStart.get().isBefore(replayedStart.get()) ? recordedStart.get() : replayedStart.get();
    }
}
