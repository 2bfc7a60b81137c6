package org.cryowarden.daemon.run;

import java.nio.file.Path;
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
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.drivers.transport.Transports;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.rules.config.ConfigurationLoader;
import org.cryowarden.rules.model.BusDef;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.OutputDef;
import org.cryowarden.rules.model.PointDef;
import org.cryowarden.rules.model.SiteDef;

/**
 * Loads a site and its rule sets as {@code run} needs them: {@link ConfigurationLoader} with the transports and
 * driver ids checked per bus, then every instrument's settings checked by its driver plugin against the site's
 * channels and outputs. Problems come back together as one {@link ConfigException}.
 */
public final class SiteSetup {

    private SiteSetup() {
    }

    /** Loads and checks everything; the drivers come from {@code catalog}. */
    public static Configuration load(Path site, List<Path> rules, DriverCatalog catalog, TimeSource time)
            throws ConfigException {
        Configuration configuration = ConfigurationLoader.load(site, rules, bus -> busProblems(bus, catalog));
        List<ConfigProblem> problems = new ArrayList<>();
        DriverContext context = context(configuration.site(), time);
        for (BusDef bus : configuration.site().buses()) {
            for (InstrumentDef instrument : bus.instruments()) {
                catalog.find(instrument.driver()).ifPresent(factory ->
                        problems.addAll(factory.validate(instrument, context)));
            }
        }
        if (!problems.isEmpty()) {
            throw new ConfigException(problems);
        }
        return configuration;
    }

    static List<ConfigProblem> busProblems(BusDef bus, DriverCatalog catalog) {
        List<ConfigProblem> problems = new ArrayList<>(Transports.validate(bus.transport()));
        for (InstrumentDef instrument : bus.instruments()) {
            if (catalog.find(instrument.driver()).isEmpty()) {
                problems.add(new ConfigProblem(instrument.position(), "instrument '" + instrument.id()
                        + "' names driver '" + instrument.driver() + "', which is not installed; installed: "
                        + String.join(", ", catalog.ids())));
            }
        }
        return problems;
    }

    /** The drivers' view of the site: its channels and outputs by id, and the program's clock. */
    public static DriverContext context(SiteDef site, TimeSource time) {
        Map<String, ChannelDef> channels = new LinkedHashMap<>();
        for (ChannelDef channel : site.channels()) {
            channels.put(channel.id(), channel);
        }
        Map<String, OutputDef> outputs = new LinkedHashMap<>();
        for (OutputDef output : site.outputs()) {
            outputs.put(output.id(), output);
        }
        return new DriverContext(channels, outputs, time);
    }

    /** One unstarted poller per bus, each with its transport and the drivers of its instruments. */
    public static List<BusPoller> pollers(SiteDef site, DriverCatalog catalog, TimeSource time, ReadingSink sink,
            Backoff backoff) {
        DriverContext context = context(site, time);
        List<BusPoller> pollers = new ArrayList<>();
        for (BusDef bus : site.buses()) {
            pollers.add(poller(bus, context, catalog, time, sink, backoff));
        }
        return pollers;
    }

    static BusPoller poller(BusDef bus, DriverContext context, DriverCatalog catalog, TimeSource time,
            ReadingSink sink, Backoff backoff) {
        Transport transport = Transports.create(bus.transport());
        List<PolledInstrument> instruments = new ArrayList<>();
        for (InstrumentDef instrument : bus.instruments()) {
            Optional<DriverFactory> factory = catalog.find(instrument.driver());
            List<ChannelDef> channels = new ArrayList<>();
            List<String> outputs = new ArrayList<>();
            for (PointDef point : instrument.points()) {
                if (point.output()) {
                    outputs.add(point.channel());
                } else {
                    channels.add(context.channels().get(point.channel()));
                }
            }
            instruments.add(new PolledInstrument(factory.orElseThrow().create(instrument, context), channels,
                    outputs));
        }
        return new BusPoller(bus.id(), transport, instruments, time, sink, backoff);
    }
}
