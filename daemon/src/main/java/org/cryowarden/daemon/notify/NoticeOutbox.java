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

    void enqueue(List<Message> messages, Instant at) throws JournalException {
        if (messages.isEmpty()) {
            return;
        }
        journal.write(messages.size() + " notices", tx -> {
            for (Message message : messages) {
                for (Roster.Reach reach : message.contact().reach()) {
                    Notice notice = new Notice(message.id(), message.contact().id(), reach.address(),
                            message.subject(), message.text(), text(message.json()));
                    ObjectNode event = describe(notice, reach.sender());
                    event.put("notice_kind", message.kind());
                    event.put("cause", message.subject());
                    long seq = tx.appendEvent(new NewEvent("notify.queued", at, Optional.of(message.contact().id()),
                            Optional.empty(), text(event)));
                    tx.enqueue(sink(reach.sender()), reach.address(), text(store(notice)),
                            OptionalLong.of(seq), at);
                }
            }
            return null;
        });
    }

    Optional<OutboxEntry> head(String sender) throws JournalException {
        List<OutboxEntry> entries = journal.undelivered(sink(sender), 1);
        return entries.isEmpty() ? Optional.empty() : Optional.of(entries.get(0));
    }

    long depth(String sender) throws JournalException {
        return journal.outboxDepth(sink(sender));
    }

    void delivered(OutboxEntry entry, Notice notice, String sender, String detail, Instant at)
            throws JournalException {
        journal.markDelivered(entry.id(), at);
        ObjectNode event = describe(notice, sender);
        event.put("attempt", entry.attempts() + 1);
        event.put("detail", detail);
        journal.append(new NewEvent("notify.sent", at, Optional.of(notice.contact()), Optional.empty(),
                text(event)));
    }

    void failed(OutboxEntry entry, Notice notice, String sender, String detail, java.time.Duration retryIn,
            Instant at) throws JournalException {
        journal.recordAttempt(entry.id(), at);
        ObjectNode event = describe(notice, sender);
        event.put("attempt", entry.attempts() + 1);
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
