package org.cryowarden.daemon.run;

import java.util.ArrayList;
import java.util.Collections;
import java.util.IdentityHashMap;
import java.util.List;
import java.time.Instant;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalLong;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicLong;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.journal.OutboxEntry;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The journal thread: numbers and records the queued batches of events in one transaction (events, the alarm
 * and interlock states they changed, and an outbox entry per event for the event topic), then tells the
 * listeners, so nothing is published before it is recorded. Batches that queued up while the previous commit
 * was syncing share the next one, so a burst costs a few syncs to disk, not one per batch. The queue holds {@value #CAPACITY} batches; events are never
 * dropped, so a full queue makes the engine wait (counted), which only a stalled disk can cause.
 */
final class JournalSink implements AutoCloseable {

    static final int CAPACITY = 10_000;
    /** At most this many queued batches share one commit. */
    static final int GROUP = 256;

    private static final Logger LOG = LoggerFactory.getLogger(JournalSink.class);
    private static final Logger EVENTS = LoggerFactory.getLogger("org.cryowarden.event");

    /**
     * A batch as recorded, with the sequence number of each event (empty when the journal failed) and, when it
     * failed, why, in words an operator can act on; {@code outbox} holds the event-topic entries the same commit
     * queued for the batch, in id order (a {@code journal.gap} event's first), so that the MQTT bridge sends them
     * without reading them back (empty when the journal failed).
     */
    record Committed(EventBatch batch, List<OptionalLong> seqs, Optional<String> problem, List<OutboxEntry> outbox) {
        Committed(EventBatch batch, List<OptionalLong> seqs) {
            this(batch, seqs, Optional.empty());
        }

        Committed(EventBatch batch, List<OptionalLong> seqs, Optional<String> problem) {
            this(batch, seqs, problem, List.of());
        }

        Committed {
            outbox = List.copyOf(outbox);
        }
    }

    interface Listener {
        void committed(Committed committed);
    }

    private final Journal journal;
    private final String eventTopic;
    private final LinkedBlockingQueue<EventBatch> queue = new LinkedBlockingQueue<>(CAPACITY);
    private final List<Listener> listeners = new CopyOnWriteArrayList<>();
    private final AtomicLong waits = new AtomicLong();
    private final AtomicLong failures = new AtomicLong();
    /** Marker batches (by identity) and who waits for everything queued before them to be recorded. */
    private final Map<EventBatch, CompletableFuture<Void>> barriers =
            Collections.synchronizedMap(new IdentityHashMap<>());
    /** Events not recorded since the journal last wrote; told in a {@code journal.gap} event once it writes again. */
    private long unrecorded;
    private Instant unrecordedSince;
    private String unrecordedProblem;
    private volatile boolean busy;
    private volatile boolean running;
    private Thread thread;

    JournalSink(Journal journal, String eventTopic) {
        this.journal = journal;
        this.eventTopic = eventTopic;
    }

    void addListener(Listener listener) {
        listeners.add(listener);
    }

    void start() {
        running = true;
        thread = new Thread(this::loop, "journal");
        thread.setDaemon(true);
        thread.start();
    }

    /** Called by the engine thread; waits only when the queue is full. */
    void offer(EventBatch batch) {
        if (!queue.offer(batch)) {
            waits.incrementAndGet();
            try {
                queue.put(batch);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                LOG.error("interrupted while queueing {} events for the journal; they are not recorded",
                        batch.events().size());
            }
        }
    }

    /**
     * Completes once every batch offered before this call has been recorded (or failed to be): an operator is told
     * a command was done only when a {@code kill -9} can no longer take it back.
     */
    CompletableFuture<Void> recordedSoFar() {
        CompletableFuture<Void> done = new CompletableFuture<>();
        EventBatch marker = new EventBatch(List.of(), Map.of(), Map.of(), Payloads.object());
        barriers.put(marker, done);
        offer(marker);
        return done;
    }

    int depth() {
        return queue.size();
    }

    long waits() {
        return waits.get();
    }

    long failures() {
        return failures.get();
    }

    boolean idle() {
        return queue.isEmpty() && !busy;
    }

    /** Records what is queued on the caller's thread (driven mode and shutdown). */
    void drain() {
        EventBatch batch;
        while ((batch = queue.poll()) != null) {
            record(batch);
        }
    }

    @Override
    public void close() {
        running = false;
        if (thread != null) {
            thread.interrupt();
            try {
                thread.join(5_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        drain();
    }

    private void loop() {
        List<EventBatch> group = new ArrayList<>();
        while (running) {
            EventBatch batch;
            try {
                batch = queue.poll(1, TimeUnit.SECONDS);
            } catch (InterruptedException e) {
                return;
            }
            if (batch != null) {
                busy = true;
                try {
                    // Whatever queued up meanwhile shares the commit: one sync to disk for the group, not per batch.
                    group.add(batch);
                    queue.drainTo(group, GROUP - 1);
                    record(group);
                } finally {
                    group.clear();
                    busy = false;
                }
            }
        }
    }

    private void record(EventBatch batch) {
        record(List.of(batch));
    }

    /**
     * Records the batches, a run between two barrier markers in one transaction, and completes each barrier once
     * everything before it is recorded.
     */
    private void record(List<EventBatch> batches) {
        List<EventBatch> run = new ArrayList<>(batches.size());
        for (EventBatch batch : batches) {
            CompletableFuture<Void> barrier = barriers.remove(batch);
            if (barrier == null) {
                run.add(batch);
                continue;
            }
            recordTogether(run);
            run.clear();
            barrier.complete(null);
        }
        recordTogether(run);
    }

    /**
     * Records the batches in one transaction, then tells the listeners batch by batch, in order: nothing is
     * published before it is recorded.
     */
    private void recordTogether(List<EventBatch> batches) {
        if (batches.isEmpty()) {
            return;
        }
        List<List<OptionalLong>> seqs = new ArrayList<>(batches.size());
        List<List<OutboxEntry>> queued = new ArrayList<>(batches.size());
        for (int b = 0; b < batches.size(); b++) {
            seqs.add(new ArrayList<>());
            queued.add(new ArrayList<>());
        }
        int events = 0;
        boolean anything = false;
        Optional<DaemonEvent> gap = Optional.empty();
        for (EventBatch batch : batches) {
            if (!batch.events().isEmpty()) {
                PathStage.mark(PathStage.TAKEN, batch.events().get(0).subject().orElse(""), 0);
            }
            events += batch.events().size();
            anything |= !batch.events().isEmpty() || !batch.states().isEmpty();
            if (gap.isEmpty()) {
                gap = gap(batch);
            }
        }
        Optional<String> problem = Optional.empty();
        if (anything) {
            Optional<DaemonEvent> gapEvent = gap;
            try {
                List<List<Long>> numbers = journal.write(events + " events", tx -> {
                    for (List<OutboxEntry> entries : queued) {
                        entries.clear();
                    }
                    if (gapEvent.isPresent()) {
                        long seq = tx.appendEvent(gapEvent.get().toJournal());
                        queued.get(0).add(enqueue(tx, gapEvent.get(), seq));
                    }
                    List<List<Long>> result = new ArrayList<>(batches.size());
                    for (int b = 0; b < batches.size(); b++) {
                        EventBatch batch = batches.get(b);
                        List<Long> numbered = new ArrayList<>(batch.events().size());
                        long last = -1;
                        for (DaemonEvent event : batch.events()) {
                            long seq = tx.appendEvent(event.toJournal());
                            queued.get(b).add(enqueue(tx, event, seq));
                            numbered.add(seq);
                            last = seq;
                        }
                        if (last >= 0) {
                            for (Map.Entry<String, String> state : batch.states().entrySet()) {
                                tx.putAlarmState(state.getKey(), state.getValue(), last,
                                        batch.events().get(batch.events().size() - 1).at());
                            }
                        }
                        result.add(numbered);
                    }
                    return result;
                });
                if (gapEvent.isPresent()) {
                    LOG.warn("the journal records again; {} events from {} on were not recorded ({})", unrecorded,
                            unrecordedSince, unrecordedProblem);
                    unrecorded = 0;
                    unrecordedSince = null;
                    unrecordedProblem = null;
                }
                for (int b = 0; b < batches.size(); b++) {
                    List<Long> numbered = numbers.get(b);
                    for (int i = 0; i < numbered.size(); i++) {
                        seqs.get(b).add(OptionalLong.of(numbered.get(i)));
                        PathStage.mark(PathStage.COMMITTED, batches.get(b).events().get(i).subject().orElse(""),
                                numbered.get(i));
                    }
                }
            } catch (JournalException e) {
                failures.incrementAndGet();
                problem = Optional.of(e.getMessage());
                LOG.error("{}; {} events and the alarm states they changed are not recorded (published all the"
                        + " same, marked not recorded)", e.getMessage(), events);
                for (int b = 0; b < batches.size(); b++) {
                    EventBatch batch = batches.get(b);
                    if (unrecordedSince == null && !batch.events().isEmpty()) {
                        unrecordedSince = batch.events().get(0).at();
                    }
                    unrecorded += batch.events().size();
                    for (DaemonEvent event : batch.events()) {
                        seqs.get(b).add(OptionalLong.empty());
                        EVENTS.warn("NOT RECORDED " + event.logLine(0));
                    }
                }
                unrecordedProblem = e.getMessage();
            }
        }
        for (int b = 0; b < batches.size(); b++) {
            Committed committed = new Committed(batches.get(b), seqs.get(b), problem,
                    problem.isPresent() ? List.of() : queued.get(b));
            for (Listener listener : listeners) {
                try {
                    listener.committed(committed);
                } catch (RuntimeException e) {
                    LOG.error("journal listener failed", e);
                }
            }
        }
        // The event log lines after the listeners: a console write is no reason to hold an alarm back.
        if (problem.isEmpty()) {
            for (int b = 0; b < batches.size(); b++) {
                List<DaemonEvent> recorded = batches.get(b).events();
                for (int i = 0; i < recorded.size(); i++) {
                    EVENTS.info(recorded.get(i).logLine(seqs.get(b).get(i).getAsLong()));
                }
            }
        }
    }

    /** Queues {@code event} as {@code seq} for the event topic; returns the entry as the outbox now holds it. */
    private OutboxEntry enqueue(org.cryowarden.daemon.journal.JournalTransaction tx, DaemonEvent event, long seq)
            throws java.sql.SQLException {
        String payload = Payloads.text(event.published(seq));
        long id = tx.enqueue(MqttBridge.OUTBOX_SINK, eventTopic, payload, OptionalLong.of(seq), event.at());
        return new OutboxEntry(id, MqttBridge.OUTBOX_SINK, eventTopic, payload, OptionalLong.of(seq), event.at(), 0);
    }

    /** The {@code journal.gap} event to record first once the journal writes again after failing. */
    private Optional<DaemonEvent> gap(EventBatch batch) {
        if (unrecorded == 0 || batch.events().isEmpty()) {
            return Optional.empty();
        }
        com.fasterxml.jackson.databind.node.ObjectNode payload = Payloads.object();
        payload.put("cause", unrecorded + " events from " + unrecordedSince + " on were not recorded: "
                + unrecordedProblem);
        payload.put("not_recorded", unrecorded);
        payload.put("since", unrecordedSince.toString());
        payload.put("problem", unrecordedProblem);
        return Optional.of(new DaemonEvent("journal.gap", batch.events().get(0).at(), Optional.empty(),
                Optional.empty(), payload));
    }
}
