package org.cryowarden.daemon.notify.spi;

/**
 * Delivers notices of one sender. The host calls {@link #deliver} from that sender's own delivery thread, one
 * notice at a time in outbox order, and retries a failed notice with backoff before the next one, so a notifier
 * needs no queue or retry of its own. A notice may be delivered twice (after a crash between delivery and the
 * journal's record of it): receivers recognise the repeat by {@link Notice#id()}.
 */
@FunctionalInterface
public interface Notifier extends AutoCloseable {

    /** Tries once; never throws for a peer that misbehaves (that is a failed {@link Delivery}). */
    Delivery deliver(Notice notice);

    @Override
    default void close() {
    }
}
