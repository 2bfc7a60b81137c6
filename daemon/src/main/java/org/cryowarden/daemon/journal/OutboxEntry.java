package org.cryowarden.daemon.journal;

import java.time.Instant;
import java.util.OptionalLong;

/**
 * A message waiting for delivery to one sink.
 *
 * @param id        position in the outbox; entries of one sink are delivered in this order
 * @param sink      who delivers it ({@code mqtt}, {@code mail}, ...)
 * @param target    where within the sink (an MQTT topic, an address)
 * @param payload   what to send
 * @param seq       the event it announces, if any
 * @param createdAt when it was queued
 * @param attempts  how many times delivery was tried
 */
public record OutboxEntry(long id, String sink, String target, String payload, OptionalLong seq, Instant createdAt,
                          int attempts) {
}
