package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.List;
import java.util.Objects;

/**
 * An interlock tripped and is now latched until its cause is clear and an operator resets it.
 *
 * @param causeAlarm the alarm whose activation (or whose persisting condition at the end of a bypass) tripped it
 * @param commands   the writes of its actions; they also follow as separate {@link OutputCommand} events, which
 *                   are what the output sink executes
 */
public record InterlockTripped(
        Instant instant, String interlockId, String causeAlarm, List<OutputCommand> commands, String cause)
        implements EngineEvent {

    public InterlockTripped {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(interlockId, "interlockId");
        Objects.requireNonNull(causeAlarm, "causeAlarm");
        commands = List.copyOf(commands);
        Objects.requireNonNull(cause, "cause");
    }
}
