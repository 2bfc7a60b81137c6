package org.cryowarden.simulator.emulators;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
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
 * A multi-channel cryogen level meter, commands of our own in SCPI form:
 * <ul>
 *   <li>{@code MEASure:LEVel? <channel>}: level in % of the probe's active length, NR2 with one decimal;</li>
 *   <li>{@code MEASure:LEVel:RESistance? <channel>}: the probe's measured resistance in ohm, NR3;</li>
 *   <li>{@code SYSTem:CHANnels?}: the number of channels.</li>
 * </ul>
 */
public final class LevelMeter extends ScpiInstrument {

    private final Map<Integer, String> channels;

    /** @param channels channel number to level-sensor id */
    public LevelMeter(String id, Identity identity, Terminator terminator, Map<Integer, String> channels, long seed) {
        super(id, identity, terminator, seed);
        this.channels = new TreeMap<>(channels);
    }

    @Override
    public boolean knows(ScpiCommand command) {
        return command.matches("MEASure:LEVel") || command.matches("MEASure:LEVel:RESistance")
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
        if (command.matches("MEASure:LEVel:RESistance")) {
            return Optional.of(ScpiNumbers.formatNr3(faulted(1000 + channel.getAsInt(), snapshot.raw(sensor), now)));
        }
        double percent = faulted(channel.getAsInt(), snapshot.value(sensor), now);
        return Optional.of(String.format(Locale.ROOT, "%.1f", Math.max(0, Math.min(100, percent))));
    }

    public List<Integer> channelNumbers() {
        return new ArrayList<>(channels.keySet());
    }
}
