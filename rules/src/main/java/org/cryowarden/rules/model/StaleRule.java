package org.cryowarden.rules.model;

import java.time.Duration;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.SourcePosition;

/**
 * Raises a fault alarm when a channel has had no GOOD reading within the timeout (the channel's own stale
 * timeout when empty) or its latest reading is BAD, so a dead sensor is never silently treated as normal.
 */
public record StaleRule(
        String id,
        String channel,
        Optional<Duration> timeout,
        AlarmOptions alarm,
        SourcePosition position) implements RuleDef {

    public StaleRule {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(timeout, "timeout");
        Objects.requireNonNull(alarm, "alarm");
        Objects.requireNonNull(position, "position");
    }

    @Override
    public List<String> inputs() {
        return List.of(channel);
    }
}
