package org.cryowarden.daemon.report;

import java.time.Duration;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * What the report knows of one channel: from the site file when one was given, otherwise only its id.
 *
 * @param unit        the unit symbol, empty without a site file
 * @param description what and where, empty without a site file
 * @param period      the poll period of a measured channel; empty for a derived channel or without a site file
 * @param limits      setpoints of the rules on this channel, in the channel's unit
 * @param alarms      ids of the alarms whose rules read this channel
 */
public record ChannelInfo(String id, String unit, String description, Optional<Duration> period,
                          List<ChannelLimit> limits, List<String> alarms) {

    public ChannelInfo {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(description, "description");
        Objects.requireNonNull(period, "period");
        limits = List.copyOf(limits);
        alarms = List.copyOf(alarms);
    }

    /** A channel known only by its id (a report from a journal alone). */
    static ChannelInfo bare(String id) {
        return new ChannelInfo(id, "", "", Optional.empty(), List.of(), List.of());
    }
}
