package org.cryowarden.drivers.builtin;

import java.util.List;
import java.util.Optional;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.PointDef;

/** Checks that a point names a channel (or output) the site defines. */
final class PointTargets {

    private PointTargets() {
    }

    static Optional<ChannelDef> channel(PointDef point, InstrumentDef instrument, DriverContext context,
            List<ConfigProblem> problems) {
        ChannelDef channel = context.channels().get(point.channel());
        if (channel == null) {
            problems.add(new ConfigProblem(point.position(), "instrument '" + instrument.id() + "' maps channel '"
                    + point.channel() + "', which the site does not define"));
        }
        return Optional.ofNullable(channel);
    }

    static boolean output(PointDef point, InstrumentDef instrument, DriverContext context,
            List<ConfigProblem> problems) {
        if (!context.outputs().containsKey(point.channel())) {
            problems.add(new ConfigProblem(point.position(), "instrument '" + instrument.id() + "' maps output '"
                    + point.channel() + "', which the site does not define"));
            return false;
        }
        return true;
    }
}
