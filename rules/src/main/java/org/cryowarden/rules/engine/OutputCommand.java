package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.Objects;

/**
 * Write {@code value} to the output {@code outputId}. The engine only decides; the driver owning the output
 * executes the write later.
 *
 * @param interlockId the interlock whose trip, reset or restart asked for this write, or the fill controller that
 *                    opens or closes its valve (ids of interlocks and fills never clash)
 */
public record OutputCommand(Instant instant, String outputId, double value, String interlockId, String cause)
        implements EngineEvent {

    public OutputCommand {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(outputId, "outputId");
        Objects.requireNonNull(interlockId, "interlockId");
        Objects.requireNonNull(cause, "cause");
    }
}
