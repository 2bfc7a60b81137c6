package org.cryowarden.daemon.replay;

import java.time.Instant;

/**
 * A stretch in which more alarms started than an operator can handle: from the first to the last activation of a
 * run in which every activation lies in some window of less than the rate interval holding more than the flood
 * threshold of them.
 */
public record FloodPeriod(Instant start, Instant end, int activations) {
}
