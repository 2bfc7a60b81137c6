package org.cryowarden.drivers.site;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.drivers.poll.Backoff;
import org.cryowarden.drivers.poll.BusPoller;
import org.cryowarden.drivers.poll.PolledInstrument;
import org.cryowarden.drivers.poll.ReadingSink;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.DriverFactory;
import org.cryowarden.drivers.transport.Transports;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.NameMatch;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.model.BusDef;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.OutputDef;
import org.cryowarden.rules.model.PointDef;
import org.cryowarden.rules.model.SiteDef;

/**
 * The drivers' part of a site: {@link #validate} checks every bus transport and every instrument against its
 * driver (what {@code check} and daemon start call), {@link #pollers} builds one {@link BusPoller} per bus for a
 * site that validated. A plugin whose {@code validate} throws is reported as a problem at the instrument, not
 * propagated.
 */
public final class SiteDrivers {

    private SiteDrivers() {
    }

    /** Every driver-related problem of the site, in file order of the buses. */
    public static List<ConfigProblem> validate(SiteDef site, DriverCatalog catalog, TimeSource time) {
        DriverContext context = context(site, time);
        List<ConfigProblem> problems = new ArrayList<>();
        for (BusDef bus : site.buses()) {
            problems.addAll(Transports.validate(bus.transport()));
            for (InstrumentDef instrument : bus.instruments()) {
                Optional<DriverFactory> factory = catalog.find(instrument.driver());
                if (factory.isEmpty()) {
                    problems.add(new ConfigProblem(instrument.position(), "instrument '" + instrument.id()
                            + "' uses driver '" + instrument.driver() + "', which is not installed"
                            + NameMatch.closest(instrument.driver(), catalog.ids())
                                    .map(id -> "; did you mean '" + id + "'?").orElse("")
                            + "; installed: " + String.join(", ", catalog.ids()) + " (see cryowarden plugins)"));
                    continue;
                }
                try {
                    problems.addAll(factory.get().validate(instrument, context));
                } catch (RuntimeException | LinkageError e) {
                    problems.add(new ConfigProblem(instrument.position(), "driver '" + instrument.driver()
                            + "' failed to check instrument '" + instrument.id() + "': " + e));
                }
            }
        }
        return problems;
    }

    /**
     * One unstarted poller per bus, its transport unopened, reopening with the default backoff. The caller starts
     * them ({@link BusPoller#start()}) and closes them at shutdown.
     *
     * @throws IllegalArgumentException when the site does not {@link #validate}
     */
    public static List<BusPoller> pollers(SiteDef site, DriverCatalog catalog, TimeSource time, ReadingSink sink) {
        return pollers(site, catalog, time, sink, Backoff.DEFAULT);
    }

    /** As {@link #pollers(SiteDef, DriverCatalog, TimeSource, ReadingSink)}, with a stated reopen backoff. */
    public static List<BusPoller> pollers(SiteDef site, DriverCatalog catalog, TimeSource time, ReadingSink sink,
            Backoff backoff) {
        List<ConfigProblem> problems = validate(site, catalog, time);
        if (!problems.isEmpty()) {
            throw new IllegalArgumentException("site does not validate: " + problems);
        }
        DriverContext context = context(site, time);
        List<BusPoller> pollers = new ArrayList<>();
        for (BusDef bus : site.buses()) {
            pollers.add(poller(bus, context, catalog, time, sink, backoff));
        }
        return pollers;
    }

    /**
     * One unstarted poller for one bus of a site that validated (a reload restarts only the buses that changed).
     *
     * @param context the site's {@link #context(SiteDef, TimeSource)}
     */
    public static BusPoller poller(BusDef bus, DriverContext context, DriverCatalog catalog, TimeSource time,
            ReadingSink sink, Backoff backoff) {
        List<PolledInstrument> instruments = new ArrayList<>();
        for (InstrumentDef instrument : bus.instruments()) {
            List<ChannelDef> channels = new ArrayList<>();
            List<String> outputs = new ArrayList<>();
            for (PointDef point : instrument.points()) {
                if (point.output()) {
                    outputs.add(point.channel());
                } else {
                    channels.add(context.channels().get(point.channel()));
                }
            }
            DriverFactory factory = catalog.find(instrument.driver()).orElseThrow();
            instruments.add(new PolledInstrument(factory.create(instrument, context), channels, outputs));
        }
        return new BusPoller(bus.id(), Transports.create(bus.transport()), instruments, time, sink, backoff);
    }

    /** The drivers' view of the site: its channels and outputs by id, and the program's clock. */
    public static DriverContext context(SiteDef site, TimeSource time) {
        Map<String, ChannelDef> channels = new LinkedHashMap<>();
        site.channels().forEach(channel -> channels.put(channel.id(), channel));
        Map<String, OutputDef> outputs = new LinkedHashMap<>();
        site.outputs().forEach(output -> outputs.put(output.id(), output));
        return new DriverContext(channels, outputs, time);
    }
}
