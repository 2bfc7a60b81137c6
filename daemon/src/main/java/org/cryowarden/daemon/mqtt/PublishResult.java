package org.cryowarden.daemon.mqtt;

import java.util.Objects;

/**
 * What became of one publish: {@link Delivered} once the broker acknowledged it (PUBACK for QoS 1, written to
 * the socket for QoS 0), or {@link Failed} with a reason. A journal outbox marks an entry delivered only on
 * {@code Delivered}; a {@code Failed} entry stays undelivered and is sent again after the next connect.
 */
public sealed interface PublishResult permits PublishResult.Delivered, PublishResult.Failed {

    /** Whether the broker took the message. */
    boolean isDelivered();

    /** The broker acknowledged the message. */
    record Delivered() implements PublishResult {
        static final Delivered INSTANCE = new Delivered();

        @Override
        public boolean isDelivered() {
            return true;
        }
    }

    /** The message was not delivered (not connected, queue full, connection lost, refused by the broker). */
    record Failed(String reason) implements PublishResult {
        public Failed {
            Objects.requireNonNull(reason, "reason");
        }

        @Override
        public boolean isDelivered() {
            return false;
        }
    }
}
