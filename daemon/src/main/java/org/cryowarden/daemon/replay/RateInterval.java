package org.cryowarden.daemon.replay;

import java.time.Instant;

/** How many activations (of all alarms) started in {@code [start, end)}. */
public record RateInterval(Instant start, Instant end, int activations) {
}
