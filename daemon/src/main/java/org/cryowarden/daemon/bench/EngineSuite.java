package org.cryowarden.daemon.bench;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ArrayBlockingQueue;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.engine.Engine;
import org.cryowarden.rules.engine.bench.EngineBenchLoad;

/**
 * Readings per second through one engine on one thread against a bare loop that takes the same readings from the
 * same kind of queue and does nothing else. Both loops run alternately in four slices each, so a noisy neighbour
 * on the machine slows both alike.
 */
final class EngineSuite {

    static final double TARGET_RATE = 1_000_000;
    static final double TARGET_SHARE = 0.25;
    private static final int BATCH = EngineBenchLoad.CHANNELS;
    private static final int SLICES = 4;

    private final Reading[] readings = EngineBenchLoad.readings();
    private final ArrayBlockingQueue<Reading> queue = new ArrayBlockingQueue<>(BATCH);
    private final EngineBenchLoad.Clock clock = new EngineBenchLoad.Clock();
    private final Engine engine = new Engine(EngineBenchLoad.config(), clock);
    private int next;
    /** The bare loop's only work, kept in a field so the JIT cannot drop the loop. */
    private double bareSink;
    private long events;

    BenchResult run(BenchSettings settings) {
        Duration measure = settings.measure(Duration.ofSeconds(20));
        settings.say("engine: warming up (" + EngineBenchLoad.CHANNELS + " channels, "
                + EngineBenchLoad.ruleCount() + " rules, one thread)");
        // Fill every rate window and settle the alarms once, then warm both loops.
        for (int i = 0; i < readings.length / BATCH; i++) {
            batch(true);
        }
        Duration warm = settings.warmUp(Duration.ofSeconds(20));
        timed(false, warm.dividedBy(2));
        timed(true, warm.dividedBy(2));
        long bareCount = 0;
        long bareNanos = 0;
        long engineCount = 0;
        long engineNanos = 0;
        for (int slice = 0; slice < SLICES; slice++) {
            long[] bare = timed(false, measure.dividedBy(2L * SLICES));
            bareCount += bare[0];
            bareNanos += bare[1];
            long[] eng = timed(true, measure.dividedBy(2L * SLICES));
            engineCount += eng[0];
            engineNanos += eng[1];
        }
        double bareRate = bareCount / (bareNanos / 1e9);
        double engineRate = engineCount / (engineNanos / 1e9);
        double share = engineRate / bareRate;
        boolean meets = engineRate >= TARGET_RATE && share >= TARGET_SHARE;
        List<String> lines = new ArrayList<>();
        lines.add("engine: " + EngineBenchLoad.CHANNELS + " channels, " + EngineBenchLoad.ruleCount()
                + " rules (limit, stale, rate, 2oo3 vote, deviation), one thread, " + SLICES
                + " alternating slices per loop");
        lines.add(String.format(Locale.ROOT, "  engine loop: %,.0f readings/s (%,d readings in %.2f s, %,d events)",
                engineRate, engineCount, engineNanos / 1e9, events));
        lines.add(String.format(Locale.ROOT, "  bare loop:   %,.0f readings/s (same readings, same queue, no engine)",
                bareRate));
        lines.add(String.format(Locale.ROOT, "  ratio:       %.1f %% of the bare loop", share * 100));
        return new BenchResult("engine", Map.of("readings_per_second", engineRate),
                Map.of("bare_loop_readings_per_second", bareRate), Map.of("engine_to_bare_loop", share),
                String.format(Locale.ROOT, ">= %,.0f readings/s and >= %.0f %% of the bare loop", TARGET_RATE,
                        TARGET_SHARE * 100), meets, lines);
    }

    /** Runs whole batches for about {@code length}; returns {readings, nanoseconds}. */
    private long[] timed(boolean withEngine, Duration length) {
        long start = System.nanoTime();
        long end = start + length.toNanos();
        long count = 0;
        long now;
        do {
            count += batch(withEngine);
            now = System.nanoTime();
        } while (now < end);
        return new long[] {count, now - start};
    }

    /**
     * Offers one batch to the queue and takes it out again, through the engine or not. Each taking loop has a
     * method of its own, so that the JIT profiles and compiles each for itself rather than one loop body with the
     * other's branch in it.
     */
    private int batch(boolean withEngine) {
        offerBatch();
        if (withEngine) {
            takeThroughEngine();
        } else {
            takeBare();
        }
        return BATCH;
    }

    private void offerBatch() {
        for (int i = 0; i < BATCH; i++) {
            queue.offer(readings[next]);
            next = next + 1 == readings.length ? 0 : next + 1;
        }
    }

    private void takeThroughEngine() {
        Reading reading;
        while ((reading = queue.poll()) != null) {
            clock.advanceMillis(1);
            events += engine.onReading(reading).size();
        }
    }

    private void takeBare() {
        Reading reading;
        while ((reading = queue.poll()) != null) {
            bareSink += reading.value();
        }
    }
}
