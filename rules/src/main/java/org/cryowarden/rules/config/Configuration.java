package org.cryowarden.rules.config;

import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.model.RuleSet;
import org.cryowarden.rules.model.SiteDef;

/**
 * A site and its rule sets, loaded and checked together: every reference between them resolves, units agree
 * and limits are in order. What the daemon and the engine are built from.
 *
 * @param siteFile  the site file as named by the user
 * @param ruleFiles the rule-set files as named by the user, in order
 */
public record Configuration(SiteDef site, RuleSet rules, String siteFile, List<String> ruleFiles) {

    public Configuration {
        Objects.requireNonNull(site, "site");
        Objects.requireNonNull(rules, "rules");
        Objects.requireNonNull(siteFile, "siteFile");
        ruleFiles = List.copyOf(ruleFiles);
    }

    /** Measured and derived channels. */
    public int channelCount() {
        return site.channels().size() + site.derived().size();
    }

    public int instrumentCount() {
        return site.buses().stream().mapToInt(bus -> bus.instruments().size()).sum();
    }
}
