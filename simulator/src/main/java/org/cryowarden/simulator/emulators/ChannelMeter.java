package org.cryowarden.simulator.emulators;

import java.util.ArrayList;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalInt;
import java.util.TreeMap;
import org.cryowarden.drivers.scpi.Identity;
import org.cryowarden.drivers.scpi.ScpiCommand;
import org.cryowarden.drivers.scpi.ScpiNumbers;
import org.cryowarden.drivers.text.Terminator;
import org.cryowarden.simulator.sensors.SensorSnapshot;

/**
 * A SCPI meter whose queries name a channel number: one query for the measured value, one for the sensor's raw
 * resistance in ohm (NR3), and {@code SYSTem:CHANnels?} for the number of channels. Faults address the value of
 * channel {@code n} as {@code n} and its resistance as {@code 1000 + n}.
 */
abstract class ChannelMeter extends ScpiInstrument {

    private final String valueHeader;
    private final String resistanceHeader;
    private final Map<Integer, String> channels;

    /** @param channels channel number to sensor id */
    ChannelMeter(String id, Identity identity, Terminator terminator, Map<Integer, String> channels, long seed,
            String valueHeader, String resistanceHeader) {
        super(id, identity, terminator, seed);
        this.valueHeader = valueHeader;
        this.resistanceHeader = resistanceHeader;
        this.channels = new TreeMap<>(channels);
    }

    /** The answer to the value query for a (possibly faulted) value. */
    abstract String formatValue(double value);

    @Override
    public final boolean knows(ScpiCommand command) {
        return command.matches(valueHeader) || command.matches(resistanceHeader) || command.matches("SYSTem:CHANnels");
    }

    @Override
    protected final Optional<String> execute(ScpiCommand command, SensorSnapshot snapshot) {
        if (!command.query()) {
            queueError(-113, "Undefined header");
            return Optional.empty();
        }
        if (command.matches("SYSTem:CHANnels")) {
            return Optional.of(Integer.toString(channels.size()));
        }
        OptionalInt channel = channelParameter(command, new ArrayList<>(channels.keySet()));
        if (channel.isEmpty()) {
            return Optional.empty();
        }
        String sensor = channels.get(channel.getAsInt());
        double now = snapshot.elapsedSeconds();
        if (command.matches(resistanceHeader)) {
            return Optional.of(ScpiNumbers.formatNr3(faulted(1000 + channel.getAsInt(), snapshot.raw(sensor), now)));
        }
        return Optional.of(formatValue(faulted(channel.getAsInt(), snapshot.value(sensor), now)));
    }
}
