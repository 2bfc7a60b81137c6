package org.cryowarden.rules.engine;

import java.util.Optional;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.ValueRange;

/**
 * A channel fed by a driver. It converts readings into its unit, downgrades values outside the valid range to BAD,
 * and turns STALE by itself when no reading at all arrives within its stale timeout.
 */
final class MeasuredChannel extends ChannelNode {

    private final Core core;
    private final ChannelDef def;
    private final Optional<ValueRange> validRange;
    /**
     * The valid range's ends, kept here (minus and plus infinity without a range) so that the check on every
     * reading reads this object only.
     */
    private final double validMin;
    private final double validMax;
    final long staleAfterNanos;
    private long lastArrival;
    /**
     * Whether {@link #staleTimer} is queued, mirrored here so that an arrival reads this object only: the timer is
     * queued from {@link #start} on and leaves the queue only to expire, when it re-arms or lets go.
     */
    private boolean staleArmed;
    private final Timer staleTimer = new Timer() {
        @Override
        void expire() {
            staleTimeout();
        }
    };

    MeasuredChannel(Core core, ChannelDef def) {
        super(def.id(), def.unit());
        this.core = core;
        this.def = def;
        this.validRange = def.validRange();
        this.validMin = validRange.map(ValueRange::min).orElse(Double.NEGATIVE_INFINITY);
        this.validMax = validRange.map(ValueRange::max).orElse(Double.POSITIVE_INFINITY);
        this.staleAfterNanos = def.staleAfter().toNanos();
    }

    /** Starts the stale timeout from now, as if a reading had just been expected. */
    void start(long now) {
        lastArrival = now;
        armStale(now + staleAfterNanos);
    }

    /** The reading as the rules see it: in this channel's unit, BAD when implausible. */
    Reading admit(Reading reading) {
        Reading admitted = reading;
        if (reading.unit() != unit) {
            if (!reading.unit().isCompatibleWith(unit)) {
                return Reading.bad(id, unit, reading.timestamp(), "reading in " + reading.unit().symbol()
                        + " cannot be converted to the channel's unit " + unit.symbol());
            }
            admitted = new Reading(id, reading.unit().convert(reading.value(), unit, core.ambientPa), unit,
                    reading.timestamp(), reading.quality(), reading.reason());
        }
        Quality quality = admitted.quality();
        if (quality == Quality.GOOD || quality == Quality.UNCERTAIN) {
            double value = admitted.value();
            if (!Double.isFinite(value)) {
                return admitted.withQuality(Quality.BAD, "no value"
                        + (admitted.reason().isEmpty() ? "" : " (" + admitted.reason() + ")"));
            }
            if (!(value >= validMin && value <= validMax)) {
                ValueRange range = validRange.get();
                return admitted.withQuality(Quality.BAD, "value " + Texts.quantity(value, unit)
                        + " outside the valid range " + Texts.number(range.min()) + " to "
                        + Texts.quantity(range.max(), unit));
            }
        }
        return admitted;
    }

    void arrived(long now) {
        lastArrival = now;
        if (!staleArmed) {
            armStale(now + staleAfterNanos);
        }
    }

    private void armStale(long due) {
        staleArmed = true;
        core.timers.schedule(staleTimer, due);
    }

    private void staleTimeout() {
        staleArmed = false;
        long due = lastArrival + staleAfterNanos;
        if (due - core.now > 0) {
            armStale(due);
            return;
        }
        if (latest == null || latest.quality() != Quality.STALE) {
            core.deliver(this, Reading.stale(id, unit, core.wall, "no reading for " + Texts.nanos(staleAfterNanos)
                    + ", polled every " + Texts.duration(def.period())));
        }
    }
}
