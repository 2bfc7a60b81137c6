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
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The journal thread: numbers and records each batch of events in one transaction (events, the alarm and
 * interlock states they changed, and an outbox entry per event for the event topic), then tells the listeners,
 * so nothing is published before it is recorded. The queue holds {@value #CAPACITY} batches; events are never
 * dropped, so a full queue makes the engine wait (counted), which only a stalled disk can cause.
 */
final class JournalSink implements AutoCloseable {

    static final int CAPACITY = 10_000;

    private static final Logger LOG = LoggerFactory.getLogger(JournalSink.class);
    private static final Logger EVENTS = LoggerFactory.getLogger("org.cryowarden.event");

    /**
     * A batch as recorded, with the sequence number of each event (empty when the journal failed) and, when it
     * failed, why, in words an operator can act on.
     */
    record Committed(EventBatch batch, List<OptionalLong> seqs, Optional<String> problem) {
        Committed(EventBatch batch, List<OptionalLong> seqs) {
            this(batch, seqs, Optional.empty());
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
                    record(batch);
                } finally {
                    busy = false;
                }
            }
        }
    }

    private void record(EventBatch batch) {
        CompletableFuture<Void> barrier = barriers.remove(batch);
        if (barrier != null) {
            barrier.complete(null);
            return;
        }
        List<OptionalLong> seqs = new ArrayList<>();
        Optional<String> problem = Optional.empty();
        if (!batch.events().isEmpty() || !batch.states().isEmpty()) {
            Optional<DaemonEvent> gap = gap(batch);
            try {
                List<Long> numbers = journal.write(batch.events().size() + " events", tx -> {
                    if (gap.isPresent()) {
                        long seq = tx.appendEvent(gap.get().toJournal());
                        tx.enqueue("mqtt", eventTopic, Payloads.text(gap.get().published(seq)), OptionalLong.of(seq),
                                gap.get().at());
                    }
                    List<Long> result = new ArrayList<>();
                    long last = -1;
                    for (DaemonEvent event : batch.events()) {
                        long seq = tx.appendEvent(event.toJournal());
                        tx.enqueue("mqtt", eventTopic, Payloads.text(event.published(seq)), OptionalLong.of(seq),
                                event.at());
                        result.add(seq);
                        last = seq;
                    }
                    if (last >= 0) {
                        for (Map.Entry<String, String> state : batch.states().entrySet()) {
                            tx.putAlarmState(state.getKey(), state.getValue(), last,
                                    batch.events().get(batch.events().size() - 1).at());
                        }
                    }
                    return result;
                });
                if (gap.isPresent()) {
                    LOG.warn("the journal records again; {} events from {} on were not recorded ({})", unrecorded,
                            unrecordedSince, unrecordedProblem);
                    unrecorded = 0;
                    unrecordedSince = null;
                    unrecordedProblem = null;
                }
                for (int i = 0; i < numbers.size(); i++) {
                    seqs.add(OptionalLong.of(numbers.get(i)));
                    EVENTS.info(batch.events().get(i).logLine(numbers.get(i)));
                }
            } catch (JournalException e) {
                failures.incrementAndGet();
                problem = Optional.of(e.getMessage());
                LOG.error("{}; {} events and the alarm states they changed are not recorded (published all the"
                        + " same, marked not recorded)", e.getMessage(), batch.events().size());
                if (unrecordedSince == null && !batch.events().isEmpty()) {
                    unrecordedSince = batch.events().get(0).at();
                }
                unrecorded += batch.events().size();
                unrecordedProblem = e.getMessage();
                for (DaemonEvent event : batch.events()) {
                    seqs.add(OptionalLong.empty());
                    EVENTS.warn("NOT RECORDED " + event.logLine(0));
                }
            }
        }
        Committed committed = new Committed(batch, seqs, problem);
        for (Listener listener : listeners) {
            try {
                listener.committed(committed);
            } catch (RuntimeException e) {
                LOG.error("journal listener failed", e);
            }
        }
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
