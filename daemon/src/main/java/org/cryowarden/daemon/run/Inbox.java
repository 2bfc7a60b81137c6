package org.cryowarden.daemon.run;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.locks.Condition;
import java.util.concurrent.locks.ReentrantLock;
import org.cryowarden.rules.Reading;

/**
 * The engine thread's input. Readings are bounded by the number of channels: a reading of a channel that still
 * has one waiting replaces it (the newest value is the one that matters) and counts as a drop. Tasks (operator
 * commands, reloads, output results) queue in order and are never dropped. Any thread may offer; whoever holds
 * the engine's turn takes. A reading offered {@linkplain #offer(Reading, boolean) quietly} wakes no one: its
 * offerer runs the engine itself, or the thread running it now finds the reading before it lets go.
 */
final class Inbox {

    private final ReentrantLock lock = new ReentrantLock();
    private final Condition ready = lock.newCondition();
    private final LinkedHashMap<String, Reading> readings = new LinkedHashMap<>();
    private final ArrayDeque<Runnable> tasks = new ArrayDeque<>();
    private long drops;
    private long offered;
    /** Counts {@link #wake()} calls, so that a waiter leaves for a wake-up with nothing waiting (a close). */
    private long wakes;

    void offer(Reading reading) {
        offer(reading, true);
    }

    /** Queues {@code reading}; wakes the taker only when {@code wake} (a wake-up costs tens of microseconds). */
    void offer(Reading reading, boolean wake) {
        lock.lock();
        try {
            offered++;
            if (readings.put(reading.channel(), reading) != null) {
                drops++;
            }
            if (wake) {
                ready.signal();
            }
        } finally {
            lock.unlock();
        }
    }

    void submit(Runnable task) {
        lock.lock();
        try {
            tasks.add(task);
            ready.signal();
        } finally {
            lock.unlock();
        }
    }

    /** What is waiting, tasks first, without waiting ({@link #await(long)} waits). */
    Work take() {
        lock.lock();
        try {
            List<Runnable> taken = new ArrayList<>(tasks);
            tasks.clear();
            List<Reading> values = new ArrayList<>(readings.values());
            readings.clear();
            return new Work(taken, values);
        } finally {
            lock.unlock();
        }
    }

    /**
     * Waits at most {@code nanos} for something to be waiting (a task, or a reading that woke it) or for
     * {@link #wake()}; takes nothing.
     */
    void await(long nanos) throws InterruptedException {
        lock.lock();
        try {
            long wait = nanos;
            long woken = wakes;
            while (readings.isEmpty() && tasks.isEmpty() && wait > 0 && woken == wakes) {
                wait = ready.awaitNanos(wait);
            }
        } finally {
            lock.unlock();
        }
    }

    /** The waiting readings, or nothing when a task waits: tasks and what queued behind them are the taker's. */
    List<Reading> takeReadingsUnlessTasks() {
        lock.lock();
        try {
            if (!tasks.isEmpty() || readings.isEmpty()) {
                return List.of();
            }
            List<Reading> values = new ArrayList<>(readings.values());
            readings.clear();
            return values;
        } finally {
            lock.unlock();
        }
    }

    /** Whether readings wait and no task does: what a thread that offered one may run itself. */
    boolean onlyReadingsWait() {
        lock.lock();
        try {
            return tasks.isEmpty() && !readings.isEmpty();
        } finally {
            lock.unlock();
        }
    }

    void wake() {
        lock.lock();
        try {
            wakes++;
            ready.signalAll();
        } finally {
            lock.unlock();
        }
    }

    int depth() {
        lock.lock();
        try {
            return readings.size() + tasks.size();
        } finally {
            lock.unlock();
        }
    }

    long drops() {
        lock.lock();
        try {
            return drops;
        } finally {
            lock.unlock();
        }
    }

    long offered() {
        lock.lock();
        try {
            return offered;
        } finally {
            lock.unlock();
        }
    }

    record Work(List<Runnable> tasks, List<Reading> readings) {
        boolean isEmpty() {
            return tasks.isEmpty() && readings.isEmpty();
        }
    }

    static long millis(long ms) {
        return TimeUnit.MILLISECONDS.toNanos(ms);
    }

    Map<String, Reading> peek() {
        lock.lock();
        try {
            return Map.copyOf(readings);
        } finally {
            lock.unlock();
        }
    }
}
