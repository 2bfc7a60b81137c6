package org.cryowarden.daemon.notify;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.time.Instant;
import java.util.List;
import java.util.Optional;
import java.util.OptionalLong;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.journal.NewEvent;
import org.cryowarden.daemon.journal.OutboxEntry;
import org.cryowarden.daemon.notify.spi.Notice;

/**
 * Notices in the journal: each message becomes one outbox entry per reach of its contact (sink
 * {@code notify/<sender>}) and a {@code notify.queued} event, in one transaction, so a notice decided before a
 * crash is still sent after the restart. Delivery outcomes are journal events too ({@code notify.sent},
 * {@code notify.failed} with the retry delay).
 */
final class NoticeOutbox {

    static final String SINK_PREFIX = "notify/";
    private static final ObjectMapper JSON = new ObjectMapper();

    private final Journal journal;

    NoticeOutbox(Journal journal) {
        this.journal = journal;
    }

    static String sink(String sender) {
        return SINK_PREFIX + sender;
    }

    /** A notice in the journal's outbox: the sender that delivers it and its outbox entry. */
    record Queued(String sender, long entryId, Notice notice) {
    }

    List<Queued> enqueue(List<Message> messages, Instant at) throws JournalException {
        if (messages.isEmpty()) {
            return List.of();
        }
        return journal.write(messages.size() + " notices", tx -> {
            List<Queued> queued = new java.util.ArrayList<>();
            for (Message message : messages) {
                for (Roster.Reach reach : message.contact().reach()) {
                    Notice notice = notice(message, reach);
                    ObjectNode event = describe(notice, reach.sender());
                    event.put("notice_kind", message.kind());
                    event.put("cause", message.subject());
                    long seq = tx.appendEvent(new NewEvent("notify.queued", at, Optional.of(message.contact().id()),
                            Optional.empty(), text(event)));
                    long id = tx.enqueue(sink(reach.sender()), reach.address(), text(store(notice)),
                            OptionalLong.of(seq), at);
                    queued.add(new Queued(reach.sender(), id, notice));
                }
            }
            return queued;
        });
    }

    /** The notice {@code message} becomes for one reach of its contact. */
    static Notice notice(Message message, Roster.Reach reach) {
        return new Notice(message.id(), message.contact().id(), reach.address(), message.subject(), message.text(),
                text(message.json()));
    }

    /** The undelivered entries of {@code sender}, oldest first, at most {@code limit}. */
    List<OutboxEntry> undelivered(String sender, int limit) throws JournalException {
        return journal.undelivered(sink(sender), limit);
    }

    void markDelivered(long entryId, Instant at) throws JournalException {
        journal.markDelivered(entryId, at);
    }

    long depth(String sender) throws JournalException {
        return journal.outboxDepth(sink(sender));
    }

    void delivered(long entryId, int attempt, Notice notice, String sender, String detail, Instant at)
            throws JournalException {
        journal.markDelivered(entryId, at);
        ObjectNode event = describe(notice, sender);
        event.put("attempt", attempt);
        event.put("detail", detail);
        journal.append(new NewEvent("notify.sent", at, Optional.of(notice.contact()), Optional.empty(),
                text(event)));
    }

    void failed(long entryId, int attempt, Notice notice, String sender, String detail,
            java.time.Duration retryIn, Instant at) throws JournalException {
        journal.recordAttempt(entryId, at);
        ObjectNode event = describe(notice, sender);
        event.put("attempt", attempt);
        event.put("detail", detail);
        event.put("retry_in", retryIn.toString());
        journal.append(new NewEvent("notify.failed", at, Optional.of(notice.contact()), Optional.empty(),
                text(event)));
    }

    static Notice notice(OutboxEntry entry) {
        try {
            ObjectNode node = (ObjectNode) JSON.readTree(entry.payload());
            return new Notice(node.path("id").asText(), node.path("contact").asText(), entry.target(),
                    node.path("subject").asText(), node.path("text").asText(), node.path("json").asText());
        } catch (java.io.IOException | ClassCastException e) {
            throw new IllegalStateException("outbox entry " + entry.id() + " is not a notice: " + e.getMessage(), e);
        }
    }

    private static ObjectNode store(Notice notice) {
        ObjectNode node = JSON.createObjectNode();
        node.put("id", notice.id());
        node.put("contact", notice.contact());
        node.put("subject", notice.subject());
        node.put("text", notice.text());
        node.put("json", notice.json());
        return node;
    }

    private static ObjectNode describe(Notice notice, String sender) {
        ObjectNode event = JSON.createObjectNode();
        event.put("notice", notice.id());
        event.put("sender", sender);
        event.put("address", notice.address());
        return event;
    }

    private static String text(ObjectNode node) {
        try {
            return JSON.writeValueAsString(node);
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }
}
