package org.cryowarden.drivers.spi;

import java.util.List;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.model.InstrumentDef;

/**
 * The entry point of a driver plugin, found with {@link java.util.ServiceLoader}: it names the driver, checks an
 * instrument's settings and creates the driver for it. Implementations need a public no-argument constructor,
 * keep no mutable state, and may be called from any thread.
 *
 * <p>Host order: {@link #validate} for every instrument of the site (by {@code check}, and at daemon start, which
 * refuses to start on problems), then {@link #create} once per instrument, only for instruments that validated.
 */
public interface DriverFactory {

    /** The name site files use in {@code driver:}, lower case with dashes: "modbus-rtu". Unique over all plugins. */
    String id();

    /** The plugin's own version, listed by {@code cryowarden plugins}. */
    String version();

    /** One line for {@code cryowarden plugins}. */
    String description();

    /**
     * Every problem with the instrument's {@code settings} and each point's {@code settings}, each positioned at
     * the offending key or value and saying what was found and what was expected; empty when the instrument can
     * be created. Also reports points naming channels or outputs missing from {@code context}.
     */
    List<ConfigProblem> validate(InstrumentDef instrument, DriverContext context);

    /**
     * The driver for one validated instrument. Called once per instrument at daemon start; does no I/O (the
     * poller calls {@link InstrumentDriver#connect} once the transport is open).
     *
     * @throws IllegalArgumentException if {@code instrument} did not validate (a host programming error)
     */
    InstrumentDriver create(InstrumentDef instrument, DriverContext context);
}
