package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.Reading;

/**
 * A fill controller closed its valve.
 *
 * @param reason    why, as a word for the journal and the report
 * @param lockedOut whether the fill is now locked out until an operator resets it ({@link Engine#resetFill})
 * @param level     the latest level reading when it closed, if any
 * @param command   the write that closes the valve (the output's safe value); it also follows as a separate
 *                  {@link OutputCommand} event
 */
public record FillStopped(Instant instant, String fillId, String valve, FillStopReason reason, boolean lockedOut,
        Optional<Reading> level, OutputCommand command, String cause) implements EngineEvent {

    public FillStopped {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(fillId, "fillId");
        Objects.requireNonNull(valve, "valve");
        Objects.requireNonNull(reason, "reason");
        Objects.requireNonNull(level, "level");
        Objects.requireNonNull(command, "command");
        Objects.requireNonNull(cause, "cause");
    }
}
