package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.rules.config.ConfigurationLoader;
import org.cryowarden.rules.config.DriverSettingsValidator;
import org.cryowarden.rules.engine.Engine;
import org.cryowarden.rules.engine.EngineConfig;
import org.cryowarden.rules.engine.OutputCommand;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;

/**
 * A started engine loop evaluates a reading on the thread that offers it when the engine is free, and never
 * leaves one behind when it is not. The tick period is an hour of a clock that does not move, so the engine
 * thread wakes only for tasks and for readings that queued while it held the engine. The latches wait for
 * another thread's step, never for time to pass; their timeouts only end a broken run.
 */
class EngineLoopOffererRunsTest {

    private static final Instant START = Instant.parse("2025-01-15T22:00:00Z");
    /** Below 19.5 %vol is an oxygen-deficient atmosphere (OSHA 29 CFR 1910.134(b)), the site's o2-low limit. */
    private static final double DEFICIENT = 18.0;
    private static final double NORMAL = 20.9;

    private final VirtualTimeSource clock = new VirtualTimeSource(START);
    private final List<String> batchThreads = new CopyOnWriteArrayList<>();
    private final Map<Double, String> readingThreads = new ConcurrentHashMap<>();
    private final CountDownLatch firstTick = new CountDownLatch(1);
    private final CountDownLatch deficientEvaluated = new CountDownLatch(1);
    private volatile CountDownLatch holdOn;
    private volatile CountDownLatch held;
    private EngineLoop loop;

    @AfterEach
    void stop() {
        if (loop != null) {
            loop.close();
        }
    }

    @Test
    void crossingOfferedWhileTheEngineIsFreeIsJournaledBeforeTheOfferReturns() throws Exception {
        start();

        loop.offer(o2(DEFICIENT));

        // No hand-off: the alarm's batch left on the offering thread, before offer returned.
        assertThat(batchThreads).containsExactly(Thread.currentThread().getName());
        assertThat(readingThreads).containsEntry(DEFICIENT, Thread.currentThread().getName());
        assertThat(loop.processed()).isEqualTo(1);
    }

    @Test
    void readingOfferedWhileAnotherThreadRunsTheEngineIsEvaluatedByThatThreadBeforeItLetsGo() throws Exception {
        start();
        holdOn = new CountDownLatch(1);
        held = new CountDownLatch(1);
        Thread first = new Thread(() -> loop.offer(o2(NORMAL)), "poller A");
        first.start();
        assertThat(held.await(10, TimeUnit.SECONDS)).as("poller A runs the engine").isTrue();

        Thread second = new Thread(() -> loop.offer(o2(DEFICIENT)), "poller B");
        second.start();
        second.join(10_000);
        assertThat(second.isAlive()).as("poller B does not wait for the engine").isFalse();
        assertThat(readingThreads).doesNotContainKey(DEFICIENT);

        holdOn.countDown();
        first.join(10_000);

        assertThat(readingThreads).containsEntry(DEFICIENT, "poller A");
        assertThat(batchThreads).containsExactly("poller A");
        assertThat(loop.depth()).isZero();
    }

    @Test
    void readingOfferedWhileATaskRunsIsLeftToTheEngineThreadAndNotLost() throws Exception {
        start();
        CountDownLatch inTask = new CountDownLatch(1);
        CountDownLatch endTask = new CountDownLatch(1);
        loop.submit(() -> {
            inTask.countDown();
            await(endTask);
        });
        assertThat(inTask.await(10, TimeUnit.SECONDS)).isTrue();

        loop.offer(o2(DEFICIENT));
        assertThat(readingThreads).doesNotContainKey(DEFICIENT);
        endTask.countDown();

        assertThat(deficientEvaluated.await(10, TimeUnit.SECONDS)).isTrue();
        assertThat(readingThreads).containsEntry(DEFICIENT, "engine");
        assertThat(batchThreads).containsExactly("engine");
    }

    @Test
    void loopThatWasNeverStartedLeavesReadingsForTheDrivingThread() throws Exception {
        loop = loop();

        loop.offer(o2(DEFICIENT));
        assertThat(readingThreads).isEmpty();

        loop.drain();
        assertThat(readingThreads).containsEntry(DEFICIENT, Thread.currentThread().getName());
    }

    // ---- helpers ----

    private void start() throws Exception {
        loop = loop();
        loop.start();
        assertThat(firstTick.await(10, TimeUnit.SECONDS)).as("the engine thread's first tick").isTrue();
        // The tick's sink runs inside the engine thread's turn; wait for it to let go before offering.
        long bound = System.nanoTime() + TimeUnit.SECONDS.toNanos(10);
        while (!loop.idle() && System.nanoTime() < bound) {
            Thread.onSpinWait();
        }
        assertThat(loop.idle()).as("the engine thread lets go after its first tick").isTrue();
    }

    private Reading o2(double percent) {
        return Reading.good("o2-room", percent, Unit.PERCENT_VOLUME, clock.wallNow());
    }

    private EngineLoop loop() throws ConfigException {
        Configuration configuration = ConfigurationLoader.load(Path.of("src/test/resources/run/trap-site.yaml"),
                List.of(Path.of("src/test/resources/run/trap-rules.yaml")), DriverSettingsValidator.acceptAll());
        Engine engine = new Engine(EngineConfig.of(configuration.site(), configuration.rules()), clock);
        return new EngineLoop(engine, configuration.site(), clock, Duration.ofHours(1), new EngineLoop.Sinks() {
            @Override
            public void batch(EventBatch batch) {
                batchThreads.add(Thread.currentThread().getName());
            }

            @Override
            public void reading(Reading reading) {
                if (reading.channel().equals("o2-room")) {
                    readingThreads.put(reading.value(), Thread.currentThread().getName());
                    if (reading.value() == DEFICIENT) {
                        deficientEvaluated.countDown();
                    }
                    CountDownLatch waiting = holdOn;
                    if (waiting != null && held.getCount() > 0) {
                        held.countDown();
                        await(waiting);
                    }
                }
            }

            @Override
            public void output(OutputCommand command) {
            }

            @Override
            public void ticked(Instant at) {
                firstTick.countDown();
            }
        });
    }

    private static void await(CountDownLatch latch) {
        try {
            latch.await(10, TimeUnit.SECONDS);
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }
}
