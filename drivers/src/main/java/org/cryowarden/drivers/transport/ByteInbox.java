package org.cryowarden.drivers.transport;

import java.io.IOException;
import java.time.Duration;
import java.util.concurrent.locks.Condition;
import java.util.concurrent.locks.ReentrantLock;

/**
 * The hand-over between the serial transport's reader thread (which blocks in the serial library) and the
 * poller thread (which waits for bytes with exact timeouts). A bounded ring: when the poller does not keep up,
 * the oldest bytes are dropped and counted. Once {@link #fail failed}, readers get the failure as an
 * {@link IOException} after the bytes already received.
 */
final class ByteInbox {

    private final ReentrantLock lock = new ReentrantLock();
    private final Condition arrived = lock.newCondition();
    private final byte[] ring;
    private int head;
    private int size;
    private long dropped;
    private String failure;

    ByteInbox(int capacity) {
        this.ring = new byte[capacity];
    }

    /** Reader thread: adds received bytes. */
    void put(byte[] bytes, int offset, int count) {
        lock.lock();
        try {
            for (int i = 0; i < count; i++) {
                if (size == ring.length) {
                    head = (head + 1) % ring.length;
                    size--;
                    dropped++;
                }
                ring[(head + size) % ring.length] = bytes[offset + i];
                size++;
            }
            arrived.signalAll();
        } finally {
            lock.unlock();
        }
    }

    /** Reader thread or closer: the link is gone, with an operator-readable reason. */
    void fail(String reason) {
        lock.lock();
        try {
            if (failure == null) {
                failure = reason;
            }
            arrived.signalAll();
        } finally {
            lock.unlock();
        }
    }

    /** Poller thread: waits at most {@code timeout} for at least one byte. */
    int take(byte[] buffer, int offset, int length, Duration timeout) throws IOException {
        long remaining = timeout.toNanos();
        lock.lock();
        try {
            while (size == 0) {
                if (failure != null) {
                    throw new IOException(failure);
                }
                if (remaining <= 0) {
                    return 0;
                }
                try {
                    remaining = arrived.awaitNanos(remaining);
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                    throw new IOException("interrupted while waiting for device bytes", e);
                }
            }
            int count = Math.min(length, size);
            for (int i = 0; i < count; i++) {
                buffer[offset + i] = ring[(head + i) % ring.length];
            }
            head = (head + count) % ring.length;
            size -= count;
            return count;
        } finally {
            lock.unlock();
        }
    }

    /** Poller thread: discards what is buffered, returning how much. */
    int clear() throws IOException {
        lock.lock();
        try {
            int discarded = size;
            head = 0;
            size = 0;
            if (failure != null && discarded == 0) {
                throw new IOException(failure);
            }
            return discarded;
        } finally {
            lock.unlock();
        }
    }

    boolean failed() {
        lock.lock();
        try {
            return failure != null;
        } finally {
            lock.unlock();
        }
    }

    long dropped() {
        lock.lock();
        try {
            return dropped;
        } finally {
            lock.unlock();
        }
    }
}
