package org.cryowarden.daemon.notify.spi;

import java.util.Objects;

/**
 * One message for one person through one sender, as stored in the journal's outbox.
 *
 * @param id      stable over retries and restarts: a receiver that sees an id twice has a duplicate
 * @param contact the roster contact it is for
 * @param address where the sender delivers it for that contact (an e-mail address; for a webhook the contact
 *                id, since the URL belongs to the sender); never empty
 * @param subject one line: "CRITICAL o2-east-low: oxygen 18.9 %vol below 19.5 %vol"
 * @param text    the full text for people (e-mail body)
 * @param json    the notice as a JSON document (webhook body), including {@code id}
 */
public record Notice(String id, String contact, String address, String subject, String text, String json) {

    public Notice {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(contact, "contact");
        Objects.requireNonNull(address, "address");
        Objects.requireNonNull(subject, "subject");
        Objects.requireNonNull(text, "text");
        Objects.requireNonNull(json, "json");
    }
}
