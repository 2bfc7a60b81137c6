package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.Objects;
import org.cryowarden.rules.Reading;

/**
 * A fill controller opened its valve: the level was below its start level and no blocking alarm was active.
 *
 * @param level   the reading that started the fill
 * @param command the write that opens the valve; it also follows as a separate {@link OutputCommand} event
 */
public record FillStarted(Instant instant, String fillId, String valve, Reading level, OutputCommand command,
        String cause) implements EngineEvent {

    public FillStarted {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(fillId, "fillId");
        Objects.requireNonNull(valve, "valve");
        Objects.requireNonNull(level, "level");
        Objects.requireNonNull(command, "command");
        Objects.requireNonNull(cause, "cause");
    }
}
