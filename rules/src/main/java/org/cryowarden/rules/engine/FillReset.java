package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.Objects;

/** An operator cleared a fill's lockout; the controller decides again from the next level reading. */
public record FillReset(Instant instant, String fillId, String operator, String cause) implements EngineEvent {

    public FillReset {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(fillId, "fillId");
        Objects.requireNonNull(operator, "operator");
        Objects.requireNonNull(cause, "cause");
    }
}
