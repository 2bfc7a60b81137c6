package org.cryowarden.rules.model;

import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.config.ConfigNode;

/**
 * One device on a bus, handled by the driver plugin whose id is {@code driver}.
 *
 * @param settings instrument-wide settings for the driver (a Modbus unit id, terminators, timeouts)
 * @param points   the channels and outputs it carries
 */
public record InstrumentDef(
        String id, String driver, ConfigNode.Mapping settings, List<PointDef> points, SourcePosition position) {

    public InstrumentDef {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(driver, "driver");
        Objects.requireNonNull(settings, "settings");
        points = List.copyOf(points);
        Objects.requireNonNull(position, "position");
    }
}
