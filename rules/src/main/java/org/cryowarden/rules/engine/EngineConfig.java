package org.cryowarden.rules.engine;

import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.OutputDef;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.SiteDef;

/**
 * What an {@link Engine} is built from.
 *
 * @param ambientPressurePa the site's ambient pressure, used to convert gauge and absolute setpoints
 */
public record EngineConfig(
        List<ChannelDef> channels,
        List<DerivedChannelDef> derived,
        List<OutputDef> outputs,
        RuleSet ruleSet,
        double ambientPressurePa) {

    public EngineConfig {
        channels = List.copyOf(channels);
        derived = List.copyOf(derived);
        outputs = List.copyOf(outputs);
        Objects.requireNonNull(ruleSet, "ruleSet");
    }

    /** The channels, derived channels, outputs and ambient pressure of a site, with its rule sets merged. */
    public static EngineConfig of(SiteDef site, RuleSet ruleSet) {
        return new EngineConfig(site.channels(), site.derived(), site.outputs(), ruleSet, site.ambientPressurePa());
    }
}
