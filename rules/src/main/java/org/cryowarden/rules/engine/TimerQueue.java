package org.cryowarden.rules.engine;

import java.util.Arrays;

/**
 * The engine's timers, ordered by due time on the monotonic clock and, for equal due times, by the order they were
 * scheduled, so that the same inputs always expire them in the same order.
 *
 * <p>An indexed binary heap: each timer knows its slot, so re-scheduling moves it in place and cancelling takes it
 * out, and the heap holds live timers only. Stale timeouts re-arm themselves about once per timeout on every
 * channel, which puts this heap on the reading path: the keys sit in primitive arrays beside the timers, so sifting
 * compares within two arrays instead of visiting a timer object per comparison.
 */
final class TimerQueue {

    private long[] due = new long[64];
    private long[] sequences = new long[64];
    private Timer[] heap = new Timer[64];
    private int size;
    private long sequence;

    void schedule(Timer timer, long at) {
        timer.queued = true;
        long seq = sequence++;
        int slot = timer.slot;
        if (slot < 0) {
            if (size == heap.length) {
                int grown = size * 2;
                heap = Arrays.copyOf(heap, grown);
                due = Arrays.copyOf(due, grown);
                sequences = Arrays.copyOf(sequences, grown);
            }
            slot = size++;
        }
        if (!siftUp(slot, timer, at, seq)) {
            siftDown(slot, timer, at, seq);
        }
    }

    void cancel(Timer timer) {
        if (timer.slot >= 0) {
            remove(timer.slot);
        }
        timer.queued = false;
    }

    /** Expires every timer due at or before {@code now}, earliest first, including ones scheduled meanwhile. */
    void runDue(long now) {
        while (size > 0 && due[0] - now <= 0) {
            Timer timer = heap[0];
            remove(0);
            timer.queued = false;
            timer.expire();
        }
    }

    /** Whether anything could be due at {@code now}: the cheap check on the reading path. */
    boolean anyDue(long now) {
        return size > 0 && due[0] - now <= 0;
    }

    private void remove(int slot) {
        heap[slot].slot = -1;
        int last = --size;
        Timer moved = heap[last];
        long movedDue = due[last];
        long movedSequence = sequences[last];
        heap[last] = null;
        if (slot == last) {
            return;
        }
        if (!siftUp(slot, moved, movedDue, movedSequence)) {
            siftDown(slot, moved, movedDue, movedSequence);
        }
    }

    /** Whether the entry in {@code slot} comes before ({@code at}, {@code seq}): due time, then scheduling order. */
    private boolean before(int slot, long at, long seq) {
        return due[slot] < at || (due[slot] == at && sequences[slot] < seq);
    }

    /** Places the timer at or above {@code slot}; whether it moved up. */
    private boolean siftUp(int slot, Timer timer, long at, long seq) {
        int start = slot;
        while (slot > 0) {
            int parent = (slot - 1) >>> 1;
            if (before(parent, at, seq)) {
                break;
            }
            place(slot, heap[parent], due[parent], sequences[parent]);
            slot = parent;
        }
        place(slot, timer, at, seq);
        return slot != start;
    }

    private void siftDown(int slot, Timer timer, long at, long seq) {
        int half = size >>> 1;
        while (slot < half) {
            int child = 2 * slot + 1;
            int right = child + 1;
            if (right < size && before(right, due[child], sequences[child])) {
                child = right;
            }
            if (!before(child, at, seq)) {
                break;
            }
            place(slot, heap[child], due[child], sequences[child]);
            slot = child;
        }
        place(slot, timer, at, seq);
    }

    private void place(int slot, Timer timer, long at, long seq) {
        heap[slot] = timer;
        due[slot] = at;
        sequences[slot] = seq;
        timer.slot = slot;
    }
}
