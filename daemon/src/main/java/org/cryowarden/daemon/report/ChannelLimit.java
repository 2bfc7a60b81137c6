package org.cryowarden.daemon.report;

import java.util.Objects;

/**
 * A rule's setpoint on a channel, drawn on its plot.
 *
 * @param alarmId the rule (and alarm) it belongs to
 * @param value   the setpoint in the channel's unit
 * @param label   words for the plot, e.g. "o2-magnet-hall-low below 19.5"
 */
public record ChannelLimit(String alarmId, double value, String label) {

    public ChannelLimit {
        Objects.requireNonNull(alarmId, "alarmId");
        Objects.requireNonNull(label, "label");
    }
}
