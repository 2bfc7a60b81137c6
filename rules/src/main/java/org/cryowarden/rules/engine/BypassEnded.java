package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.Objects;
import java.util.Optional;

/**
 * A bypass ended, by expiry or by an operator; the interlock acts on trips again (and trips at once if a cause
 * alarm is still active, reported by a following {@link InterlockTripped}).
 *
 * @param endedBy the operator who ended it early; empty when it expired
 */
public record BypassEnded(Instant instant, String interlockId, String owner, Optional<String> endedBy, String cause)
        implements EngineEvent {

    public BypassEnded {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(interlockId, "interlockId");
        Objects.requireNonNull(owner, "owner");
        Objects.requireNonNull(endedBy, "endedBy");
        Objects.requireNonNull(cause, "cause");
    }
}
