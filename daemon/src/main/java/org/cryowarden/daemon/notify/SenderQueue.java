package org.cryowarden.daemon.notify;

import java.time.Duration;
import java.util.Optional;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.journal.OutboxEntry;
import org.cryowarden.daemon.notify.spi.Delivery;
import org.cryowarden.daemon.notify.spi.Notice;
import org.cryowarden.daemon.notify.spi.Notifier;
import org.cryowarden.rules.TimeSource;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Delivers one sender's outbox in order, at least once: the oldest undelivered notice is tried until it goes
 * through, with exponential backoff ({@link #FIRST_RETRY} doubling up to {@link #LONGEST_RETRY}) on the monotonic
 * clock, before any later notice. A crash after delivery but before the journal records it sends that notice
 * again on restart, with the same id.
 */
final class SenderQueue {

    static final Duration FIRST_RETRY = Duration.ofSeconds(15);
    static final Duration LONGEST_RETRY = Duration.ofMinutes(10);

    private static final Logger LOG = LoggerFactory.getLogger(SenderQueue.class);

    private final String sender;
    private final Notifier notifier;
    private final NoticeOutbox outbox;
    private final TimeSource time;
    private long nextAttemptAt = Long.MIN_VALUE;
    private int failuresInRow;

    SenderQueue(String sender, Notifier notifier, NoticeOutbox outbox, TimeSource time) {
        this.sender = sender;
        this.notifier = notifier;
        this.outbox = outbox;
        this.time = time;
    }

    /** Delivers what it can now; returns when it next wants to run (monotonic ns), or MAX_VALUE when empty. */
    long runDue() throws JournalException {
        while (true) {
            long now = time.monotonicNanos();
            if (nextAttemptAt != Long.MIN_VALUE && now - nextAttemptAt < 0) {
                return nextAttemptAt;
            }
            Optional<OutboxEntry> head = outbox.head(sender);
            if (head.isEmpty()) {
                nextAttemptAt = Long.MIN_VALUE;
                return Long.MAX_VALUE;
            }
            Notice notice = NoticeOutbox.notice(head.get());
            Delivery delivery;
            try {
                delivery = notifier.deliver(notice);
            } catch (RuntimeException e) {
                LOG.error("notifier '{}' threw on notice {}; counted as a failed attempt", sender, notice.id(), e);
                delivery = Delivery.failed("notifier failed: " + e);
            }
            if (delivery.delivered()) {
                failuresInRow = 0;
                nextAttemptAt = Long.MIN_VALUE;
                outbox.delivered(head.get(), notice, sender, delivery.detail(), time.wallNow());
                continue;
            }
            failuresInRow++;
            Duration wait = backoff(failuresInRow);
            nextAttemptAt = now + wait.toNanos();
            outbox.failed(head.get(), notice, sender, delivery.detail(), wait, time.wallNow());
            LOG.warn("notice {} to {} via {} failed (attempt {}): {}; retrying in {}", notice.id(), notice.address(),
                    sender, head.get().attempts() + 1, delivery.detail(), wait);
            return nextAttemptAt;
        }
    }

    static Duration backoff(int failures) {
        Duration wait = FIRST_RETRY;
        for (int i = 1; i < failures && wait.compareTo(LONGEST_RETRY) < 0; i++) {
            wait = wait.multipliedBy(2);
        }
        return wait.compareTo(LONGEST_RETRY) > 0 ? LONGEST_RETRY : wait;
    }

    void close() {
        notifier.close();
    }
}
