package org.cryowarden.rules.engine.bench;

import java.util.List;
import java.util.concurrent.TimeUnit;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.engine.Engine;
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
 * Readings per second through one engine on one thread, on the load of {@link EngineBenchLoad} (the same as the
 * {@code bench engine} suite's). Run by hand with the command in the developer guide; the name ends in Benchmark,
 * so {@code mvn test} never runs it.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.Throughput)
@OutputTimeUnit(TimeUnit.SECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class EngineThroughputBenchmark {

    static final int BATCH = EngineBenchLoad.CHANNELS;

    private EngineBenchLoad.Clock clock;
    private Engine engine;
    private Reading[] readings;
    private int next;

    @Setup(Level.Trial)
    public void setUp() {
        clock = new EngineBenchLoad.Clock();
        engine = new Engine(EngineBenchLoad.config(), clock);
        readings = EngineBenchLoad.readings();
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
}
