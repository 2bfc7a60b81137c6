package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.locks.ReentrantLock;
import java.util.function.Function;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.engine.AlarmState;
import org.cryowarden.rules.engine.AlarmStatus;
import org.cryowarden.rules.engine.AlarmTransition;
import org.cryowarden.rules.engine.BypassEnded;
import org.cryowarden.rules.engine.BypassStarted;
import org.cryowarden.rules.engine.CommandResult;
import org.cryowarden.rules.engine.Engine;
import org.cryowarden.rules.engine.EngineEvent;
import org.cryowarden.rules.engine.EngineSnapshot;
import org.cryowarden.rules.engine.FillReset;
import org.cryowarden.rules.engine.FillStarted;
import org.cryowarden.rules.engine.FillStopped;
import org.cryowarden.rules.engine.InterlockReset;
import org.cryowarden.rules.engine.InterlockTripped;
import org.cryowarden.rules.engine.OutputCommand;
import org.cryowarden.rules.engine.RestoreResult;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.SiteDef;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The one thread that owns the {@link Engine}: it takes readings and tasks from the {@link Inbox}, ticks the
 * engine's timers, and hands what came out to the sinks without waiting for them: events (with the restart facts
 * and alarm documents they changed) to the journal thread, readings to the MQTT reading publisher, output
 * commands to the output writer. Nothing here does I/O.
 *
 * <p>Either runs its own thread ({@link #start()}, real time) or is driven by a caller that moves a virtual clock
 * ({@link #drain()}, the demo's night). In real time a reading is evaluated on the thread that offers it when
 * the engine is free (the poller that just read it), so a crossing goes on to the journal without waking the
 * engine thread: on a virtual machine each wake-up costs tens of microseconds of the alarm's way out and of
 * CPU. The engine thread then only ticks, runs tasks, and takes readings that queued while the engine was
 * busy. Whoever runs the engine holds its turn, so it still runs on one thread at a time.
 */
final class EngineLoop implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(EngineLoop.class);

    /** Where the loop's results go; each method must return at once. */
    interface Sinks {
        void batch(EventBatch batch);

        void reading(Reading reading);

        void output(OutputCommand command);

        /** Every reading the engine took, with the instant it took it (the raw history). */
        default void taken(Reading reading, java.time.Instant at) {
        }

        /** After every engine tick, at the clock's instant (the raw history's flushes). */
        default void ticked(java.time.Instant at) {
        }
    }

    private final Inbox inbox = new Inbox();
    /** Held by whichever thread runs the engine. */
    private final ReentrantLock turn = new ReentrantLock();
    /** Whether offering threads run the engine themselves (real time, after {@link #start()}). */
    private volatile boolean offererRuns;
    private final TimeSource time;
    private final Sinks sinks;
    private final Duration tickEvery;
    private final DisagreeAlarms disagree = new DisagreeAlarms();
    private final AtomicLong processed = new AtomicLong();
    private volatile long lagNanos;
    private Engine engine;
    private Map<String, List<String>> derivedOf;
    private volatile boolean running;
    private Thread thread;
    private long lastTick = Long.MIN_VALUE;

    EngineLoop(Engine engine, SiteDef site, TimeSource time, Duration tickEvery, Sinks sinks) {
        this.engine = engine;
        this.time = time;
        this.tickEvery = tickEvery;
        this.sinks = sinks;
        this.derivedOf = derivedOf(site);
    }

    /** Restores the journal's facts; before the first reading. Returns the notes for the log. */
    List<String> restore(EngineSnapshot snapshot) {
        RestoreResult result = engine.restore(snapshot);
        for (EngineEvent event : result.events()) {
            if (event instanceof OutputCommand command) {
                sinks.output(command);
            }
        }
        return result.notes();
    }

    void start() {
        running = true;
        offererRuns = true;
        thread = new Thread(this::loop, "engine");
        thread.setDaemon(true);
        thread.start();
    }

    void offer(Reading reading) {
        PathStage.mark(PathStage.OFFERED, reading.channel(), 0);
        if (!offererRuns) {
            inbox.offer(reading);
            return;
        }
        inbox.offer(reading, false);
        runHere();
    }

    /**
     * Evaluates the waiting readings on this thread while the engine is free and no task waits. A reading queued
     * by a thread that found the engine busy is seen by the holder's check after it lets go (here, or the engine
     * thread's wait), so none is left until the next tick.
     */
    private void runHere() {
        do {
            if (!turn.tryLock()) {
                return;
            }
            try {
                List<Reading> readings;
                while (!(readings = inbox.takeReadingsUnlessTasks()).isEmpty()) {
                    evaluate(readings);
                }
            } catch (RuntimeException e) {
                LOG.error("engine round on {} failed; carrying on", Thread.currentThread().getName(), e);
            } finally {
                turn.unlock();
            }
        } while (offererRuns && inbox.onlyReadingsWait());
    }

    /** Runs {@code task} on the engine thread, in order with everything else. */
    void submit(Runnable task) {
        inbox.submit(task);
    }

    /** Reads or changes the engine on its thread; the future completes there. */
    <T> CompletableFuture<T> call(Function<Engine, T> query) {
        CompletableFuture<T> result = new CompletableFuture<>();
        inbox.submit(() -> {
            try {
                result.complete(query.apply(engine));
            } catch (RuntimeException e) {
                result.completeExceptionally(e);
            }
        });
        return result;
    }

    /** Executes an operator command; completes with the refusal, or empty when done. */
    CompletableFuture<Optional<String>> command(OperatorCommand command) {
        CompletableFuture<Optional<String>> result = new CompletableFuture<>();
        inbox.submit(() -> {
            Optional<String> refusal;
            try {
                refusal = execute(command);
            } catch (RuntimeException e) {
                LOG.error("command {} on {} failed", command.verb(), command.target(), e);
                refusal = Optional.of("internal failure: " + e);
            }
            if (refusal.isEmpty()) {
                sinks.batch(new EventBatch(List.of(command.accepted(time.wallNow())), Map.of(), Map.of(), summary()));
            }
            result.complete(refusal);
        });
        return result;
    }

    /** Publishes every alarm and the summary, with {@code events} (e.g. the daemon start). */
    void announce(List<DaemonEvent> events) {
        inbox.submit(() -> {
            Map<String, ObjectNode> documents = new LinkedHashMap<>();
            Map<String, EngineSnapshot.AlarmRecord> records = records();
            for (AlarmStatus status : engine.alarms()) {
                documents.put(status.id(), Payloads.alarm(status, Optional.ofNullable(records.get(status.id()))));
            }
            documents.putAll(disagree.documents());
            sinks.batch(new EventBatch(events, Map.of(), documents, summary()));
        });
    }

    /**
     * Journals and publishes {@code event} in order with the engine's own events, changing no alarm state (a
     * refused command, for instance).
     */
    void record(DaemonEvent event) {
        inbox.submit(() -> sinks.batch(new EventBatch(List.of(event), Map.of(), Map.of(), summary())));
    }

    /** Records a failed or agreeing output write (from the output writer's thread). */
    void outputResult(String output, Optional<String> disagreement) {
        inbox.submit(() -> {
            Optional<DaemonEvent> event = disagreement.isPresent()
                    ? disagree.disagree(output, disagreement.get(), time.wallNow())
                    : disagree.agree(output, time.wallNow());
            event.ifPresent(e -> sinks.batch(new EventBatch(List.of(e), Map.of(),
                    Map.of(output + DisagreeAlarms.SUFFIX, disagree.document(output + DisagreeAlarms.SUFFIX)),
                    summary())));
        });
    }

    /**
     * Replaces the engine by one built from a reloaded configuration, carrying alarm states, latched trips and
     * bypasses over by id, and announces {@code event}.
     */
    void replace(Engine fresh, SiteDef site, DaemonEvent event, CompletableFuture<List<String>> done) {
        inbox.submit(() -> {
            try {
                EngineSnapshot snapshot = engine.snapshot();
                RestoreResult result = fresh.restore(snapshot);
                engine = fresh;
                derivedOf = derivedOf(site);
                for (EngineEvent restored : result.events()) {
                    if (restored instanceof OutputCommand command) {
                        sinks.output(command);
                    }
                }
                Map<String, String> states = new LinkedHashMap<>();
                EngineSnapshot now = engine.snapshot();
                for (EngineSnapshot.AlarmRecord record : now.alarms()) {
                    states.put(record.id(), SnapshotJson.alarm(record));
                }
                for (EngineSnapshot.InterlockRecord record : now.interlocks()) {
                    states.put(SnapshotJson.INTERLOCK_KEY + record.id(), SnapshotJson.interlock(record));
                }
                for (EngineSnapshot.FillRecord record : now.fills()) {
                    states.put(SnapshotJson.FILL_KEY + record.id(), SnapshotJson.fill(record));
                }
                Map<String, ObjectNode> documents = new LinkedHashMap<>();
                Map<String, EngineSnapshot.AlarmRecord> records = records();
                for (AlarmStatus status : engine.alarms()) {
                    documents.put(status.id(), Payloads.alarm(status, Optional.ofNullable(records.get(status.id()))));
                }
                sinks.batch(new EventBatch(List.of(event), states, documents, summary()));
                done.complete(result.notes());
            } catch (RuntimeException e) {
                done.completeExceptionally(e);
            }
        });
    }

    /** Processes everything waiting and ticks, on the caller's thread (driven mode). */
    void drain() {
        turn.lock();
        try {
            process(inbox.take());
            dispatch(engine.tick());
            sinks.ticked(time.wallNow());
        } finally {
            turn.unlock();
        }
    }

    /** Nothing waits and no thread runs the engine (readings are taken only by the turn's holder). */
    boolean idle() {
        return inbox.depth() == 0 && !turn.isLocked();
    }

    int depth() {
        return inbox.depth();
    }

    long drops() {
        return inbox.drops();
    }

    long processed() {
        return processed.get();
    }

    /** How far behind the wall clock the last reading was when the engine took it. */
    Duration lag() {
        return Duration.ofNanos(lagNanos);
    }

    @Override
    public void close() {
        offererRuns = false;
        running = false;
        inbox.wake();
        if (thread != null) {
            try {
                thread.join(5_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }

    private void loop() {
        while (running) {
            try {
                // Wait outside the turn, take inside it: a reading taken before an offerer ran the engine on a
                // newer one of the same channel would otherwise be evaluated after it.
                long untilTick = lastTick == Long.MIN_VALUE ? 0
                        : tickEvery.toNanos() - (time.monotonicNanos() - lastTick);
                inbox.await(untilTick);
                turn.lockInterruptibly();
            } catch (InterruptedException e) {
                return;
            }
            try {
                process(inbox.take());
                long now = time.monotonicNanos();
                if (lastTick == Long.MIN_VALUE || now - lastTick >= tickEvery.toNanos()) {
                    lastTick = now;
                    dispatch(engine.tick());
                    sinks.ticked(time.wallNow());
                }
            } catch (RuntimeException e) {
                LOG.error("engine loop failed a round; carrying on", e);
            } finally {
                turn.unlock();
            }
        }
    }

    private void process(Inbox.Work work) {
        for (Runnable task : work.tasks()) {
            task.run();
        }
        evaluate(work.readings());
    }

    private void evaluate(List<Reading> readings) {
        for (Reading reading : readings) {
            List<EngineEvent> events;
            try {
                events = engine.onReading(reading);
            } catch (IllegalArgumentException e) {
                LOG.error("reading of {} refused by the engine: {}", reading.channel(), e.getMessage());
                continue;
            }
            if (!events.isEmpty()) {
                PathStage.mark(PathStage.EVALUATED, reading.channel(), 0);
                dispatch(events); // alarms and trips before the reading's own sinks
            }
            processed.incrementAndGet();
            sinks.taken(reading, time.wallNow());
            lagNanos = Math.max(0, Duration.between(reading.timestamp(), time.wallNow()).toNanos());
            sinks.reading(engine.latest(reading.channel()).orElse(reading));
            for (String derived : derivedOf.getOrDefault(reading.channel(), List.of())) {
                engine.latest(derived).ifPresent(sinks::reading);
            }
        }
    }

    private Optional<String> execute(OperatorCommand command) {
        if (command.verb().equals("ack") && disagree.knows(command.target())) {
            List<DaemonEvent> events = new ArrayList<>();
            String refusal = disagree.acknowledge(command.target(), command.operator(), command.note(),
                    time.wallNow(), events);
            if (!events.isEmpty()) {
                sinks.batch(new EventBatch(events, Map.of(),
                        Map.of(command.target(), disagree.document(command.target())), summary()));
            }
            return Optional.ofNullable(refusal);
        }
        CommandResult result = switch (command.verb()) {
            case "ack" -> engine.acknowledge(command.target(), command.operator(), command.note());
            case "shelve" -> engine.shelve(command.target(), command.operator(), command.duration().orElseThrow(),
                    command.reason());
            case "unshelve" -> engine.unshelve(command.target(), command.operator());
            // One verb resets what an operator can reset: a tripped interlock or a locked-out fill controller.
            case "reset" -> engine.fill(command.target()).isPresent()
                    ? engine.resetFill(command.target(), command.operator())
                    : engine.reset(command.target(), command.operator());
            case "bypass" -> engine.bypass(command.target(), command.operator(), command.reason(),
                    command.duration().orElseThrow());
            default -> throw new IllegalArgumentException("unknown verb " + command.verb());
        };
        dispatch(result.events());
        return result.refusal();
    }

    private void dispatch(List<EngineEvent> events) {
        if (events.isEmpty()) {
            return;
        }
        List<DaemonEvent> mapped = new ArrayList<>(events.size());
        Set<String> alarms = new LinkedHashSet<>();
        Set<String> interlocks = new LinkedHashSet<>();
        Set<String> fills = new LinkedHashSet<>();
        for (EngineEvent event : events) {
            mapped.add(EventMapping.of(event));
            if (event instanceof AlarmTransition t) {
                alarms.add(t.alarmId());
            } else if (event instanceof InterlockTripped t) {
                interlocks.add(t.interlockId());
            } else if (event instanceof InterlockReset r) {
                interlocks.add(r.interlockId());
            } else if (event instanceof BypassStarted b) {
                interlocks.add(b.interlockId());
            } else if (event instanceof BypassEnded b) {
                interlocks.add(b.interlockId());
            } else if (event instanceof FillStarted f) {
                fills.add(f.fillId());
            } else if (event instanceof FillStopped f) {
                fills.add(f.fillId());
            } else if (event instanceof FillReset f) {
                fills.add(f.fillId());
            } else if (event instanceof OutputCommand command) {
                sinks.output(command);
            }
        }
        // Only what changed, looked up one by one: a whole snapshot per event costs the alarm's way out a walk
        // over every alarm of the site.
        Map<String, String> states = new LinkedHashMap<>();
        Map<String, ObjectNode> documents = new LinkedHashMap<>();
        for (String id : alarms) {
            engine.alarmRecord(id).ifPresent(record -> {
                states.put(id, SnapshotJson.alarm(record));
                engine.alarm(id).ifPresent(s -> documents.put(s.id(), Payloads.alarm(s, Optional.of(record))));
            });
        }
        for (String id : interlocks) {
            engine.interlockRecord(id).ifPresent(
                    record -> states.put(SnapshotJson.INTERLOCK_KEY + id, SnapshotJson.interlock(record)));
        }
        for (String id : fills) {
            engine.fillRecord(id).ifPresent(
                    record -> states.put(SnapshotJson.FILL_KEY + id, SnapshotJson.fill(record)));
        }
        EventBatch batch = new EventBatch(mapped, states, documents, summary());
        PathStage.mark(PathStage.QUEUED, mapped.get(0).subject().orElse(""), 0);
        sinks.batch(batch);
    }

    private Map<String, EngineSnapshot.AlarmRecord> records() {
        Map<String, EngineSnapshot.AlarmRecord> records = new LinkedHashMap<>();
        for (EngineSnapshot.AlarmRecord record : engine.snapshot().alarms()) {
            records.put(record.id(), record);
        }
        return records;
    }

    private ObjectNode summary() {
        List<Payloads.AlarmView> views = new ArrayList<>();
        for (AlarmStatus status : engine.alarms()) {
            views.add(view(status));
        }
        views.addAll(disagree.views());
        return Payloads.summary(views, time.wallNow());
    }

    static Payloads.AlarmView view(AlarmStatus status) {
        AlarmState state = status.state();
        boolean active = status.conditionActive() && state != AlarmState.SHELVED && state != AlarmState.SUPPRESSED
                && state != AlarmState.OUT_OF_SERVICE;
        return new Payloads.AlarmView(status.id(), status.priority(), active, state.awaitsAcknowledgement());
    }

    private static Map<String, List<String>> derivedOf(SiteDef site) {
        Map<String, List<String>> direct = new LinkedHashMap<>();
        for (DerivedChannelDef derived : site.derived()) {
            for (String input : derived.inputs()) {
                direct.computeIfAbsent(input, k -> new ArrayList<>()).add(derived.id());
            }
        }
        Map<String, List<String>> closure = new LinkedHashMap<>();
        for (String channel : direct.keySet()) {
            Set<String> seen = new LinkedHashSet<>();
            List<String> frontier = new ArrayList<>(direct.get(channel));
            while (!frontier.isEmpty()) {
                String next = frontier.remove(0);
                if (seen.add(next)) {
                    frontier.addAll(direct.getOrDefault(next, List.of()));
                }
            }
            closure.put(channel, List.copyOf(seen));
        }
        return closure;
    }
}
