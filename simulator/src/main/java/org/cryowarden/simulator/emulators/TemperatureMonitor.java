package org.cryowarden.simulator.emulators;

import java.util.Map;
import org.cryowarden.drivers.scpi.Identity;
import org.cryowarden.drivers.scpi.ScpiNumbers;
import org.cryowarden.drivers.text.Terminator;

/**
 * A multi-channel cryogenic temperature monitor, commands of our own in SCPI form:
 * <ul>
 *   <li>{@code MEASure:TEMPerature? <channel>}: temperature in K through the channel's calibration, NR3;</li>
 *   <li>{@code MEASure:RESistance? <channel>}: the sensor's resistance in ohm, NR3;</li>
 *   <li>{@code SYSTem:CHANnels?}: the number of channels.</li>
 * </ul>
 */
public final class TemperatureMonitor extends ChannelMeter {

    /** @param channels channel number to thermometer sensor id */
    public TemperatureMonitor(String id, Identity identity, Terminator terminator, Map<Integer, String> channels,
            long seed) {
        super(id, identity, terminator, channels, seed, "MEASure:TEMPerature", "MEASure:RESistance");
    }

    @Override
    String formatValue(double kelvin) {
        return ScpiNumbers.formatNr3(kelvin);
    }
}
