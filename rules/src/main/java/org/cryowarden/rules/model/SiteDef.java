package org.cryowarden.rules.model;

import java.time.ZoneId;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.config.ConfigNode;

/**
 * A whole site file: the lab, its buses and instruments, its channels and outputs.
 *
 * @param name               site name, also the default MQTT prefix segment
 * @param ambientPressurePa  the ambient pressure used for gauge/absolute conversions (standard atmosphere
 *                           unless the site states its own)
 * @param sections           sections interpreted by the daemon (mqtt, journal, api, notifiers), kept as positioned
 *                           nodes so later stages report errors with their position
 * @param timeZone           the lab's time zone, for rules that speak of a local time of day ("refill before
 *                           07:00"); never guessed from the machine
 */
public record SiteDef(
        String name,
        double ambientPressurePa,
        List<BusDef> buses,
        List<ChannelDef> channels,
        List<DerivedChannelDef> derived,
        List<OutputDef> outputs,
        Map<String, ConfigNode.Mapping> sections,
        Optional<ZoneId> timeZone,
        SourcePosition position) {

    public SiteDef {
        Objects.requireNonNull(name, "name");
        buses = List.copyOf(buses);
        channels = List.copyOf(channels);
        derived = List.copyOf(derived);
        outputs = List.copyOf(outputs);
        sections = Map.copyOf(sections);
        Objects.requireNonNull(timeZone, "timeZone");
        Objects.requireNonNull(position, "position");
    }

    /** A site that states no time zone. */
    public SiteDef(String name, double ambientPressurePa, List<BusDef> buses, List<ChannelDef> channels,
            List<DerivedChannelDef> derived, List<OutputDef> outputs, Map<String, ConfigNode.Mapping> sections,
            SourcePosition position) {
        this(name, ambientPressurePa, buses, channels, derived, outputs, sections, Optional.empty(), position);
    }
}
