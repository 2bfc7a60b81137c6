package org.cryowarden.daemon.mqtt;

/**
 * Told when the link comes up or goes down, on the link's callback thread (never on a Paho thread), in order.
 * On {@code connected} the owner republishes retained values and restarts its outbox; on {@code lost} it keeps
 * working and lets the journal hold what cannot be sent.
 */
public interface ConnectionListener {

    /** The link is connected; subscriptions are re-established and the online status is on its way. */
    default void connected(boolean reconnect) {
    }

    /** The connection broke (or a connect attempt failed after a working connection); reconnecting follows. */
    default void lost(String reason) {
    }
}
