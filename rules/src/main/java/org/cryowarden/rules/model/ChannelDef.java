package org.cryowarden.rules.model;

import java.time.Duration;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;

/**
 * A measured input channel.
 *
 * @param id          unique over the site, used in rules, topics and the journal
 * @param unit        the unit readings arrive in
 * @param description what and where, for operators ("Oxygen, magnet hall east wall, 1.8 m")
 * @param period      how often the channel is polled
 * @param staleAfter  how long without a GOOD reading before the channel is STALE; longer than {@code period}
 * @param validRange  the physically plausible range; a reading outside it is BAD
 * @param position    where it was defined
 */
public record ChannelDef(
        String id,
        Unit unit,
        String description,
        Duration period,
        Duration staleAfter,
        Optional<ValueRange> validRange,
        SourcePosition position) {

    public ChannelDef {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(description, "description");
        Objects.requireNonNull(period, "period");
        Objects.requireNonNull(staleAfter, "staleAfter");
        Objects.requireNonNull(validRange, "validRange");
        Objects.requireNonNull(position, "position");
        if (staleAfter.compareTo(period) <= 0) {
            throw new IllegalArgumentException("stale timeout of " + id + " must be longer than its poll period (got "
                    + staleAfter + " <= " + period + ") at " + position);
        }
    }
}
