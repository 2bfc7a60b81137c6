package org.cryowarden.drivers.poll;

import java.util.List;
import java.util.Objects;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.rules.model.ChannelDef;

/**
 * One instrument as its bus poller sees it: the driver, the channels it polls (each on its own period) and the
 * ids of the outputs it drives.
 */
public record PolledInstrument(InstrumentDriver driver, List<ChannelDef> channels, List<String> outputs) {

    public PolledInstrument {
        Objects.requireNonNull(driver, "driver");
        channels = List.copyOf(channels);
        outputs = List.copyOf(outputs);
    }
}
