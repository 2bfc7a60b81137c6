package org.cryowarden.daemon.history;

import java.time.Instant;
import java.util.Comparator;
import java.util.Iterator;
import java.util.List;
import java.util.NoSuchElementException;
import java.util.PriorityQueue;
import org.cryowarden.rules.Reading;

/**
 * Merges several time-ordered reading streams (typically one per channel) into one time-ordered stream, the input
 * of a replay. Readings with equal timestamps come in the order of their streams in the list, then in their order
 * within a stream, so the merge is deterministic; give the streams in the order the engine saw equal-instant
 * readings (e.g. the site's channel order).
 */
public final class MergedReadings implements Iterator<Reading> {

    private record Head(Reading reading, int source) {
    }

    private static final Comparator<Head> ORDER = Comparator.<Head, Instant>comparing(head -> head.reading.timestamp())
            .thenComparingInt(Head::source);

    private final List<? extends Iterator<Reading>> sources;
    private final PriorityQueue<Head> heads;

    private MergedReadings(List<? extends Iterator<Reading>> sources) {
        this.sources = List.copyOf(sources);
        this.heads = new PriorityQueue<>(Math.max(1, sources.size()), ORDER);
        for (int i = 0; i < this.sources.size(); i++) {
            pull(i, null);
        }
    }

    /** A stream of the readings of every source, in time order. */
    public static MergedReadings of(List<? extends Iterator<Reading>> sources) {
        return new MergedReadings(sources);
    }

    @Override
    public boolean hasNext() {
        return !heads.isEmpty();
    }

    /**
     * @throws IllegalArgumentException when a source goes back in time
     */
    @Override
    public Reading next() {
        Head head = heads.poll();
        if (head == null) {
            throw new NoSuchElementException("no more readings");
        }
        pull(head.source, head.reading);
        return head.reading;
    }

    private void pull(int source, Reading previous) {
        Iterator<Reading> iterator = sources.get(source);
        if (iterator.hasNext()) {
            Reading next = iterator.next();
            if (previous != null && next.timestamp().isBefore(previous.timestamp())) {
                throw new IllegalArgumentException("readings of " + next.channel() + " go back in time from "
                        + previous.timestamp() + " to " + next.timestamp() + ": a replay needs them in time order");
            }
            heads.add(new Head(next, source));
        }
    }
}
