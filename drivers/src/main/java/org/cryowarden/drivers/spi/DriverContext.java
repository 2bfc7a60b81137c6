package org.cryowarden.drivers.spi;

import java.util.Map;
import java.util.Objects;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.OutputDef;

/**
 * What the host gives a driver besides its own instrument definition: the site's channels and outputs (so the
 * driver can check that its points name real ones and learn their units), and the one clock of the program,
 * whose wall-clock side stamps readings.
 */
public record DriverContext(Map<String, ChannelDef> channels, Map<String, OutputDef> outputs, TimeSource time) {

    public DriverContext {
        channels = Map.copyOf(channels);
        outputs = Map.copyOf(outputs);
        Objects.requireNonNull(time, "time");
    }

    /** The unit of a site channel, or {@link Unit#ONE} for a channel the site does not define. */
    public Unit unitOf(String channel) {
        ChannelDef def = channels.get(channel);
        return def == null ? Unit.ONE : def.unit();
    }
}
