package org.cryowarden.rules.engine;

import java.time.ZoneId;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.OutputDef;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.SiteDef;

/**
 * What an {@link Engine} is built from.
 *
 * @param ambientPressurePa the site's ambient pressure, used to convert gauge and absolute setpoints
 * @param timeZone          the site's time zone, for forecast rules with a local time of day that name none
 */
public record EngineConfig(
        List<ChannelDef> channels,
        List<DerivedChannelDef> derived,
        List<OutputDef> outputs,
        RuleSet ruleSet,
        double ambientPressurePa,
        Optional<ZoneId> timeZone) {

    public EngineConfig {
        channels = List.copyOf(channels);
        derived = List.copyOf(derived);
        outputs = List.copyOf(outputs);
        Objects.requireNonNull(ruleSet, "ruleSet");
        Objects.requireNonNull(timeZone, "timeZone");
    }

    /** A configuration without a site time zone. */
    public EngineConfig(List<ChannelDef> channels, List<DerivedChannelDef> derived, List<OutputDef> outputs,
            RuleSet ruleSet, double ambientPressurePa) {
        this(channels, derived, outputs, ruleSet, ambientPressurePa, Optional.empty());
    }

    /** The channels, derived channels, outputs and ambient pressure of a site, with its rule sets merged. */
    public static EngineConfig of(SiteDef site, RuleSet ruleSet) {
        return new EngineConfig(site.channels(), site.derived(), site.outputs(), ruleSet, site.ambientPressurePa(),
                site.timeZone());
    }
}
