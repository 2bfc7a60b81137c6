package org.cryowarden.rules.trend;

import java.time.Instant;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.function.DoubleUnaryOperator;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;

/**
 * How much liquid a dewar used over a series of readings, in litres of liquid, with refills left out rather than
 * subtracted: the series is cut into falling stretches at each refill, and the consumption is the sum of what
 * each stretch lost. A refill is a reading more than {@code refillRiseLitres} above the lowest reading of the
 * stretch so far; it lasts while the readings keep rising, and the next stretch starts at its highest reading.
 * Smaller rises (noise, sloshing) stay inside a stretch, so noise enters only at a stretch's ends, not once per
 * reading. A stretch that ends at a refill ends at its lowest reading; the last stretch ends at its last reading.
 * Only GOOD readings count, in timestamp order as given. Pure: the morning report calls it over journal readings.
 */
public final class LiquidConsumption {

    /**
     * What a period used.
     *
     * @param consumedLitres litres of liquid used, refills left out
     * @param refills        how many refills were recognised
     * @param refilledLitres litres the refills added (highest reading of a refill minus the lowest before it)
     * @param readingsUsed   GOOD readings counted
     * @param from           timestamp of the first GOOD reading, if any
     * @param until          timestamp of the last GOOD reading, if any
     */
    public record Consumption(double consumedLitres, int refills, double refilledLitres, int readingsUsed,
            Optional<Instant> from, Optional<Instant> until) {

        public Consumption {
            Objects.requireNonNull(from, "from");
            Objects.requireNonNull(until, "until");
        }
    }

    private LiquidConsumption() {
    }

    /** Consumption from readings already in litres (a derived {@code litres_*} channel). */
    public static Consumption ofLitres(List<Reading> readings, double refillRiseLitres) {
        return of(readings, DoubleUnaryOperator.identity(), refillRiseLitres);
    }

    /**
     * Consumption from readings of any kind, converted into litres by {@code litresOf} (e.g.
     * {@link org.cryowarden.rules.physics.DewarGauge#litres(double)} for a level in %).
     *
     * @param refillRiseLitres the rise, in litres, that marks a refill; more than zero
     */
    public static Consumption of(List<Reading> readings, DoubleUnaryOperator litresOf, double refillRiseLitres) {
        if (!(refillRiseLitres > 0) || !Double.isFinite(refillRiseLitres)) {
            throw new IllegalArgumentException("the refill rise must be a positive number of litres, got "
                    + refillRiseLitres);
        }
        double consumed = 0;
        double refilled = 0;
        int refills = 0;
        int used = 0;
        Instant from = null;
        Instant until = null;
        boolean rising = false;
        double start = Double.NaN;
        double lowest = Double.NaN;
        double last = Double.NaN;
        for (Reading reading : readings) {
            if (reading.quality() != Quality.GOOD) {
                continue;
            }
            double litres = litresOf.applyAsDouble(reading.value());
            used++;
            if (from == null) {
                from = reading.timestamp();
                start = litres;
                lowest = litres;
            } else if (rising) {
                if (litres > last) {
                    refilled += litres - last;
                } else {
                    rising = false;
                    start = last;
                    lowest = Math.min(last, litres);
                }
            } else if (litres > lowest + refillRiseLitres) {
                consumed += start - lowest;
                refilled += litres - lowest;
                refills++;
                rising = true;
            } else {
                lowest = Math.min(lowest, litres);
            }
            last = litres;
            until = reading.timestamp();
        }
        if (from != null && !rising) {
            consumed += start - last;
        }
        return new Consumption(consumed, refills, refilled, used, Optional.ofNullable(from),
                Optional.ofNullable(until));
    }
}
