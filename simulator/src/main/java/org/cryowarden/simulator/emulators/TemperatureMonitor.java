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
 * A multi-channel cryogenic temperature monitor, commands of our own in SCPI form:
 * <ul>
 *   <li>{@code MEASure:TEMPerature? <channel>}: temperature in K through the channel's calibration, NR3;</li>
 *   <li>{@code MEASure:RESistance? <channel>}: the sensor's resistance in ohm, NR3;</li>
 *   <li>{@code SYSTem:CHANnels?}: the number of channels.</li>
 * </ul>
 */
public final class TemperatureMonitor extends ScpiInstrument {

    private final Map<Integer, String> channels;

    /** @param channels channel number to thermometer sensor id */
    public TemperatureMonitor(String id, Identity identity, Terminator terminator, Map<Integer, String> channels,
            long seed) {
        super(id, identity, terminator, seed);
        this.channels = new TreeMap<>(channels);
    }

    @Override
    public boolean knows(ScpiCommand command) {
        return command.matches("MEASure:TEMPerature") || command.matches("MEASure:RESistance")
                || command.matches("SYSTem:CHANnels");
    }

    @Override
    protected Optional<String> execute(ScpiCommand command, SensorSnapshot snapshot) {
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
        if (command.matches("MEASure:RESistance")) {
            return Optional.of(ScpiNumbers.formatNr3(faulted(1000 + channel.getAsInt(), snapshot.raw(sensor), now)));
        }
        return Optional.of(ScpiNumbers.formatNr3(faulted(channel.getAsInt(), snapshot.value(sensor), now)));
    }
}
