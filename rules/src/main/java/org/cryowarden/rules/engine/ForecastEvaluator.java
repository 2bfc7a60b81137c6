package org.cryowarden.rules.engine;

import java.time.Instant;
import java.time.LocalTime;
import java.time.ZoneId;
import java.time.ZoneOffset;
import java.time.ZonedDateTime;
import java.time.temporal.ChronoUnit;
import java.time.format.DateTimeFormatter;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.trend.TheilSen;

/**
 * Time to a minimum level from a Theil-Sen fit (see {@link TheilSen}) of the GOOD readings of the last window,
 * timed on the monotonic clock at arrival. At most {@value #MAX_POINTS} points are kept (readings closer together
 * than window / {@value #MAX_POINTS} are not added to the fit), so the cost per reading is bounded whatever the
 * poll period.
 *
 * <p>There is a forecast once at least {@value #MIN_POINTS} points span at least half the window and the fitted
 * line falls; it is published as hours until the crossing. A refill restarts the fit: two readings in a row more
 * than the refill rise above the fitted line (one alone is an outlier, which the fit shrugs off). The alarm's
 * condition holds when the crossing comes before the next occurrence of the local time of day (in the rule's or the
 * site's zone, so daylight-saving changes are the zone rules' business) or within the duration; a forecast beyond
 * both, a level that is not falling, or a refill clears it; with no forecast (too few readings, a dead sensor) it
 * keeps its value.
 */
final class ForecastEvaluator extends RuleEvaluator {

    static final int MAX_POINTS = 240;
    static final int MIN_POINTS = 5;
    private static final DateTimeFormatter LOCAL = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm");

    private final Core core;
    private final String channel;
    private final Unit unit;
    private final double reaches;
    private final double refillRise;
    private final long windowNanos;
    private final long spacingNanos;
    private final ForecastChannel published;
    private final LocalTime before;
    private final ZoneId zone;
    private final long withinNanos;

    private final long[] times = new long[MAX_POINTS];
    private final double[] values = new double[MAX_POINTS];
    private final double[] xs = new double[MAX_POINTS];
    private final double[] ys = new double[MAX_POINTS];
    private int head;
    private int size;
    private final TheilSen fitter = new TheilSen();
    /** The fitted line, x in seconds since {@link #base} on the monotonic clock; null while there is no fit. */
    private TheilSen.Line line;
    private long base;
    private boolean pendingHigh;
    private long pendingAt;
    private double pendingValue;

    /**
     * @param before      null when the rule has no local time of day
     * @param withinNanos 0 when the rule has no duration
     * @param published   null when the rule publishes no channel
     */
    ForecastEvaluator(AlarmRuntime alarm, Core core, String channel, Unit unit, double reaches, double refillRise,
            long windowNanos, ForecastChannel published, LocalTime before, ZoneId zone, long withinNanos) {
        super(alarm);
        this.core = core;
        this.channel = channel;
        this.unit = unit;
        this.reaches = reaches;
        this.refillRise = refillRise;
        this.windowNanos = windowNanos;
        this.spacingNanos = windowNanos / MAX_POINTS;
        this.published = published;
        this.before = before;
        this.zone = zone;
        this.withinNanos = withinNanos;
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        if (reading.quality() != Quality.GOOD) {
            publish(new Reading(idOrChannel(), Double.NaN, Unit.HOUR, reading.timestamp(), reading.quality(),
                    "no forecast: " + Texts.reading(reading)));
            return;
        }
        long now = core.now;
        double value = reading.value();
        boolean changed = evictBefore(now - windowNanos);
        if (isHigh(now, value)) {
            if (pendingHigh) {
                restart(reading);
                return;
            }
            pendingHigh = true;
            pendingAt = now;
            pendingValue = value;
        } else {
            pendingHigh = false;
        }
        if (size == 0 || now - times[index(size - 1)] >= spacingNanos) {
            add(now, value);
            changed = true;
        }
        if (changed) {
            fit();
        }
        judge(reading);
    }

    /** Whether a reading lies more than the refill rise above the fitted line (or, before a fit, the points). */
    private boolean isHigh(long now, double value) {
        if (size == 0) {
            return false;
        }
        double expected;
        if (line != null) {
            expected = line.at(seconds(now));
        } else {
            expected = Double.NEGATIVE_INFINITY;
            for (int i = 0; i < size; i++) {
                expected = Math.max(expected, values[index(i)]);
            }
        }
        return value > expected + refillRise;
    }

    private void restart(Reading reading) {
        head = 0;
        size = 0;
        line = null;
        pendingHigh = false;
        add(pendingAt, pendingValue);
        add(core.now, reading.value());
        publish(new Reading(idOrChannel(), Double.NaN, Unit.HOUR, reading.timestamp(), Quality.UNCERTAIN,
                "no forecast: refill (" + Texts.reading(reading) + "), the fit starts again"));
        if (raw) {
            change(false, reading, "refill: " + Texts.reading(reading) + ", the forecast starts again");
        }
    }

