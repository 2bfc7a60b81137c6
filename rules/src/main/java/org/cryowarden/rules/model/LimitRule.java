package org.cryowarden.rules.model;

import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;

/**
 * Alarms when a channel goes above (HIGH) or below (LOW) a setpoint; it clears only once the value is back
 * past the setpoint by the deadband.
 */
public record LimitRule(
        String id,
        String channel,
        Direction direction,
        Quantity setpoint,
        Quantity deadband,
        AlarmOptions alarm,
        SourcePosition position) implements RuleDef {

    public LimitRule {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(direction, "direction");
        Objects.requireNonNull(setpoint, "setpoint");
        Objects.requireNonNull(deadband, "deadband");
        Objects.requireNonNull(alarm, "alarm");
        Objects.requireNonNull(position, "position");
        if (deadband.value() < 0) {
            throw new IllegalArgumentException("deadband of " + id + " cannot be negative, got " + deadband);
        }
    }

    @Override
    public List<String> inputs() {
        return List.of(channel);
    }
}
