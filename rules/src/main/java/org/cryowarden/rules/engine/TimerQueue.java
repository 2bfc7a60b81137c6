package org.cryowarden.rules.engine;

import java.util.Arrays;

/**
 * The engine's timers, ordered by due time on the monotonic clock and, for equal due times, by the order they were
 * scheduled, so that the same inputs always expire them in the same order.
 *
 * <p>An indexed 4-ary heap of timer numbers: each timer gets a number at its first scheduling, so re-scheduling
 * moves it in place and cancelling takes it out, and the heap holds live timers only. Stale timeouts re-arm
 * themselves about once per timeout on every channel, which puts this heap on the reading path (half a pop per
 * reading at a thousand channels). So sifting touches primitive arrays only, never a timer object: due times in one
 * array (a node's four children share a cache line), the scheduling sequence beside it (read on equal due times
 * only), each timer's slot by number. Four children per node halve the levels a pop walks down, and a pop moves
 * the hole down to a leaf before placing the last entry (which is usually among the latest), so each level costs
 * comparisons among the children only.
 */
final class TimerQueue {

    private static final int ARITY = 4;

    /** Timers by number. */
    private Timer[] timers = new Timer[64];
    /** Heap slot of each timer by number, -1 when not queued. */
    private int[] slots = new int[64];
    private int registered;
    /** Timer number in each heap slot. */
    private int[] heap = new int[64];
    /** Due time of each heap slot. */
    private long[] due = new long[64];
    /** Scheduling sequence of each heap slot: the tie-break between equal due times. */
    private long[] sequences = new long[64];
    private int size;
    private long sequence;

    void schedule(Timer timer, long at) {
        timer.queued = true;
        int id = timer.id;
        if (id < 0) {
            id = register(timer);
        }
        long seq = sequence++;
        int slot = slots[id];
        if (slot < 0) {
            if (size == heap.length) {
                int grown = size * 2;
                heap = Arrays.copyOf(heap, grown);
                due = Arrays.copyOf(due, grown);
                sequences = Arrays.copyOf(sequences, grown);
            }
            slot = size++;
        }
        if (!siftUp(slot, id, at, seq)) {
            siftDown(slot, id, at, seq);
        }
    }

    void cancel(Timer timer) {
        int id = timer.id;
        if (id >= 0 && slots[id] >= 0) {
            remove(slots[id]);
        }
        timer.queued = false;
    }

    /** Expires every timer due at or before {@code now}, earliest first, including ones scheduled meanwhile. */
    void runDue(long now) {
        while (size > 0 && due[0] - now <= 0) {
            Timer timer = timers[heap[0]];
            removeFirst();
            timer.queued = false;
            timer.expire();
        }
    }

    /** Whether anything could be due at {@code now}: the cheap check on the reading path. */
    boolean anyDue(long now) {
        return size > 0 && due[0] - now <= 0;
    }

    private int register(Timer timer) {
        int id = registered++;
        if (id == timers.length) {
            timers = Arrays.copyOf(timers, id * 2);
            slots = Arrays.copyOf(slots, id * 2);
        }
        timers[id] = timer;
        slots[id] = -1;
        timer.id = id;
        return id;
    }

    private void remove(int slot) {
        slots[heap[slot]] = -1;
        int last = --size;
        if (slot == last) {
            return;
        }
        int moved = heap[last];
        long movedDue = due[last];
        long movedSequence = sequences[last];
        if (!siftUp(slot, moved, movedDue, movedSequence)) {
            siftDown(slot, moved, movedDue, movedSequence);
        }
    }

    /** Takes out the earliest: moves the hole down along the earliest children to a leaf, then fills it. */
    private void removeFirst() {
        slots[heap[0]] = -1;
        int last = --size;
        if (last == 0) {
            return;
        }
        int hole = 0;
        int child;
        while ((child = ARITY * hole + 1) < last) {
            int earliest = earliestChild(child, last);
            move(earliest, hole);
            hole = earliest;
        }
        siftUp(hole, heap[last], due[last], sequences[last]);
    }

    /** The earliest of the children from {@code first} (at most {@link #ARITY}, below {@code end}). */
    private int earliestChild(int first, int end) {
        int earliest = first;
        int stop = Math.min(first + ARITY, end);
        for (int c = first + 1; c < stop; c++) {
            if (before(c, due[earliest], sequences[earliest])) {
                earliest = c;
            }
        }
        return earliest;
    }

    /** Whether the entry in {@code slot} comes before ({@code at}, {@code seq}): due time, then scheduling order. */
    private boolean before(int slot, long at, long seq) {
        long d = due[slot];
        return d < at || (d == at && sequences[slot] < seq);
    }

    /** Places the timer at or above {@code slot}; whether it moved up. */
    private boolean siftUp(int slot, int id, long at, long seq) {
        int start = slot;
        while (slot > 0) {
            int parent = (slot - 1) / ARITY;
            if (before(parent, at, seq)) {
                break;
            }
            move(parent, slot);
            slot = parent;
        }
        place(slot, id, at, seq);
        return slot != start;
    }

    private void siftDown(int slot, int id, long at, long seq) {
        int child;
        while ((child = ARITY * slot + 1) < size) {
            int earliest = earliestChild(child, size);
            if (!before(earliest, at, seq)) {
                break;
            }
            move(earliest, slot);
            slot = earliest;
        }
        place(slot, id, at, seq);
    }

    private void move(int from, int to) {
        int id = heap[from];
        heap[to] = id;
        due[to] = due[from];
        sequences[to] = sequences[from];
        slots[id] = to;
    }

    private void place(int slot, int id, long at, long seq) {
        heap[slot] = id;
        due[slot] = at;
        sequences[slot] = seq;
        slots[id] = slot;
    }
}
