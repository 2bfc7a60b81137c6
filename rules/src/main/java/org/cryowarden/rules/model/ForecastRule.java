package org.cryowarden.rules.model;

import java.time.Duration;
import java.time.LocalTime;
import java.time.ZoneId;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;

/**
 * Forecasts when a falling channel (a dewar level) reaches a minimum, from a robust (Theil-Sen) fit of its GOOD
 * readings over the last {@code window}, and alarms when that instant falls before the next local time of day
 * {@code before} (in {@code timeZone}, else the site's) or within {@code within} from now. A rise of more than
 * {@code refillRise} on two readings in a row is a refill: the fit starts again.
 *
 * @param reaches    the minimum level, in a unit of the channel's kind (e.g. 10 % or 25 L)
 * @param refillRise how far above the fitted line two readings in a row must be to count as a refill
 * @param publish    the id of the forecast channel (hours until the crossing, unit h) that other rules may read
 * @param before     alarm when the crossing comes before the next occurrence of this local time of day
 * @param within     alarm when the crossing comes within this duration from now
 * @param timeZone   the zone of {@code before}; empty to use the site's
 */
public record ForecastRule(
        String id,
        String channel,
        Quantity reaches,
        Duration window,
        Quantity refillRise,
        Optional<String> publish,
        Optional<LocalTime> before,
        Optional<Duration> within,
        Optional<ZoneId> timeZone,
        AlarmOptions alarm,
        SourcePosition position) implements RuleDef {

    public ForecastRule {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(reaches, "reaches");
        Objects.requireNonNull(window, "window");
        Objects.requireNonNull(refillRise, "refillRise");
        Objects.requireNonNull(publish, "publish");
        Objects.requireNonNull(before, "before");
        Objects.requireNonNull(within, "within");
        Objects.requireNonNull(timeZone, "timeZone");
        Objects.requireNonNull(alarm, "alarm");
        Objects.requireNonNull(position, "position");
        if (window.isZero() || window.isNegative()) {
            throw new IllegalArgumentException("forecast " + id + " needs a positive window, got " + window);
        }
        if (before.isEmpty() && within.isEmpty()) {
            throw new IllegalArgumentException("forecast " + id + " needs 'before' or 'within' (or both)");
        }
        if (within.isPresent() && (within.get().isZero() || within.get().isNegative())) {
            throw new IllegalArgumentException("forecast " + id + " needs a positive 'within', got " + within.get());
        }
        if (!(refillRise.value() > 0)) {
            throw new IllegalArgumentException("forecast " + id + " needs a positive refill rise, got " + refillRise);
        }
    }

    @Override
    public List<String> inputs() {
        return List.of(channel);
    }
}
