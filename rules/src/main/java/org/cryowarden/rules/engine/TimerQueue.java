package org.cryowarden.rules.engine;

import java.util.Comparator;
import java.util.PriorityQueue;

/**
 * The engine's timers, ordered by due time on the monotonic clock and, for equal due times, by the order they were
 * scheduled, so that the same inputs always expire them in the same order.
 */
final class TimerQueue {

    private record Entry(long due, long sequence, Timer timer, int generation) {
    }

    private static final Comparator<Entry> ORDER =
            Comparator.comparingLong(Entry::due).thenComparingLong(Entry::sequence);

    private final PriorityQueue<Entry> heap = new PriorityQueue<>(ORDER);
    private long sequence;

    void schedule(Timer timer, long due) {
        timer.generation++;
        timer.queued = true;
        heap.add(new Entry(due, sequence++, timer, timer.generation));
    }

    void cancel(Timer timer) {
        if (timer.queued) {
            timer.generation++;
            timer.queued = false;
        }
    }

    /** Expires every timer due at or before {@code now}, earliest first, including ones scheduled meanwhile. */
    void runDue(long now) {
        Entry next;
        while ((next = heap.peek()) != null && next.due() - now <= 0) {
            heap.poll();
            Timer timer = next.timer();
            if (timer.queued && timer.generation == next.generation()) {
                timer.queued = false;
                timer.expire();
            }
        }
    }

    /** Whether anything could be due at {@code now}: the cheap check on the reading path. */
    boolean anyDue(long now) {
        Entry next = heap.peek();
        return next != null && next.due() - now <= 0;
    }
}
