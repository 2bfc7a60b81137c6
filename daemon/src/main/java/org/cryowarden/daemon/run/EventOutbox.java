package org.cryowarden.daemon.run;

import java.time.Duration;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.TimeoutException;
import java.util.concurrent.atomic.AtomicLong;
import java.util.concurrent.locks.Condition;
import java.util.concurrent.locks.ReentrantLock;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.journal.OutboxEntry;
import org.cryowarden.daemon.mqtt.MqttLink;
import org.cryowarden.daemon.mqtt.OutgoingMessage;
import org.cryowarden.daemon.mqtt.PublishResult;
import org.cryowarden.rules.TimeSource;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Sends the journal's event-topic outbox to the broker in outbox order, up to {@value #WINDOW} in flight on the
 * link's one connection (MQTT keeps the order of QoS 1 messages on a connection), each marked delivered after its
 * PUBACK, so a broker outage delays events but never loses or reorders them.
 *
 * <p>Two ways in. While nothing older waits, the entries a commit has just queued are handed to the link at once
 * by the journal thread that committed them, straight from memory: no read back from the journal, no wake-up of
 * another thread on the alarm's way out. After a start, a reconnect, a failed delivery, or more unsent entries
 * than are kept in memory, the outbox thread reads the journal from the oldest undelivered entry on until it has
 * caught up; entries committed meanwhile follow it, those it already sent are skipped by id.
 */
final class EventOutbox {

    /** Events in flight at once: within the link's default window of 32. */
    static final int WINDOW = 32;
    /** Committed entries kept in memory while they cannot be sent; past this the journal is read back instead. */
    static final int FRESH_CAPACITY = 10_000;

    private static final Logger LOG = LoggerFactory.getLogger(EventOutbox.class);
    private static final Duration PUBLISH_TIMEOUT = Duration.ofSeconds(30);
    private static final Duration IDLE_CHECK = Duration.ofSeconds(1);

    private record InFlight(OutboxEntry entry, CompletableFuture<PublishResult> result) {
    }

    private final MqttLink link;
    private final Journal journal;
    private final String sink;
    private final TimeSource time;

    private final ReentrantLock lock = new ReentrantLock();
    private final Condition work = lock.newCondition();
    // Under lock:
    private final ArrayDeque<OutboxEntry> fresh = new ArrayDeque<>();
    private final ArrayDeque<InFlight> inFlight = new ArrayDeque<>();
    /** The journal may hold undelivered entries that are not in {@link #fresh}: read it back before sending more. */
    private boolean readBack = true;
    private boolean kick = true;
    /** The highest outbox id handed to the link; fresh entries up to it went out with a read back. */
    private long lastHanded = Long.MIN_VALUE;

    /**
     * Entries the broker acknowledged whose delivery the journal could not record (read-only, full): marked before
     * the journal is read back, so they are not sent again. Outbox thread only.
     */
    private final List<Long> deliveredUnmarked = new ArrayList<>();
    /** Outbox rounds failed in a row on the journal. Outbox thread only. */
    private long journalFailures;

    private final AtomicLong published = new AtomicLong();
    private volatile long depth;
    private volatile boolean running = true;

    EventOutbox(MqttLink link, Journal journal, String sink, TimeSource time) {
        this.link = link;
        this.journal = journal;
        this.sink = sink;
        this.time = time;
    }

    /** Journal thread, after a commit: the entries it queued, in id order; sends them now when nothing older waits. */
    void committed(List<OutboxEntry> entries) {
        if (entries.isEmpty()) {
            return;
        }
        lock.lock();
        try {
            if (fresh.size() + entries.size() > FRESH_CAPACITY) {
                // The broker is away or slow: the journal holds them all; read them back once it is here again.
                fresh.clear();
                readBack = true;
            } else {
                fresh.addAll(entries);
            }
            handFresh();
            kick = true;
            work.signal();
        } finally {
            lock.unlock();
        }
    }

    /** The link (re)connected: what was in flight may be lost, so the journal is read back from the oldest. */
    void connected() {
        lock.lock();
        try {
            readBack = true;
            inFlight.clear();
            kick = true;
            work.signal();
        } finally {
            lock.unlock();
        }
    }

    long published() {
        return published.get();
    }

    /** Entries not yet acknowledged by the broker (the outbox-depth metric). */
    long depth() {
        return depth;
    }

    /** Ends {@link #loop()}. */
    void stop() {
        running = false;
        lock.lock();
        try {
            work.signalAll();
        } finally {
            lock.unlock();
        }
    }

