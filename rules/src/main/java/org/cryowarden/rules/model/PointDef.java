package org.cryowarden.rules.model;

import java.util.Objects;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.config.ConfigNode;

/**
 * Binds a channel (or an output, when {@code output} is true) to an address inside one instrument: a register,
 * a query, a pattern. The settings are the driver's to validate.
 */
public record PointDef(String channel, boolean output, ConfigNode.Mapping settings, SourcePosition position) {

    public PointDef {
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(settings, "settings");
        Objects.requireNonNull(position, "position");
    }
}
