package org.cryowarden.daemon.replay;

import java.time.Duration;
import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.model.Priority;

/**
 * What one alarm did over the analysed period.
 *
 * @param activations every activation, by start
 * @param totalActive time spent active (open activations counted to the end of the period)
 * @param chattering  whether it had at least the chatter count of activations within the chatter window
 * @param fleeting    how many of its (ended) activations were shorter than the fleeting threshold
 */
public record AlarmStatistics(
        String alarmId, Priority priority, List<AlarmActivation> activations, Duration totalActive,
        boolean chattering, int fleeting) {

    public AlarmStatistics {
        Objects.requireNonNull(alarmId, "alarmId");
        Objects.requireNonNull(priority, "priority");
        activations = List.copyOf(activations);
        Objects.requireNonNull(totalActive, "totalActive");
    }

    public int activationCount() {
        return activations.size();
    }
}
