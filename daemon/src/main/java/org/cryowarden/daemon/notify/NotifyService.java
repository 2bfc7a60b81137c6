package org.cryowarden.daemon.notify;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.OptionalLong;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.concurrent.locks.LockSupport;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.notify.spi.Notifier;
import org.cryowarden.daemon.run.DaemonEvent;
import org.cryowarden.rules.TimeSource;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The notify sink: takes recorded events (from the journal thread, never blocking it), escalates them with the
 * roster, puts the resulting notices in the journal's outbox and delivers each sender's outbox in order.
 *
 * <p>Threads: {@link #accept} from any thread; {@link #runDue} on one thread only, either the service's own
 * ({@link #start}) or a test's that moves a virtual clock between calls. Escalation timers use the monotonic side
 * of the clock, so a night replays the same in a test.
 */
public final class NotifyService implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(NotifyService.class);
    private static final long IDLE_WAIT_NANOS = 200_000_000L;

    private record Recorded(DaemonEvent event, long seq) {
    }

    private final Escalation escalation;
    private final ResumeClock escalationClock;
    private final Journal journal;
    private final Roster roster;
    private final NoticeOutbox outbox;
    private final TimeSource time;
    private final Map<String, SenderQueue> senders = new LinkedHashMap<>();
    private final ConcurrentLinkedQueue<Recorded> inbox = new ConcurrentLinkedQueue<>();
    /** Events up to this journal sequence number were taken by {@link #resume}; the inbox skips them. */
    private volatile long resumedThrough;
    private volatile boolean running;
    private Thread thread;

    public NotifyService(Roster roster, Map<String, Notifier> notifiers, Journal journal, TimeSource time,
            String site) {
        this.escalationClock = new ResumeClock(time);
        this.escalation = new Escalation(roster, escalationClock, site);
        this.journal = journal;
        this.roster = roster;
        this.outbox = new NoticeOutbox(journal);
        this.time = time;
        notifiers.forEach((id, notifier) -> senders.put(id, new SenderQueue(id, notifier, outbox, time)));
    }

    /**
     * Picks up, after a restart, the escalations the previous run had in progress (see {@link EscalationReplay})
     * and queues the notices that fell due while the daemon was down. Call once, before {@link #start}; events
     * {@link #accept}ed meanwhile that the replay already read are not taken twice.
     *
     * @return the alarms being escalated again
     */
    public java.util.Set<String> resume() throws JournalException {
        EscalationReplay.Outcome outcome = EscalationReplay.run(escalation, escalationClock, journal, roster);
        resumedThrough = outcome.lastSeq();
        senders.values().forEach(SenderQueue::load); // what the previous run left undelivered goes first
        queue(outcome.missed());
        if (!outcome.open().isEmpty() || !outcome.missed().isEmpty()) {
            LOG.info("notify: resumed the escalation of {} from the journal ({} events, {} notices already queued);"
                    + " {} notices fell due while the daemon was down and go now: {}", outcome.open(),
                    outcome.events(), outcome.alreadyQueued(), outcome.missed().size(),
                    outcome.missed().stream().map(Message::id).toList());
        }
        return outcome.open();
    }

    /** Hands over events the journal recorded, with their sequence numbers (empty where recording failed). */
    public void accept(List<DaemonEvent> events, List<OptionalLong> seqs) {
        for (int i = 0; i < events.size(); i++) {
            OptionalLong seq = i < seqs.size() ? seqs.get(i) : OptionalLong.empty();
            // An unrecorded event still pages; its notices take an id from the clock instead of the journal.
            inbox.add(new Recorded(events.get(i), seq.orElse(-time.monotonicNanos())));
        }
        LockSupport.unpark(thread);
    }

    /**
     * Escalates what arrived, fires due timers, queues the notices and delivers what each sender can.
     *
     * @return the monotonic time (ns) when something is next due
     */
    public long runDue() {
        List<Message> messages = new ArrayList<>();
        Recorded next;
        while ((next = inbox.poll()) != null) {
            if (next.seq() > 0 && next.seq() <= resumedThrough) {
                continue; // handed over while resume() was replaying it from the journal (a reload)
            }
            messages.addAll(escalation.onEvent(next.event(), next.seq()));
        }
        messages.addAll(escalation.tick());
        queue(messages);
        long due = escalation.nextDue();
        for (SenderQueue queue : senders.values()) {
            try {
                due = Math.min(due, queue.runDue());
            } catch (RuntimeException e) {
                LOG.error("notice delivery failed: {}", e.getMessage());
            }
        }
        return due;
    }

    /** Queues in the journal's outbox and with each sender; what the journal cannot take goes from memory. */
    private void queue(List<Message> messages) {
        try {
            for (NoticeOutbox.Queued queued : outbox.enqueue(messages, time.wallNow())) {
                SenderQueue queue = senders.get(queued.sender());
                if (queue != null) {
                    queue.add(queued.entryId(), queued.notice());
                }
            }
        } catch (JournalException e) {
            hold(messages, e);
        }
    }

    /** Sends from memory what the journal could not queue: a full or read-only journal must not stop paging. */
    private void hold(List<Message> messages, JournalException cause) {
        int held = 0;
        for (Message message : messages) {
            for (Roster.Reach reach : message.contact().reach()) {
                SenderQueue queue = senders.get(reach.sender());
                if (queue != null) {
                    queue.hold(NoticeOutbox.notice(message, reach));
                    held++;
                }
            }
        }
        LOG.error("could not queue {} notices in the journal ({}); {} deliveries go from memory, unrecorded, and"
                + " are lost if the daemon stops first", messages.size(), cause.getMessage(), held);
    }

    /** Notices of {@code sender} held in memory because the journal could not queue them. */
    public int held(String sender) {
        SenderQueue queue = senders.get(sender);
        return queue == null ? 0 : queue.held();
    }

    /** Undelivered notices of {@code sender}. */
    public long depth(String sender) throws JournalException {
        return outbox.depth(sender);
    }

    public void start() {
        running = true;
        thread = new Thread(this::loop, "notify");
        thread.setDaemon(true);
        thread.start();
    }

    private void loop() {
        while (running) {
            long due;
            try {
                due = runDue();
            } catch (RuntimeException e) {
                LOG.error("notify round failed; carrying on", e);
                due = time.monotonicNanos() + IDLE_WAIT_NANOS;
            }
            long wait = Math.min(IDLE_WAIT_NANOS, Math.max(1_000_000L, due - time.monotonicNanos()));
            if (inbox.isEmpty()) {
                LockSupport.parkNanos(this, wait);
            }
        }
    }

    @Override
    public void close() {
        running = false;
        if (thread != null) {
            LockSupport.unpark(thread);
            try {
                thread.join(5_000);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
        senders.values().forEach(SenderQueue::close);
    }
}
