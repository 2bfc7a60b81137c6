package org.cryowarden.daemon.history;

import java.util.Iterator;
import java.util.List;
import java.util.NoSuchElementException;
import org.cryowarden.rules.Reading;

/**
 * Merges several time-ordered reading streams (typically one per channel) into one time-ordered stream, the input
 * of a replay. Readings with equal timestamps come in the order of their streams in the list, then in their order
 * within a stream, so the merge is deterministic; give the streams in the order the engine saw equal-instant
 * readings (e.g. the site's channel order). A binary heap of stream indices keyed by (nanoseconds, index): no
 * allocation per reading, which matters at millions of readings per replay.
 */
public final class MergedReadings implements Iterator<Reading> {

    private final Iterator<Reading>[] sources;
    private final Reading[] heads;
    private final long[] keys;
    private final int[] heap;
    private int size;

    @SuppressWarnings("unchecked")
    private MergedReadings(List<? extends Iterator<Reading>> sources) {
        int n = sources.size();
        this.sources = sources.toArray(new Iterator[0]);
        this.heads = new Reading[n];
        this.keys = new long[n];
        this.heap = new int[n];
        for (int i = 0; i < n; i++) {
            if (pull(i, null)) {
                heap[size] = i;
                siftUp(size++);
            }
        }
    }

    /** A stream of the readings of every source, in time order. */
    public static MergedReadings of(List<? extends Iterator<Reading>> sources) {
        return new MergedReadings(sources);
    }

    @Override
    public boolean hasNext() {
        return size > 0;
    }

    /**
     * @throws IllegalArgumentException when a source goes back in time
     */
    @Override
    public Reading next() {
        if (size == 0) {
            throw new NoSuchElementException("no more readings");
        }
        int source = heap[0];
        Reading reading = heads[source];
        if (!pull(source, reading)) {
            heap[0] = heap[--size];
        }
        if (size > 0) {
            siftDown(0);
        }
        return reading;
    }

    private boolean pull(int source, Reading previous) {
        Iterator<Reading> iterator = sources[source];
        if (!iterator.hasNext()) {
            heads[source] = null;
            return false;
        }
        Reading next = iterator.next();
        if (previous != null && next.timestamp().isBefore(previous.timestamp())) {
            throw new IllegalArgumentException("readings of " + next.channel() + " go back in time from "
                    + previous.timestamp() + " to " + next.timestamp() + ": a replay needs them in time order");
        }
        heads[source] = next;
        keys[source] = BlockEncoder.nanos(next.timestamp(), next.channel());
        return true;
    }

    private boolean before(int a, int b) {
        return keys[a] < keys[b] || (keys[a] == keys[b] && a < b);
    }

    private void siftUp(int at) {
        int item = heap[at];
        while (at > 0) {
            int parent = (at - 1) >>> 1;
            if (!before(item, heap[parent])) {
                break;
            }
            heap[at] = heap[parent];
            at = parent;
        }
        heap[at] = item;
    }

    private void siftDown(int at) {
        int item = heap[at];
        int half = size >>> 1;
        while (at < half) {
            int child = 2 * at + 1;
            if (child + 1 < size && before(heap[child + 1], heap[child])) {
                child++;
            }
            if (!before(heap[child], item)) {
                break;
            }
            heap[at] = heap[child];
            at = child;
        }
        heap[at] = item;
    }
}
