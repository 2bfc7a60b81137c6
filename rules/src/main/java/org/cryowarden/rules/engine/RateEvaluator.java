package org.cryowarden.rules.engine;

import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.Direction;

/**
 * Rate of change: the least-squares slope of the GOOD readings of the last window, timed on the engine's monotonic
 * clock at arrival (so a wall-clock step cannot fake a slope). The fit needs at least three readings spanning at
 * least half the window, since a slope over a sliver of the window is mostly noise; until then the condition holds.
 * The sums are kept running (constant cost per reading) and recomputed from the buffer once per buffer length of
 * evictions, so rounding cannot drift over a long night.
 */
final class RateEvaluator extends RuleEvaluator {

    private static final int MINIMUM_POINTS = 3;

    private final Core core;
    private final boolean rising;
    private final long windowNanos;
    /** Threshold in channel units per second. */
    private final double perSecond;
    /** What the cause says, read only when the condition changes: kept apart so this object is the fit alone. */
    private final Wording wording;

    /**
     * The window's points, time and value side by side (value as raw double bits), so that taking the oldest point
     * and adding the newest each touch one place in memory; a ring of {@code capacity} points.
     */
    private long[] points;
    private int capacity;
    private int head;
    private int size;
    private long base;
    private double sumX;
    private double sumY;
    private double sumXX;
    private double sumXY;
    private int evictionsSinceRecompute;

    RateEvaluator(AlarmRuntime alarm, Core core, Direction direction, double perSecond, long windowNanos,
            Unit channelUnit, Unit changeUnit, double perSeconds, String rateUnit, String thresholdText,
            int expectedPoints) {
        super(alarm);
        // Sized once for the window's points at the channel's period, allocated beside this rule rather than grown
        // later somewhere else in the heap; it still grows if readings come faster.
        this.capacity = Math.max(16, Integer.highestOneBit(Math.max(1, expectedPoints) - 1) << 1);
        this.points = new long[2 * capacity];
        this.core = core;
        this.rising = direction == Direction.HIGH;
        this.perSecond = perSecond;
        this.windowNanos = windowNanos;
        this.wording = new Wording(channelUnit, changeUnit, perSeconds, rateUnit, thresholdText);
    }

    @Override
    void onReading(ChannelNode node, Reading reading) {
        if (reading.quality() != Quality.GOOD) {
            return;
        }
        long now = core.now;
        evictBefore(now - windowNanos);
        add(now, reading.value());
        if (size < MINIMUM_POINTS || time(index(size - 1)) - time(head) < windowNanos / 2) {
            return;
        }
        double n = size;
        double slope = (n * sumXY - sumX * sumY) / (n * sumXX - sumX * sumX);
        boolean past = rising ? slope > perSecond : slope < -perSecond;
        if (past != raw) {
            change(past, reading, wording.cause(node.id, rising, past, slope));
        }
    }

    /** The rule's units and threshold as its causes name them. */
    private record Wording(Unit channelUnit, Unit changeUnit, double perSeconds, String rateUnit,
            String thresholdText) {

        String cause(String channel, boolean rising, boolean past, double slope) {
            double shown = channelUnit.differenceTo(changeUnit, slope) * perSeconds;
            return channel + (rising ? " rising at " : " falling at ") + Texts.number(Math.abs(shown)) + " "
                    + rateUnit + (past ? ", faster than " : ", no faster than ") + thresholdText;
        }
    }

    private void add(long time, double value) {
        if (size == capacity) {
            long[] grown = new long[capacity * 4];
            for (int i = 0; i < size; i++) {
                int slot = index(i);
                grown[2 * i] = points[2 * slot];
                grown[2 * i + 1] = points[2 * slot + 1];
            }
            points = grown;
            capacity *= 2;
            head = 0;
        }
        if (size == 0) {
            base = time;
        }
        int slot = index(size);
        points[2 * slot] = time;
        points[2 * slot + 1] = Double.doubleToRawLongBits(value);
        size++;
        double x = (time - base) * 1e-9;
        sumX += x;
        sumY += value;
        sumXX += x * x;
        sumXY += x * value;
    }

    private void evictBefore(long cutoff) {
        while (size > 0 && time(head) - cutoff < 0) {
            double x = (time(head) - base) * 1e-9;
            double value = value(head);
            sumX -= x;
            sumY -= value;
            sumXX -= x * x;
            sumXY -= x * value;
            head = (head + 1) & (capacity - 1);
            size--;
            evictionsSinceRecompute++;
        }
        if (evictionsSinceRecompute >= Math.max(size, 16)) {
            recompute();
        }
    }

    private void recompute() {
        evictionsSinceRecompute = 0;
        sumX = 0;
        sumY = 0;
        sumXX = 0;
        sumXY = 0;
        if (size == 0) {
            return;
        }
        base = time(head);
        for (int i = 0; i < size; i++) {
            int slot = index(i);
            double x = (time(slot) - base) * 1e-9;
            double value = value(slot);
            sumX += x;
            sumY += value;
            sumXX += x * x;
            sumXY += x * value;
        }
    }

    private int index(int offset) {
        return (head + offset) & (capacity - 1);
    }

    private long time(int slot) {
        return points[2 * slot];
    }

    private double value(int slot) {
        return Double.longBitsToDouble(points[2 * slot + 1]);
    }
}
