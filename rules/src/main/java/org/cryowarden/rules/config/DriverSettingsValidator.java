package org.cryowarden.rules.config;

import java.util.List;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.model.SiteDef;

/**
 * The hook through which the drivers module checks what the site loader deliberately leaves uninterpreted: a
 * bus's transport settings, each instrument's driver id and settings, and the {@code point} of every channel and
 * output. The loader has already checked the structure around them; every {@link org.cryowarden.rules.config.ConfigNode}
 * handed over keeps its position, so problems come back as {@code FILE:LINE:COLUMN: message} like any other.
 *
 * <p>Called once, after the whole site file has been read, on the caller's thread; never with a site whose
 * structure failed to load.
 */
@FunctionalInterface
public interface DriverSettingsValidator {

    /**
     * Every problem with the driver-specific parts of the site (bus transports, instrument settings, points), in
     * file order; empty when they are all valid. Called once per site file whose structure loaded.
     */
    List<ConfigProblem> validate(SiteDef site);

    /** Accepts every driver setting: for loading without the drivers module (the rules module's own tests). */
    static DriverSettingsValidator acceptAll() {
        return site -> List.of();
    }
}
