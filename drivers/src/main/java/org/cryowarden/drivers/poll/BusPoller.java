package org.cryowarden.drivers.poll;

import java.io.IOException;
import java.time.Duration;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.locks.Condition;
import java.util.concurrent.locks.ReentrantLock;
import org.cryowarden.drivers.spi.FaultCounters;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.drivers.spi.WriteResult;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.model.ChannelDef;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Polls every instrument of one bus over its one shared transport, one transaction at a time, on a fixed
 * schedule with each channel's own period, and delivers the readings to a {@link ReadingSink}. Owns the
 * transport: opens it, and after a failure reopens it with {@link Backoff} while the bus's channels read STALE
 * with the reason. Output writes queued with {@link #write} run between polls, before anything else due.
 *
 * <p>Threads: {@link #runDue()} does one round and is called either by the poller's own thread ({@link #start()},
 * for the system clock) or directly by a test or the simulated-night driver, which moves a virtual clock between
 * rounds. Timing comes from the {@link TimeSource}; real waiting happens only for device bytes and, on the
 * poller thread, until the next channel is due. Nothing a device sends and nothing a driver throws stops it.
 */
public final class BusPoller implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(BusPoller.class);
    /** The least time between two phases of a bus's polling ({@link #spreadOverThePeriod}). */
    public static final Duration PHASE_GAP = Duration.ofMillis(20);
    /** Pollers started in this process: each next one starts its phases at another point of the gap. */
    private static final AtomicInteger STARTED = new AtomicInteger();
    private static final double GOLDEN = (Math.sqrt(5) - 1) / 2;

    private final String busId;
    private final Transport transport;
    /** The instruments with channels to poll (one that only drives outputs is written, never polled). */
    private final List<Polled> polled = new ArrayList<>();
    private final List<PolledInstrument> instruments;
    private final TimeSource time;
    private final ReadingSink sink;
    private final Backoff backoff;
    private final FaultCounters counters = new FaultCounters();
    private final Map<String, String> identities = new ConcurrentHashMap<>();
    private final ConcurrentLinkedQueue<PendingWrite> writes = new ConcurrentLinkedQueue<>();
    private final ReentrantLock wakeLock = new ReentrantLock();
    private final Condition wake = wakeLock.newCondition();

    private volatile boolean transportUp;
    private volatile long lastRoundNanos;
    private long nextReopenAt;
    private int failedReopens;
    private String downReason = "not opened yet";
    private volatile boolean running;
    private Thread thread;
    /** Set before the thread starts ({@link #start(boolean, TransactionGate)}). */
    private TransactionGate gate = TransactionGate.OPEN;

    public BusPoller(String busId, Transport transport, List<PolledInstrument> instruments, TimeSource time,
            ReadingSink sink, Backoff backoff) {
        this.busId = Objects.requireNonNull(busId, "busId");
        this.transport = Objects.requireNonNull(transport, "transport");
        this.instruments = List.copyOf(instruments);
        this.time = Objects.requireNonNull(time, "time");
        this.sink = Objects.requireNonNull(sink, "sink");
        this.backoff = Objects.requireNonNull(backoff, "backoff");
        long now = time.monotonicNanos();
        for (PolledInstrument instrument : this.instruments) {
            if (!instrument.channels().isEmpty()) {
                polled.add(new Polled(instrument, now));
            }
        }
        this.nextReopenAt = now;
        this.lastRoundNanos = now;
    }

    public String busId() {
        return busId;
    }

    /**
     * Runs everything due at the clock's current monotonic time: queued writes, a reopen attempt if the transport
     * is down and its backoff has passed, then the due channels instrument by instrument.
     *
     * @return the monotonic time (ns) at which something is next due
     */
    public long runDue() {
        long now = time.monotonicNanos();
        if (!transportUp && now - nextReopenAt >= 0) {
            tryReopen(now);
        }
        runWrites(now);
        long next = Long.MAX_VALUE;
        for (Polled instrument : polled) {
            if (now - instrument.nextDue >= 0) {
                gate.awaitTurn();
                poll(instrument.instrument, instrument.takeDue(now), now);
            }
            next = earlier(next, instrument.nextDue);
        }
        if (!transportUp) {
            next = earlier(next, nextReopenAt);
        }
        lastRoundNanos = now;
        return next == Long.MAX_VALUE ? now + Duration.ofSeconds(1).toNanos() : next;
    }

    /**
     * Spreads the bus's instruments evenly over the shortest polling period on the bus, in phases at least
     * {@link #PHASE_GAP} apart, instrument after instrument; the first phase is due at {@code now}. Why: with every
     * instrument due at the same instant, a bus of 50 instruments answers in one burst each period, and an alarm's
     * reading in it waits behind the others, and behind the other buses' bursts, for the machine's cores. An
     * instrument's channels keep one phase, so a multi-register read stays one transaction. Called by the poller's
     * own thread, in real time; a driven poller (tests, simulated nights) is stepped by its driver, whose steps
     * are coarser than the phases, and polls its instruments together.
     */
    void spreadOverThePeriod(long now) {
        long shortest = Long.MAX_VALUE;
        for (Polled instrument : polled) {
            for (Slot slot : instrument.slots) {
                shortest = Math.min(shortest, slot.period);
            }
        }
        int count = polled.size();
        if (count < 2) {
            return;
        }
        int phases = (int) Math.min(count, shortest / PHASE_GAP.toNanos());
        if (phases < 2) {
            return;
        }
        for (int i = 0; i < count; i++) {
            polled.get(i).startAt(now + shortest * ((long) i * phases / count) / phases);
        }
    }

    /**
     * Queues a write of {@code value} to {@code output}; it runs on the poller thread at the next round. Any
     * thread may call this. The future completes with the device's confirmation or the reason it failed.
     */
    public CompletableFuture<WriteResult> write(String output, double value) {
        CompletableFuture<WriteResult> result = new CompletableFuture<>();
        Optional<PolledInstrument> owner = instruments.stream().filter(i -> i.outputs().contains(output)).findFirst();
        if (owner.isEmpty()) {
            result.complete(WriteResult.failed(output, value, "no instrument on bus '" + busId + "' drives output '"
                    + output + "'"));
            return result;
        }
        writes.add(new PendingWrite(owner.get(), output, value, result));
        signal();
        return result;
    }

    /** Identities reported by the instruments at their last connect ({@code *IDN?}), by instrument id. */
    public Map<String, String> identities() {
        return Map.copyOf(identities);
    }

    /** Bus-level counters: transport failures, reopen attempts and failures, driver errors, sink errors. */
    public Map<String, Long> counters() {
        return counters.snapshot();
    }

    /**
     * The monotonic time (ns) at which the last round started, or construction: a watchdog's sign that the poller
     * still polls. A poller whose device hangs past its timeouts, or whose thread died, stops moving it.
     */
    public long lastRoundNanos() {
        return lastRoundNanos;
    }

    /** True while the transport is believed up. Poller thread's view; for status displays. */
    public boolean transportUp() {
        return transportUp;
    }

    /**
     * Starts the poller's own thread, which waits in real time between rounds (use with the system clock), with
     * the instruments spread over their period ({@link #spreadOverThePeriod}).
     */
    public void start() {
        start(true);
    }

    /**
     * As {@link #start()}; with {@code spread} false every instrument is due at the same instant each period, as a
     * driven poller polls: fewer wake-ups (less CPU on a small server), but an alarm's reading waits behind the
     * whole bus's round.
     */
    public void start(boolean spread) {
        start(spread, TransactionGate.OPEN);
    }

    /** As {@link #start(boolean)}, asking {@code gate} before each transaction. */
    public synchronized void start(boolean spread, TransactionGate gate) {
        gatedBy(gate);
        if (thread != null) {
            throw new IllegalStateException("poller of bus '" + busId + "' already started");
        }
        running = true;
        thread = new Thread(() -> loop(spread), "poller " + busId);
        thread.setDaemon(true);
        thread.start();
    }

    /** Asks {@code gate} before each transaction from now on; before {@link #start}, or when driven. */
    void gatedBy(TransactionGate gate) {
        this.gate = Objects.requireNonNull(gate, "gate");
    }

    /** Stops the thread (waiting for the current transaction to finish, bounded) and closes the transport. */
    @Override
    public void close() {
        Thread current;
        synchronized (this) {
            running = false;
            current = thread;
        }
        signal();
        if (current != null) {
            try {
                current.join(Duration.ofSeconds(10).toMillis());
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        transport.close();
        PendingWrite pending;
        while ((pending = writes.poll()) != null) {
            pending.result.complete(WriteResult.failed(pending.output, pending.value, "bus '" + busId
                    + "' poller stopped"));
        }
    }

    private void loop(boolean spread) {
        if (spread) {
            // The k-th bus starts its phases at frac(k * 0.618) of the gap: any number of buses interleave evenly,
            // so that their phases do not fall on the same instants either.
            double share = (STARTED.getAndIncrement() * GOLDEN) % 1.0;
            spreadOverThePeriod(time.monotonicNanos() + (long) (share * PHASE_GAP.toNanos()));
        }
        while (running) {
            long next;
            try {
                next = runDue();
            } catch (RuntimeException e) {
                LOG.error("poller of bus '{}' failed a round; carrying on", busId, e);
                counters.increment("poller_errors");
                next = time.monotonicNanos() + Duration.ofSeconds(1).toNanos();
            }
            wakeLock.lock();
            try {
                long wait;
                while (running && writes.isEmpty() && (wait = next - time.monotonicNanos()) > 0) {
                    wake.awaitNanos(wait);
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            } finally {
                wakeLock.unlock();
            }
        }
    }

    private void signal() {
        wakeLock.lock();
        try {
            wake.signalAll();
        } finally {
            wakeLock.unlock();
        }
    }

    private void tryReopen(long now) {
        counters.increment("reopen_attempts");
        try {
            transport.reopen();
        } catch (IOException | RuntimeException e) {
            failedReopens++;
            counters.increment("reopen_failures");
            downReason = e.getMessage() == null ? e.toString() : e.getMessage();
            nextReopenAt = now + backoff.after(failedReopens).toNanos();
            LOG.warn("bus '{}': cannot open {}: {}; next attempt in {}", busId, transport.describe(), downReason,
                    DurationSyntax.format(backoff.after(failedReopens)));
            return;
        }
        transportUp = true;
        for (PolledInstrument instrument : instruments) {
            InstrumentDriver driver = instrument.driver();
            try {
                driver.connect(transport).ifPresent(identity -> {
                    identities.put(driver.instrumentId(), identity);
                    LOG.info("bus '{}': instrument '{}' is {}", busId, driver.instrumentId(), identity);
                });
            } catch (IOException e) {
                failedReopens++;
                transportFailed(e, now);
                return;
            } catch (RuntimeException e) {
                counters.increment("driver_errors");
                LOG.error("bus '{}': driver of '{}' failed to connect", busId, driver.instrumentId(), e);
            }
        }
    }

    private void runWrites(long now) {
        PendingWrite pending;
        while ((pending = writes.poll()) != null) {
            if (!transportUp) {
                pending.result.complete(WriteResult.failed(pending.output, pending.value, "bus '" + busId
                        + "' is down: " + downReason));
                continue;
            }
            try {
                pending.result.complete(pending.instrument.driver().write(pending.output, pending.value, transport));
            } catch (IOException e) {
                pending.result.complete(WriteResult.failed(pending.output, pending.value, e.getMessage()));
                transportFailed(e, now);
            } catch (RuntimeException e) {
                counters.increment("driver_errors");
                LOG.error("bus '{}': driver failed writing output '{}'", busId, pending.output, e);
                pending.result.complete(WriteResult.failed(pending.output, pending.value, "driver error: " + e));
            }
        }
    }

    private void poll(PolledInstrument instrument, List<Slot> due, long now) {
        InstrumentDriver driver = instrument.driver();
        if (!transportUp) {
            long retryIn = Math.max(0, nextReopenAt - now);
            String reason = "bus '" + busId + "' down: " + downReason + "; next reopen attempt in "
                    + DurationSyntax.format(Duration.ofMillis(Duration.ofNanos(retryIn).toMillis()));
            for (Slot slot : due) {
                deliver(Reading.stale(slot.channel.id(), slot.channel.unit(), time.wallNow(), reason));
            }
            return;
        }
        List<String> ids = new ArrayList<>(due.size());
        for (Slot slot : due) {
            ids.add(slot.channel.id());
        }
        // Each reading goes on as soon as the driver decoded it; one the driver repeats or did not ask for is
        // dropped, one it never gave is BAD below, and on a failure only those not yet delivered are marked.
        Set<String> delivered = new HashSet<>();
        try {
            driver.poll(ids, transport, reading -> {
                if (reading != null && ids.contains(reading.channel()) && delivered.add(reading.channel())) {
                    deliver(reading);
                }
            });
        } catch (IOException e) {
            transportFailed(e, now);
            for (Slot slot : due) {
                if (!delivered.contains(slot.channel.id())) {
                    deliver(Reading.stale(slot.channel.id(), slot.channel.unit(), time.wallNow(), "bus '" + busId
                            + "' down: " + downReason));
                }
            }
            return;
        } catch (RuntimeException e) {
            counters.increment("driver_errors");
            LOG.error("bus '{}': driver of '{}' failed a poll", busId, driver.instrumentId(), e);
            for (Slot slot : due) {
                if (!delivered.contains(slot.channel.id())) {
                    deliver(Reading.bad(slot.channel.id(), slot.channel.unit(), time.wallNow(),
                            "driver of instrument '" + driver.instrumentId() + "' failed: " + e));
                }
            }
            return;
        }
        failedReopens = 0;
        for (Slot slot : due) {
            if (!delivered.contains(slot.channel.id())) {
                counters.increment("missing_readings");
                deliver(Reading.bad(slot.channel.id(), slot.channel.unit(), time.wallNow(), "driver of instrument '"
                        + driver.instrumentId() + "' returned no reading"));
            }
        }
    }

    private void transportFailed(IOException e, long now) {
        transportUp = false;
        downReason = e.getMessage() == null ? e.toString() : e.getMessage();
        counters.increment("transport_failures");
        // A link that fails again right after reopening gets the backoff too; a successful poll resets it.
        nextReopenAt = failedReopens == 0 ? now : now + backoff.after(failedReopens).toNanos();
        LOG.warn("bus '{}': {} failed: {}", busId, transport.describe(), downReason);
    }

    private void deliver(Reading reading) {
        try {
            sink.accept(reading);
        } catch (RuntimeException e) {
            counters.increment("sink_errors");
            LOG.error("bus '{}': reading sink failed on {}", busId, reading.channel(), e);
        }
    }

    private static long earlier(long a, long b) {
        return a == Long.MAX_VALUE ? b : (b - a < 0 ? b : a);
    }

    /** An instrument with at least one channel, and their schedule; {@code nextDue} is the earliest of its slots. */
    private static final class Polled {
        final PolledInstrument instrument;
        final Slot[] slots;
        long nextDue;

        Polled(PolledInstrument instrument, long start) {
            this.instrument = instrument;
            this.slots = new Slot[instrument.channels().size()];
            for (int i = 0; i < slots.length; i++) {
                slots[i] = new Slot(instrument.channels().get(i), start);
            }
            this.nextDue = start;
        }

        /** The slots due at {@code now} (called when {@code nextDue} has come), each moved on by its period. */
        List<Slot> takeDue(long now) {
            List<Slot> due = new ArrayList<>(slots.length);
            long next = Long.MAX_VALUE;
            for (Slot slot : slots) {
                if (now - slot.nextDue >= 0) {
                    due.add(slot);
                    slot.advance(now);
                }
                next = earlier(next, slot.nextDue);
            }
            nextDue = next;
            return due;
        }

        void startAt(long start) {
            for (Slot slot : slots) {
                slot.nextDue = start;
            }
            nextDue = start;
        }
    }

    private static final class Slot {
        final ChannelDef channel;
        final long period;
        long nextDue;

        Slot(ChannelDef channel, long start) {
            this.channel = channel;
            this.period = channel.period().toNanos();
            this.nextDue = start;
        }

        void advance(long now) {
            nextDue += period;
            if (nextDue - now <= 0) {
                nextDue = now + period;
            }
        }
    }

    private record PendingWrite(PolledInstrument instrument, String output, double value,
            CompletableFuture<WriteResult> result) {
    }
}
