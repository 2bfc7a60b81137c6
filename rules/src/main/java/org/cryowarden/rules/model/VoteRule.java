package org.cryowarden.rules.model;

import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;

/**
 * M-out-of-N voting over redundant channels (e.g. 2oo3 oxygen sensors below 19.5 %vol): alarms when at least
 * {@code required} of the channels are past the setpoint. Fail-safe by default: a BAD or STALE channel counts as
 * tripped unless {@code faultCountsAsTripped} is false.
 */
public record VoteRule(
        String id,
        List<String> channels,
        int required,
        Direction direction,
        Quantity setpoint,
        Quantity deadband,
        boolean faultCountsAsTripped,
        AlarmOptions alarm,
        SourcePosition position) implements RuleDef {

    public VoteRule {
        Objects.requireNonNull(id, "id");
        channels = List.copyOf(channels);
        Objects.requireNonNull(direction, "direction");
        Objects.requireNonNull(setpoint, "setpoint");
        Objects.requireNonNull(deadband, "deadband");
        Objects.requireNonNull(alarm, "alarm");
        Objects.requireNonNull(position, "position");
        if (required < 1 || required > channels.size()) {
            throw new IllegalArgumentException("vote " + id + " needs 1 <= M <= N, got " + required + "oo" + channels.size());
        }
    }

    @Override
    public List<String> inputs() {
        return channels;
    }
}
