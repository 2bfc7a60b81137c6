package org.cryowarden.rules.model;

import java.util.Objects;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.config.ConfigNode;

/**
 * How a bus reaches its devices: {@code serial} (a port path and line settings) or {@code tcp} (a serial device
 * server). The settings stay a positioned node tree; the drivers module validates them.
 */
public record TransportDef(String kind, ConfigNode.Mapping settings, SourcePosition position) {

    public TransportDef {
        Objects.requireNonNull(kind, "kind");
        Objects.requireNonNull(settings, "settings");
        Objects.requireNonNull(position, "position");
    }
}
