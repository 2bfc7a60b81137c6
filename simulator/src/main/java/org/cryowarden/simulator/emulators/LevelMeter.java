package org.cryowarden.simulator.emulators;

import java.util.Locale;
import java.util.Map;
import org.cryowarden.drivers.scpi.Identity;
import org.cryowarden.drivers.text.Terminator;

/**
 * A multi-channel cryogen level meter, commands of our own in SCPI form:
 * <ul>
 *   <li>{@code MEASure:LEVel? <channel>}: level in % of the probe's active length, NR2 with one decimal;</li>
 *   <li>{@code MEASure:LEVel:RESistance? <channel>}: the probe's measured resistance in ohm, NR3;</li>
 *   <li>{@code SYSTem:CHANnels?}: the number of channels.</li>
 * </ul>
 */
public final class LevelMeter extends ChannelMeter {

    /** @param channels channel number to level-sensor id */
    public LevelMeter(String id, Identity identity, Terminator terminator, Map<Integer, String> channels, long seed) {
        super(id, identity, terminator, channels, seed, "MEASure:LEVel", "MEASure:LEVel:RESistance");
    }

    @Override
    String formatValue(double percent) {
        return String.format(Locale.ROOT, "%.1f", Math.max(0, Math.min(100, percent)));
    }
}
