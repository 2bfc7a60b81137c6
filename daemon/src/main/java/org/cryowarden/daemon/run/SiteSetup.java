package org.cryowarden.daemon.run;

import java.nio.file.Path;
import java.util.List;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.drivers.site.SiteDrivers;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.rules.config.ConfigurationLoader;

/**
 * Loads a site and its rule sets as {@code run} needs them: {@link ConfigurationLoader} with every transport,
 * driver id and instrument setting checked by the installed drivers ({@link SiteDrivers#validate}), exactly as
 * {@code check} does. Problems come back together as one {@link ConfigException}.
 */
public final class SiteSetup {

    private SiteSetup() {
    }

    /** Loads and checks everything; the drivers come from {@code catalog}. */
    public static Configuration load(Path site, List<Path> rules, DriverCatalog catalog, TimeSource time)
            throws ConfigException {
        return ConfigurationLoader.load(site, rules, parsed -> SiteDrivers.validate(parsed, catalog, time));
    }
}
