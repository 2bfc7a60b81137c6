package org.cryowarden.daemon.notify;

import java.time.Duration;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.Iterator;
import java.util.LinkedHashSet;
import java.util.Map;
import java.util.OptionalLong;
import java.util.Set;
import java.util.TreeMap;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.journal.OutboxEntry;
import org.cryowarden.daemon.notify.spi.Delivery;
import org.cryowarden.daemon.notify.spi.Notice;
import org.cryowarden.daemon.notify.spi.Notifier;
import org.cryowarden.rules.TimeSource;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Delivers one sender's notices in order, at least once: the oldest undelivered notice is tried until it goes
 * through, with exponential backoff ({@link #FIRST_RETRY} doubling up to {@link #LONGEST_RETRY}) on the monotonic
 * clock, before any later notice. A crash after delivery but before the journal records it sends that notice
 * again on restart, with the same id.
 *
 * <p>The journal's outbox is the durable copy; the queue works from its own copy in memory, filled from the
 * journal once (what an earlier run left undelivered) and then by each notice as it is queued. So paging goes on
 * while the journal cannot be read or written (disk full, read-only): a notice the journal could not queue is
 * held in memory only (lost if the daemon stops first), and a delivery it could not record is remembered, so the
 * notice is not sent again, and recorded once the journal writes again.
 */
final class SenderQueue {

    static final Duration FIRST_RETRY = Duration.ofSeconds(15);
    static final Duration LONGEST_RETRY = Duration.ofMinutes(10);
    private static final int LOAD_LIMIT = 100_000;

    private static final Logger LOG = LoggerFactory.getLogger(SenderQueue.class);

    /** A notice waiting for delivery: its outbox entry when the journal holds it, and the attempts so far. */
    private static final class Pending {
        final OptionalLong entryId;
        final Notice notice;
        int attempts;

        Pending(OptionalLong entryId, Notice notice, int attempts) {
            this.entryId = entryId;
            this.notice = notice;
            this.attempts = attempts;
        }
    }

    private final String sender;
    private final Notifier notifier;
    private final NoticeOutbox outbox;
    private final TimeSource time;
    private final Map<Long, Pending> journaled = new TreeMap<>();
    private final Deque<Pending> unjournaled = new ArrayDeque<>();
    private final Set<Long> deliveredUnmarked = new LinkedHashSet<>();
    private boolean loaded;
    private long nextAttemptAt = Long.MIN_VALUE;
    private int failuresInRow;

    SenderQueue(String sender, Notifier notifier, NoticeOutbox outbox, TimeSource time) {
        this.sender = sender;
        this.notifier = notifier;
        this.outbox = outbox;
        this.time = time;
    }

    /** Takes a notice the journal has just queued. */
    void add(long entryId, Notice notice) {
        journaled.putIfAbsent(entryId, new Pending(OptionalLong.of(entryId), notice, 0));
    }

    /** Takes a notice the journal could not queue; it goes after the journal's own, from memory. */
    void hold(Notice notice) {
        unjournaled.add(new Pending(OptionalLong.empty(), notice, 0));
    }

    /** Notices held in memory only because the journal could not queue them. */
    int held() {
        return unjournaled.size();
    }

    /**
     * Reads what an earlier run left undelivered, once; until the journal can be read, the notices queued since
     * go anyway (the older ones follow when it can).
     */
    void load() {
        if (loaded) {
            return;
        }
        try {
            for (OutboxEntry entry : outbox.undelivered(sender, LOAD_LIMIT)) {
                journaled.putIfAbsent(entry.id(), new Pending(OptionalLong.of(entry.id()),
                        NoticeOutbox.notice(entry), entry.attempts()));
            }
            loaded = true;
        } catch (JournalException e) {
            LOG.debug("notifier '{}': cannot read the outbox yet: {}", sender, e.getMessage());
        }
    }

    /** Delivers what it can now; returns when it next wants to run (monotonic ns), or MAX_VALUE when empty. */
    long runDue() {
        load();
        markWhatWasDelivered();
        while (true) {
            long now = time.monotonicNanos();
            if (nextAttemptAt != Long.MIN_VALUE && now - nextAttemptAt < 0) {
                return nextAttemptAt;
            }
            Pending head = journaled.isEmpty() ? unjournaled.peek() : journaled.values().iterator().next();
            if (head == null) {
                nextAttemptAt = Long.MIN_VALUE;
                return Long.MAX_VALUE;
            }
            Notice notice = head.notice;
            Delivery delivery;
            try {
                delivery = notifier.deliver(notice);
            } catch (RuntimeException e) {
                LOG.error("notifier '{}' threw on notice {}; counted as a failed attempt", sender, notice.id(), e);
                delivery = Delivery.failed("notifier failed: " + e);
            }
            head.attempts++;
            if (delivery.delivered()) {
                failuresInRow = 0;
                nextAttemptAt = Long.MIN_VALUE;
                if (head.entryId.isPresent()) {
                    journaled.remove(head.entryId.getAsLong());
                    recordDelivery(head, delivery.detail());
                } else {
                    unjournaled.poll();
                    LOG.warn("notice {} delivered to {} via {}; not in the journal, which could not queue it",
                            notice.id(), notice.address(), sender);
                }
                continue;
            }
            failuresInRow++;
            Duration wait = backoff(failuresInRow);
            nextAttemptAt = now + wait.toNanos();
            if (head.entryId.isPresent()) {
                try {
                    outbox.failed(head.entryId.getAsLong(), head.attempts, notice, sender, delivery.detail(), wait,
                            time.wallNow());
                } catch (JournalException e) {
                    LOG.debug("could not record the failed attempt of notice {}: {}", notice.id(), e.getMessage());
                }
            }
            LOG.warn("notice {} to {} via {} failed (attempt {}): {}; retrying in {}", notice.id(), notice.address(),
                    sender, head.attempts, delivery.detail(), wait);
            return nextAttemptAt;
        }
    }

    /** Records a delivery; when the journal cannot write, remembers it and records it later. */
    private void recordDelivery(Pending delivered, String detail) {
        long id = delivered.entryId.getAsLong();
        try {
            outbox.delivered(id, delivered.attempts, delivered.notice, sender, detail, time.wallNow());
        } catch (JournalException e) {
            deliveredUnmarked.add(id);
            LOG.warn("notice {} delivered via {} but the journal could not record it ({}); it is recorded once the"
                    + " journal writes again", delivered.notice.id(), sender, e.getMessage());
        }
    }

    private void markWhatWasDelivered() {
        for (Iterator<Long> it = deliveredUnmarked.iterator(); it.hasNext(); ) {
            try {
                outbox.markDelivered(it.next(), time.wallNow());
                it.remove();
            } catch (JournalException e) {
                return; // still cannot write; again next round
            }
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
