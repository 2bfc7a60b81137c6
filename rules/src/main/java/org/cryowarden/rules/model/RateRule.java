package org.cryowarden.rules.model;

import java.time.Duration;
import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;

/**
 * Alarms when a channel changes faster than {@code change} per {@code per} (e.g. level falling faster than
 * 3 % per hour), the slope being the least-squares fit over the GOOD readings of the last {@code window}.
 */
public record RateRule(
        String id,
        String channel,
        Direction direction,
        Quantity change,
        Duration per,
        Duration window,
        AlarmOptions alarm,
        SourcePosition position) implements RuleDef {

    public RateRule {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(direction, "direction");
        Objects.requireNonNull(change, "change");
        Objects.requireNonNull(per, "per");
        Objects.requireNonNull(window, "window");
        Objects.requireNonNull(alarm, "alarm");
        Objects.requireNonNull(position, "position");
        if (per.isZero() || per.isNegative() || window.isZero() || window.isNegative()) {
            throw new IllegalArgumentException("rate rule " + id + " needs a positive time base and window");
        }
        if (change.value() <= 0) {
            throw new IllegalArgumentException("rate of " + id + " must be positive; the direction says rising or falling");
        }
    }

    @Override
    public List<String> inputs() {
        return List.of(channel);
    }
}
