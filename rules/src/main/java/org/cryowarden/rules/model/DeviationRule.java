package org.cryowarden.rules.model;

import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;

/**
 * Alarms when redundant sensors disagree: the spread (max - min) of the GOOD readings exceeds the tolerance.
 */
public record DeviationRule(
        String id,
        List<String> channels,
        Quantity tolerance,
        AlarmOptions alarm,
        SourcePosition position) implements RuleDef {

    public DeviationRule {
        Objects.requireNonNull(id, "id");
        channels = List.copyOf(channels);
        Objects.requireNonNull(tolerance, "tolerance");
        Objects.requireNonNull(alarm, "alarm");
        Objects.requireNonNull(position, "position");
        if (channels.size() < 2) {
            throw new IllegalArgumentException("deviation " + id + " needs at least two channels, got " + channels.size());
        }
    }

    @Override
    public List<String> inputs() {
        return channels;
    }
}
