package org.cryowarden.drivers.site;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.drivers.poll.BusPoller;
import org.cryowarden.drivers.testing.Sites;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.model.BusDef;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.SiteDef;
import org.cryowarden.rules.model.TransportDef;
import org.junit.jupiter.api.Test;

class SiteDriversTest {

    private final VirtualTimeSource time = new VirtualTimeSource(Instant.parse("2026-04-01T00:00:00Z"));
    private final DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.empty());
    private final ChannelDef o2 = Sites.channel("o2-magnet-hall", Unit.PERCENT_VOLUME, Duration.ofSeconds(2));

    @Test
    void validSiteGivesOnePollerPerBus() {
        SiteDef site = site(new TransportDef("tcp", Sites.mapping("kind", "tcp", "host", "10.20.0.7", "port", "4001"),
                SourcePosition.NONE), "modbus-rtu");

        assertThat(SiteDrivers.validate(site, catalog, time)).isEmpty();
        List<BusPoller> pollers = SiteDrivers.pollers(site, catalog, time, reading -> { });
        assertThat(pollers).extracting(BusPoller::busId).containsExactly("hall-rs485");
    }

    @Test
    void unknownDriverAndBadTransportAreReported() {
        SiteDef site = site(new TransportDef("serial", Sites.mapping("kind", "serial", "port", "/dev/ttyUSB0",
                "parity", "mark", "flow_control", "rts"), SourcePosition.NONE), "modbus-tcp");

        assertThat(SiteDrivers.validate(site, catalog, time)).extracting(ConfigProblem::message).containsExactly(
                "parity in serial transport must be one of even, none, odd, got 'mark'",
                "flow_control in serial transport must be one of none, rts-cts, xon-xoff, got 'rts'",
                "instrument 'o2-transmitters' uses driver 'modbus-tcp', which is not installed; installed: "
                        + "modbus-rtu, scpi, line (see cryowarden plugins)");
    }

    @Test
    void tcpTransportNeedsHostAndPort() {
        SiteDef site = site(new TransportDef("tcp", Sites.mapping("kind", "tcp", "hots", "10.20.0.7",
                "connect_timeout", "2 fortnights"), SourcePosition.NONE), "modbus-rtu");

        assertThat(SiteDrivers.validate(site, catalog, time)).extracting(ConfigProblem::message).containsExactly(
                "unknown key 'hots' in tcp transport; did you mean 'host'?",
                "missing key 'host' in tcp transport",
                "missing key 'port' in tcp transport",
                "connect_timeout in tcp transport: '2 fortnights' is not a duration: expected a number and one of "
                        + "ms, s, min, h, d, e.g. 30s, 5min, 2h or 1h30min");
    }

    private SiteDef site(TransportDef transport, String driver) {
        InstrumentDef instrument = Sites.instrument("o2-transmitters", driver, Sites.mapping("unit", "2"),
                Sites.point("o2-magnet-hall", Sites.mapping("table", "input", "address", "0")));
        BusDef bus = new BusDef("hall-rs485", transport, List.of(instrument), SourcePosition.NONE);
        return new SiteDef("test lab", 101_325, List.of(bus), List.of(o2), List.of(), List.of(), Map.of(),
                SourcePosition.NONE);
    }
}
