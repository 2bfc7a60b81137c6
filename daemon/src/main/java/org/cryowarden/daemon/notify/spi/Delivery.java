package org.cryowarden.daemon.notify.spi;

import java.util.Objects;

/**
 * The outcome of one delivery attempt.
 *
 * @param delivered whether the peer accepted the notice
 * @param detail    what the peer said ("HTTP 204", "250 OK") or why it failed ("connection refused")
 */
public record Delivery(boolean delivered, String detail) {

    public Delivery {
        Objects.requireNonNull(detail, "detail");
    }

    public static Delivery delivered(String detail) {
        return new Delivery(true, detail);
    }

    public static Delivery failed(String detail) {
        return new Delivery(false, detail);
    }
}
