package org.cryowarden.daemon.journal;

import java.time.Instant;
import java.util.Optional;

/** An event as recorded, with the sequence number the journal gave it. */
public record JournalEvent(long seq, String kind, Instant at, Optional<String> subject, Optional<String> operator,
                           String payloadJson) {
}
