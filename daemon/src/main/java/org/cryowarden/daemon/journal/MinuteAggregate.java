package org.cryowarden.daemon.journal;

import java.time.Instant;
import java.util.OptionalDouble;

/**
 * One channel over one wall-clock minute: min, mean and max of its GOOD readings, and how many readings there
 * were of each kind. The statistics are empty when no reading of the minute was GOOD.
 */
public record MinuteAggregate(String channel, Instant minute, OptionalDouble min, OptionalDouble mean,
                              OptionalDouble max, long goodCount, long totalCount) {
}
