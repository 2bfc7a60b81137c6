package org.cryowarden.rules.config;

import java.util.List;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.model.BusDef;

/**
 * The hook through which the drivers module checks what the site loader deliberately leaves uninterpreted: a
 * bus's transport settings, each instrument's driver id and settings, and the {@code point} of every channel and
 * output. The loader has already checked the structure around them; every {@link org.cryowarden.rules.config.ConfigNode}
 * handed over keeps its position, so problems come back as {@code FILE:LINE:COLUMN: message} like any other.
 *
 * <p>Called once per bus, after the whole site file has been read, on the caller's thread; never with a bus
 * whose structure failed to load.
 */
@FunctionalInterface
public interface DriverSettingsValidator {

    /** Every problem with the driver-specific parts of {@code bus}; empty when they are all valid. */
    List<ConfigProblem> validate(BusDef bus);

    /** Accepts every driver setting: for loading without the drivers module (the rules module's own tests). */
    static DriverSettingsValidator acceptAll() {
        return bus -> List.of();
    }
}
