/**
 * The plugin interface of cryowarden's drivers: what a driver jar implements and what it may rely on.
 *
 * <p>A plugin jar lists its {@link org.cryowarden.drivers.spi.DriverFactory} in
 * {@code META-INF/services/org.cryowarden.drivers.spi.DriverFactory}; the built-in drivers do exactly the same.
 * The daemon's {@code check} calls {@link org.cryowarden.drivers.spi.DriverFactory#validate} for every
 * instrument; at start it calls {@link org.cryowarden.drivers.spi.DriverFactory#create} once per instrument and
 * hands the {@link org.cryowarden.drivers.spi.InstrumentDriver} to the bus poller, which from then on is the only
 * thread that calls it. The poller owns the {@link org.cryowarden.drivers.spi.Transport} and passes it into every
 * call; a driver never opens, reopens or closes it.
 *
 * <p>A misbehaving device is data, not an exception: a driver turns timeouts, corrupt frames and implausible
 * values into BAD or STALE readings with a reason, and counts them. It throws {@link java.io.IOException} only
 * when the transport itself failed (port unplugged, socket closed); the poller then reopens it with backoff.
 */
package org.cryowarden.drivers.spi;