    private void judge(Reading reading) {
        if (line == null) {
            long span = size == 0 ? 0 : times[index(size - 1)] - times[head];
            publish(new Reading(idOrChannel(), Double.NaN, Unit.HOUR, reading.timestamp(), Quality.UNCERTAIN,
                    "no forecast yet: " + size + " GOOD readings over " + Texts.nanos(span) + ", needs "
                            + MIN_POINTS + " over " + Texts.nanos(windowNanos / 2)));
            return;
        }
        double perHour = line.slope() * 3600;
        if (!(line.slope() < 0)) {
            publish(new Reading(idOrChannel(), Double.NaN, Unit.HOUR, reading.timestamp(), Quality.UNCERTAIN,
                    "no forecast: " + channel + " is not falling (" + Texts.number(perHour) + " " + unit.symbol()
                            + "/h)"));
            if (raw) {
                change(false, reading, channel + " is not falling (" + Texts.number(perHour) + " " + unit.symbol()
                        + "/h)");
            }
            return;
        }
        double crossingSeconds = (reaches - line.intercept()) / line.slope();
        double leftSeconds = Math.max(0, crossingSeconds - seconds(core.now));
        long leftNanos = (long) Math.min(leftSeconds * 1e9, Long.MAX_VALUE / 4.0);
        publish(new Reading(idOrChannel(), leftSeconds / 3600, Unit.HOUR, reading.timestamp(), Quality.GOOD, ""));
        Instant crossing = core.wall.plusNanos(leftNanos);
        boolean early = false;
        StringBuilder deadline = new StringBuilder();
        if (before != null) {
            boolean beforeNext = crossing.isBefore(nextOccurrence(core.wall));
            early = beforeNext;
            deadline.append(beforeNext ? "before" : "after").append(" the next ").append(before).append(' ')
                    .append(zone.getId());
        }
        if (withinNanos > 0) {
            boolean soon = leftNanos < withinNanos;
            early = early || soon;
            deadline.append(deadline.length() == 0 ? "" : "; ").append(soon ? "within " : "not within ")
                    .append(Texts.nanos(withinNanos));
        }
        if (early != raw) {
            change(early, reading, channel + " falling at " + Texts.number(-perHour) + " " + unit.symbol() + "/h "
                    + "reaches " + Texts.quantity(reaches, unit) + " at " + when(crossing) + " (in "
                    + Texts.number(leftSeconds / 3600) + " h), " + deadline);
        }
    }

    /** The next instant, strictly after {@code wall}, at which the local clock in the zone shows {@code before}. */
    Instant nextOccurrence(Instant wall) {
        ZonedDateTime local = wall.atZone(zone);
        // ZonedDateTime.of moves a time in a spring-forward gap later by the gap, as the clocks on the wall do.
        ZonedDateTime candidate = ZonedDateTime.of(local.toLocalDate(), before, zone);
        if (!candidate.toInstant().isAfter(wall)) {
            candidate = ZonedDateTime.of(local.toLocalDate().plusDays(1), before, zone);
        }
        return candidate.toInstant();
    }

    /** The crossing to the nearest minute, in the rule's zone (UTC when it has none): a forecast, not a stopwatch. */
    private String when(Instant crossing) {
        Instant minute = crossing.plusSeconds(30).truncatedTo(ChronoUnit.MINUTES);
        return zone == null ? LOCAL.format(minute.atZone(ZoneOffset.UTC)) + " UTC"
                : LOCAL.format(minute.atZone(zone)) + " " + zone.getId();
    }

    private void fit() {
        if (size < MIN_POINTS || times[index(size - 1)] - times[head] < windowNanos / 2) {
            line = null;
            return;
        }
        base = times[head];
        for (int i = 0; i < size; i++) {
            int slot = index(i);
            xs[i] = (times[slot] - base) * 1e-9;
            ys[i] = values[slot];
        }
        line = fitter.fit(xs, ys, size);
    }

    private double seconds(long monotonic) {
        return (monotonic - base) * 1e-9;
    }

    private void add(long time, double value) {
        if (size == MAX_POINTS) {
            head = (head + 1) % MAX_POINTS;
            size--;
        }
        int slot = index(size);
        times[slot] = time;
        values[slot] = value;
        size++;
    }

    /** Drops the points older than the window; whether any went. */
    private boolean evictBefore(long cutoff) {
        boolean evicted = false;
        while (size > 0 && times[head] - cutoff < 0) {
            head = (head + 1) % MAX_POINTS;
            size--;
            evicted = true;
        }
        return evicted;
    }

    private int index(int offset) {
        return (head + offset) % MAX_POINTS;
    }

    private String idOrChannel() {
        return published == null ? channel : published.id;
    }

    private void publish(Reading reading) {
        if (published != null) {
            core.deliver(published, reading);
        }
    }

    @Override
    void restoredActive() {
        // Held until the first forecast after the restart judges again.
    }
}