    /** The outbox thread: takes the acknowledgements in order, marks them delivered, and reads back when needed. */
    void loop() {
        while (running) {
            InFlight head;
            boolean reading;
            boolean idle = false;
            lock.lock();
            try {
                if (!kick && inFlight.isEmpty()) {
                    idle = !work.await(IDLE_CHECK.toNanos(), TimeUnit.NANOSECONDS);
                }
                kick = false;
                head = inFlight.peekFirst();
                reading = readBack && head == null;
            } catch (InterruptedException e) {
                return;
            } finally {
                lock.unlock();
            }
            try {
                if (head != null) {
                    acknowledge(head);
                } else if (reading) {
                    if (link.isConnected()) {
                        readBack();
                    }
                } else if (idle) {
                    checkCaughtUp();
                }
                journalFailures = 0;
            } catch (JournalException e) {
                // Every batch wakes this loop: while the journal cannot write, say so once in a while, not each time.
                if (journalFailures++ % 1000 == 0) {
                    LOG.error("{} ({} failed attempts so far, logged once in 1000)", e.getMessage(), journalFailures);
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                return;
            }
        }
    }

    /** Under lock: hands fresh entries to the link in id order while the window has room. */
    private void handFresh() {
        while (!readBack && inFlight.size() < WINDOW && !fresh.isEmpty() && link.isConnected()) {
            OutboxEntry entry = fresh.pollFirst();
            if (entry.id() <= lastHanded) {
                continue;
            }
            inFlight.addLast(new InFlight(entry, send(entry)));
            lastHanded = entry.id();
        }
        depth = fresh.size() + inFlight.size();
    }

    private CompletableFuture<PublishResult> send(OutboxEntry entry) {
        CompletableFuture<PublishResult> result =
                link.publish(OutgoingMessage.atLeastOnce(entry.target(), entry.payload(), false));
        PathStage.mark(PathStage.SENT, "", entry.seq().orElse(0));
        return result;
    }

    /**
     * Waits for the oldest entry in flight, then marks it and every later one already acknowledged delivered in one
     * transaction; a failure sends it and all after it again, in order, from the journal.
     */
    private void acknowledge(InFlight head) throws JournalException, InterruptedException {
        PublishResult result = await(head.result());
        List<Long> delivered = new ArrayList<>();
        lock.lock();
        try {
            if (inFlight.peekFirst() != head) {
                return;
            }
            if (!result.isDelivered()) {
                inFlight.clear();
                readBack = true;
            } else {
                while (!inFlight.isEmpty() && delivered(inFlight.peekFirst())) {
                    delivered.add(inFlight.pollFirst().entry().id());
                }
                handFresh();
            }
        } finally {
            lock.unlock();
        }
        published.addAndGet(delivered.size());
        markDelivered(delivered);
        if (result instanceof PublishResult.Failed failed) {
            LOG.warn("event {} not delivered ({}); it and those after it go again, in order",
                    head.entry().seq().orElse(0), failed.reason());
            journal.recordAttempt(head.entry().id(), time.wallNow());
            depth = journal.outboxDepth(sink);
        }
    }

    /**
     * Sends undelivered entries from the journal, oldest first, a window at a time, until none is left; then the
     * fresh entries take over. Stops at the first failure; it is tried again at the next commit or within a second.
     */
    private void readBack() throws JournalException, InterruptedException {
        markUnmarked();
        while (running && link.isConnected()) {
            List<OutboxEntry> entries = journal.undelivered(sink, WINDOW);
            if (entries.isEmpty()) {
                lock.lock();
                try {
                    readBack = false;
                    handFresh();
                } finally {
                    lock.unlock();
                }
                return;
            }
            List<CompletableFuture<PublishResult>> sent = new ArrayList<>(entries.size());
            for (OutboxEntry entry : entries) {
                sent.add(send(entry));
            }
            lock.lock();
            try {
                lastHanded = Math.max(lastHanded, entries.get(entries.size() - 1).id());
            } finally {
                lock.unlock();
            }
            List<Long> delivered = new ArrayList<>(entries.size());
            OutboxEntry failed = null;
            for (int i = 0; i < entries.size() && failed == null; i++) {
                if (await(sent.get(i)).isDelivered()) {
                    delivered.add(entries.get(i).id());
                } else {
                    failed = entries.get(i);
                }
            }
            published.addAndGet(delivered.size());
            markDelivered(delivered);
            depth = journal.outboxDepth(sink);
            if (failed != null) {
                journal.recordAttempt(failed.id(), time.wallNow());
                return;
            }
        }
    }

    /**
     * Idle for a second with nothing in flight: the journal should hold nothing undelivered; if it does (a commit
     * whose entries did not reach {@link #committed}), read it back.
     */
    private void checkCaughtUp() throws JournalException {
        markUnmarked();
        long waiting = journal.outboxDepth(sink);
        depth = waiting;
        if (waiting > 0) {
            lock.lock();
            try {
                if (inFlight.isEmpty() && fresh.isEmpty()) {
                    readBack = true;
                    kick = true;
                }
            } finally {
                lock.unlock();
            }
        }
    }

    /** Marks the entries delivered, or keeps them to mark before the next read back when the journal cannot. */
    private void markDelivered(List<Long> delivered) throws JournalException {
        try {
            journal.markDelivered(delivered, time.wallNow());
        } catch (JournalException e) {
            deliveredUnmarked.addAll(delivered);
            throw e;
        }
    }

    private void markUnmarked() throws JournalException {
        if (!deliveredUnmarked.isEmpty()) {
            journal.markDelivered(deliveredUnmarked, time.wallNow());
            deliveredUnmarked.clear();
        }
    }

    private static boolean delivered(InFlight sent) {
        return sent.result().isDone() && !sent.result().isCompletedExceptionally()
                && sent.result().getNow(null) != null && sent.result().getNow(null).isDelivered();
    }

    private static PublishResult await(CompletableFuture<PublishResult> result) throws InterruptedException {
        try {
            return result.get(PUBLISH_TIMEOUT.toMillis(), TimeUnit.MILLISECONDS);
        } catch (ExecutionException | TimeoutException e) {
            return new PublishResult.Failed(e.toString());
        }
    }
}
