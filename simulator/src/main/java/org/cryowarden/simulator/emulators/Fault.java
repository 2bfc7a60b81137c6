package org.cryowarden.simulator.emulators;

import java.time.Duration;
import java.util.Objects;
import java.util.OptionalInt;

/**
 * One scripted fault of an instrument.
 *
 * @param amount  for {@link FaultKind#DRIFT} the rate in the channel's unit per hour, for {@link FaultKind#NOISE}
 *                the standard deviation in the channel's unit; unused otherwise
 * @param delay   for {@link FaultKind#SLOW}, how late each reply is (real time, since the master's timeout is)
 * @param channel the channel (input address, SCPI channel number) it affects; empty for all
 * @param since   when it began, seconds since the start of the scenario
 */
public record Fault(FaultKind kind, double amount, Duration delay, OptionalInt channel, double since) {

    public Fault {
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(delay, "delay");
        Objects.requireNonNull(channel, "channel");
    }

    boolean appliesTo(int channelNumber) {
        return channel.isEmpty() || channel.getAsInt() == channelNumber;
    }
}
