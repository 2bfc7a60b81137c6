package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.List;
import java.util.Objects;

/**
 * An operator reset a tripped interlock whose cause was clear; its outputs return to their safe values.
 *
 * @param commands the writes back to safe values (also emitted as separate {@link OutputCommand} events); an
 *                 output still held by another tripped interlock is left to that interlock
 */
public record InterlockReset(
        Instant instant, String interlockId, String operator, List<OutputCommand> commands, String cause)
        implements EngineEvent {

    public InterlockReset {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(interlockId, "interlockId");
        Objects.requireNonNull(operator, "operator");
        commands = List.copyOf(commands);
        Objects.requireNonNull(cause, "cause");
    }
}
