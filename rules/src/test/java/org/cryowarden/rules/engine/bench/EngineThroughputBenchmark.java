package org.cryowarden.rules.engine.bench;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.TimeUnit;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.engine.Engine;
import org.cryowarden.rules.engine.EngineConfig;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DeviationRule;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.RateRule;
import org.cryowarden.rules.model.RuleDef;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.StaleRule;
import org.cryowarden.rules.model.VoteRule;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OperationsPerInvocation;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import org.openjdk.jmh.infra.Blackhole;

/**
 * Readings per second through one engine on one thread: 1,000 channels and 5,000 rules (2,000 limits, 1,000 stale,
 * 1,000 rate, 500 2oo3 votes, 500 deviations). Each channel is read once per simulated second (the clock advances
 * 1 ms per reading) with values that swing across the limits now and then, so alarms really transition. Run by hand
 * with the command in the developer guide; the name ends in Benchmark, so {@code mvn test} never runs it.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.SECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class EngineThroughputBenchmark {

    static final int CHANNELS = 1_000;
    static final int VALUES_PER_CHANNEL = 240;
    static final int BATCH = CHANNELS;

    private BenchClock clock;
    private Engine engine;
    private Reading[] readings;
    private int next;

    @Setup(Level.Trial)
    public void setUp() {
        clock = new BenchClock(Instant.parse("2025-01-15T18:00:00Z"));
        engine = new Engine(config(), clock);
        readings = new Reading[CHANNELS * VALUES_PER_CHANNEL];
        int slot = 0;
        for (int k = 0; k < VALUES_PER_CHANNEL; k++) {
            for (int c = 0; c < CHANNELS; c++) {
                // 50 % +- 42 %: crosses the 90 % and 10 % limits for a few seconds of each 4 min swing.
                double value = 50 + 42 * Math.sin(2 * Math.PI * k / VALUES_PER_CHANNEL + c * 0.37);
                readings[slot++] = Reading.good(id(c), value, Unit.PERCENT, clock.wallNow());
            }
        }
        // Fill every rate window and settle the alarms before measuring.
        for (int i = 0; i < readings.length; i++) {
            feed(null);
        }
    }

    @Benchmark
    @OperationsPerInvocation(BATCH)
    public void readings(Blackhole sink) {
        for (int i = 0; i < BATCH; i++) {
            feed(sink);
        }
    }

    private void feed(Blackhole sink) {
        clock.advanceMillis(1);
        List<?> events = engine.onReading(readings[next]);
        if (sink != null) {
            sink.consume(events);
        }
        next = next + 1 == readings.length ? 0 : next + 1;
    }

    static EngineConfig config() {
        List<ChannelDef> channels = new ArrayList<>();
        List<RuleDef> rules = new ArrayList<>();
        for (int c = 0; c < CHANNELS; c++) {
            channels.add(new ChannelDef(id(c), Unit.PERCENT, "bench", Duration.ofSeconds(1), Duration.ofSeconds(5),
                    Optional.empty(), SourcePosition.NONE));
            rules.add(new LimitRule(id(c) + "_high", id(c), Direction.HIGH, Quantity.parse("90 %"),
                    Quantity.parse("2 %"), options("high", c), SourcePosition.NONE));
            rules.add(new LimitRule(id(c) + "_low", id(c), Direction.LOW, Quantity.parse("10 %"),
                    Quantity.parse("2 %"), options("low", c), SourcePosition.NONE));
            rules.add(new StaleRule(id(c) + "_stale", id(c), Optional.empty(), options("stale", c), SourcePosition.NONE));
            rules.add(new RateRule(id(c) + "_rate", id(c), Direction.LOW, Quantity.parse("60 %"), Duration.ofMinutes(1),
                    Duration.ofMinutes(1), options("rate", c), SourcePosition.NONE));
            if (c % 2 == 0) {
                rules.add(new VoteRule(id(c) + "_vote", List.of(id(c), id((c + 1) % CHANNELS), id((c + 2) % CHANNELS)),
                        2, Direction.HIGH, Quantity.parse("85 %"), Quantity.parse("2 %"), true, options("vote", c),
                        SourcePosition.NONE));
            } else {
                rules.add(new DeviationRule(id(c) + "_deviation", List.of(id(c), id((c + 1) % CHANNELS)),
                        Quantity.parse("50 %"), options("deviation", c), SourcePosition.NONE));
            }
        }
        return new EngineConfig(channels, List.of(), List.of(), new RuleSet(rules, List.of()),
                Quantity.STANDARD_ATMOSPHERE_PA);
    }

    private static AlarmOptions options(String kind, int channel) {
        return new AlarmOptions(Priority.values()[channel % 4], kind + " " + channel,
                channel % 3 == 0 ? Duration.ofSeconds(2) : Duration.ZERO, Duration.ZERO, channel % 5 == 0, List.of(),
                Optional.empty());
    }

    private static String id(int channel) {
        return "ch" + channel;
    }

    /** A virtual clock with no locking: the benchmark's own, so the figure measures the engine. */
    static final class BenchClock implements TimeSource {

        private final Instant start;
        private long nanos;
        private Instant wall;
        private long wallSecond = -1;

        BenchClock(Instant start) {
            this.start = start;
            this.wall = start;
        }

        void advanceMillis(long millis) {
            nanos += millis * 1_000_000L;
        }

        @Override
        public Instant wallNow() {
            long second = nanos / 1_000_000_000L;
            if (second != wallSecond) {
                wallSecond = second;
                wall = start.plusSeconds(second);
            }
            return wall;
        }

        @Override
        public long monotonicNanos() {
            return nanos;
        }
    }
}
