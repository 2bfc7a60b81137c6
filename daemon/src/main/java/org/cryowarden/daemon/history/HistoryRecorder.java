package org.cryowarden.daemon.history;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.atomic.AtomicLong;
import org.cryowarden.daemon.journal.BlockRow;
import org.cryowarden.daemon.journal.HistoryTable;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.Reading;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Keeps every reading the engine took in the journal's raw history: one {@link BlockEncoder} per channel, fed on
 * the engine thread with the reading stamped at the instant the engine took it (so a replay feeds it at the same
 * instant). Every flush interval the open blocks are handed to the history writer thread, which upserts them on
 * the journal's history connection; a block is sealed once it spans the settings' block length (15 min or 900
 * readings by default). The engine thread never waits: what it hands over replaces the previous, unwritten
 * snapshot of the same block, so the hand-over holds at most one snapshot per block. Retention pruning runs on the writer thread.
 *
 * <p>{@link #record} and {@link #tick} are called on the engine thread only; {@link #close} after the engine
 * stopped.
 */
public final class HistoryRecorder implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(HistoryRecorder.class);
    private static final Duration PRUNE_EVERY = Duration.ofHours(1);
    /** While writes fail, one error line in this many attempts (the first is always logged). */
    private static final long LOG_EVERY = 1000;

    private record Pending(long key, HistoryBlock block, boolean sealed) {
    }

    private static final class Open {
        final long key;
        final BlockEncoder encoder;
        int flushed;

        Open(long key, BlockEncoder encoder) {
            this.key = key;
            this.encoder = encoder;
        }
    }

    private final HistoryTable table;
    private final HistorySettings settings;
    private final String restartNote;
    private final Map<String, Open> open = new LinkedHashMap<>();
    private final Object handOver = new Object();
    private Map<Long, Pending> pending = new LinkedHashMap<>();
    private final Map<Long, Long> rowIds = new HashMap<>();
    private final AtomicLong failures = new AtomicLong();
    private final AtomicLong written = new AtomicLong();
    /** Failed attempts since the last write that worked. */
    private final AtomicLong failingFor = new AtomicLong();
    private long nextKey = 1;
    private Instant lastFlush;
    private Instant lastPrune;
    private volatile boolean running;
    private Thread writer;

    private HistoryRecorder(HistoryTable table, HistorySettings settings, String restartNote) {
        this.table = table;
        this.settings = settings;
        this.restartNote = restartNote;
    }

    /**
     * Opens the recorder on {@code table}: seals what a previous run left open and words how much history that run
     * lost (see {@link #restartNote()}). Start the writer with {@link #start()} (or flush on the caller's thread).
     */
    public static HistoryRecorder open(HistoryTable table, HistorySettings settings) throws JournalException {
        Optional<HistoryTable.Unsealed> left = table.unsealed();
        String note;
        if (left.isPresent()) {
            HistoryTable.Unsealed u = left.get();
            note = "raw history: the previous run stopped without its final flush (killed or lost power?): readings"
                    + " after " + u.lastFlushed() + ", its last committed flush, are lost, at most "
                    + DurationSyntax.format(settings.flushEvery()) + " (the history flush interval) of " + u.channels()
                    + (u.channels() == 1 ? " channel" : " channels");
            table.sealAll();
        } else {
            note = "raw history: the previous run (if any) stopped cleanly; nothing was lost";
        }
        return new HistoryRecorder(table, settings, note);
    }

    /** What the previous run lost, for the startup log. */
    public String restartNote() {
        return restartNote;
    }

    /** Starts the writer thread. */
    public void start() {
        running = true;
        writer = new Thread(this::loop, "history");
        writer.setDaemon(true);
        writer.start();
    }

    /** Engine thread: keeps {@code reading} as taken by the engine at {@code at}. */
    public void record(Reading reading, Instant at) {
        Reading stamped = reading.timestamp().equals(at) ? reading
                : new Reading(reading.channel(), reading.value(), reading.unit(), at, reading.quality(),
                        reading.reason());
        Open block = open.get(reading.channel());
        if (block != null && block.encoder.unit() != reading.unit()) {
            seal(block);
            block = null;
        }
        if (block == null) {
            block = new Open(nextKey++, new BlockEncoder(reading.channel(), reading.unit()));
            open.put(reading.channel(), block);
        }
        try {
            block.encoder.append(stamped);
        } catch (IllegalArgumentException e) {
            LOG.error("raw history of {}: {}; the reading is not kept", reading.channel(), e.getMessage());
            return;
        }
        Instant first = block.encoder.firstInstant();
        if (block.encoder.count() >= settings.sealReadings()
                || Duration.between(first, at).compareTo(settings.sealAfter()) >= 0) {
            seal(block);
        }
        tick(at);
    }

    /** Engine thread: hands the open blocks to the writer when the flush interval has passed. */
    public void tick(Instant now) {
        if (lastFlush == null) {
            lastFlush = now;
            return;
        }
        if (Duration.between(lastFlush, now).compareTo(settings.flushEvery()) >= 0) {
            lastFlush = now;
            flushOpen();
        }
    }

    /** Blocks written so far (each flush of an open block counts), for tests and metrics. */
    public long blocksWritten() {
        return written.get();
    }

    /** Writes that failed; their readings are missing from the history. */
    public long failures() {
        return failures.get();
    }

    /** Seals every open block and writes everything still to be written; call after the engine stopped. */
    @Override
    public void close() {
        for (Open block : new ArrayList<>(open.values())) {
            seal(block);
        }
        running = false;
        if (writer != null) {
            synchronized (handOver) {
                handOver.notifyAll();
            }
            try {
                writer.join(10_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        writePending();
    }

    /**
     * Writes what was handed over, on the caller's thread (driven mode, tests).
     *
     * @return false when the write failed (what it held is kept for the next attempt)
     */
    public boolean writePending() {
        Map<Long, Pending> batch;
        synchronized (handOver) {
            batch = pending;
            pending = new LinkedHashMap<>();
        }
        if (batch.isEmpty()) {
            return true;
        }
        List<Pending> items = new ArrayList<>(batch.values());
        List<BlockRow> rows = new ArrayList<>(items.size());
        for (Pending item : items) {
            HistoryBlock block = item.block;
            rows.add(new BlockRow(rowIds.getOrDefault(item.key, 0L), block.channel(), block.first(), block.last(),
                    block.count(), item.sealed, block.data()));
        }
        Instant newest = items.stream().map(p -> p.block.last()).max(Instant::compareTo).orElseThrow();
        try {
            List<Long> ids = table.write(rows, newest);
            for (int i = 0; i < items.size(); i++) {
                if (items.get(i).sealed) {
                    rowIds.remove(items.get(i).key);
                } else {
                    rowIds.put(items.get(i).key, ids.get(i));
                }
            }
            written.addAndGet(items.size());
            long failed = failingFor.getAndSet(0);
            if (failed > 0) {
                LOG.warn("raw history: writes again after {} failed attempts", failed);
            }
        } catch (JournalException e) {
            failures.incrementAndGet();
            long failed = failingFor.getAndIncrement();
            if (failed % LOG_EVERY == 0) {
                LOG.error("{} ({} failed attempts so far; retried at each flush, logged once in {})",
                        e.getMessage(), failed + 1, LOG_EVERY);
            }
            synchronized (handOver) {
                // keep them for the next attempt unless newer snapshots of the same blocks came meanwhile
                for (Pending item : items) {
                    pending.putIfAbsent(item.key, item);
                }
            }
            return false;
        }
        if (lastPrune == null || Duration.between(lastPrune, newest).compareTo(PRUNE_EVERY) >= 0) {
            lastPrune = newest;
            try {
                int pruned = table.pruneBefore(newest.minus(settings.retention()));
                if (pruned > 0) {
                    LOG.info("raw history: pruned {} blocks older than {}", pruned,
                            DurationSyntax.format(settings.retention()));
                }
            } catch (JournalException e) {
                LOG.error("{}", e.getMessage());
            }
        }
        return true;
    }

    private void flushOpen() {
        List<Pending> snapshots = new ArrayList<>();
        for (Open block : open.values()) {
            if (block.encoder.count() > block.flushed) {
                block.flushed = block.encoder.count();
                snapshots.add(new Pending(block.key, block.encoder.snapshot(), false));
            }
        }
        hand(snapshots);
    }

    private void seal(Open block) {
        open.remove(block.encoder.channel());
        if (!block.encoder.isEmpty()) {
            hand(List.of(new Pending(block.key, block.encoder.seal(), true)));
        }
    }

    private void hand(List<Pending> snapshots) {
        if (snapshots.isEmpty()) {
            return;
        }
        synchronized (handOver) {
            for (Pending snapshot : snapshots) {
                pending.put(snapshot.key, snapshot);
            }
            handOver.notifyAll();
        }
    }

    private void loop() {
        boolean wrote = true;
        while (running) {
            synchronized (handOver) {
                // After a failure the kept blocks are pending: wait all the same, or the retry spins.
                if ((pending.isEmpty() || !wrote) && running) {
                    try {
                        handOver.wait(1_000);
                    } catch (InterruptedException e) {
                        return;
                    }
                }
            }
            wrote = writePending();
        }
    }
}
