package org.cryowarden.drivers.poll;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalInt;
import org.cryowarden.drivers.builtin.ModbusRtuDriverFactory;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.drivers.spi.WriteResult;
import org.cryowarden.drivers.testing.ModbusTestDevice;
import org.cryowarden.drivers.testing.ScriptedTransport;
import org.cryowarden.drivers.testing.Sites;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.junit.jupiter.api.Test;

class BusPollerTest {

    private final VirtualTimeSource time = new VirtualTimeSource(Instant.parse("2026-01-10T22:00:00Z"));
    private final List<Reading> readings = new ArrayList<>();
    private final ChannelDef fast = Sites.channel("he-level", Unit.PERCENT, Duration.ofSeconds(1));
    private final ChannelDef slow = Sites.channel("bath-pressure", Unit.MILLIBAR, Duration.ofSeconds(3));
    private final ModbusTestDevice device = new ModbusTestDevice(3).holding(100, 425).holding(200, 1013);
    private final ScriptedTransport transport = new ScriptedTransport(device, OptionalInt.of(115200));

    @Test
    void eachChannelIsPolledOnItsOwnPeriod() {
        BusPoller poller = modbusPoller();

        for (int second = 0; second <= 6; second++) {
            poller.runDue();
            time.advance(Duration.ofSeconds(1));
        }

        assertThat(readings.stream().filter(r -> r.channel().equals("he-level")).count()).isEqualTo(7);
        assertThat(readings.stream().filter(r -> r.channel().equals("bath-pressure")).count()).isEqualTo(3);
        assertThat(readings).allMatch(r -> r.quality() == Quality.GOOD);
        assertThat(readings.get(0).value()).isCloseTo(42.5, org.assertj.core.api.Assertions.within(1e-9)); // 425 * 0.1
        assertThat(readings.get(0).timestamp()).isEqualTo(Instant.parse("2026-01-10T22:00:00Z"));
    }

    @Test
    void runDueReturnsWhenTheNextChannelIsDue() {
        BusPoller poller = modbusPoller();

        long next = poller.runDue();

        assertThat(next - time.monotonicNanos()).isEqualTo(Duration.ofSeconds(1).toNanos());
    }

    @Test
    void lostTransportMakesChannelsStaleWithTheReasonAndIsReopenedWithBackoff() {
        BusPoller poller = modbusPoller();
        poller.runDue();
        readings.clear();
        transport.unplug("serial port /dev/ttyUSB3 stopped working (unplugged? read error 5)");
        transport.refuseReopen("serial port /dev/ttyUSB3 does not exist; check the path and that the adapter is plugged in");

        time.advance(Duration.ofSeconds(1));
        poller.runDue();

        assertThat(readings).singleElement().satisfies(r -> {
            assertThat(r.quality()).isEqualTo(Quality.STALE);
            assertThat(r.reason()).isEqualTo("bus 'cryostat-hall' down: serial port /dev/ttyUSB3 stopped working "
                    + "(unplugged? read error 5)");
        });
        readings.clear();
        int reopensBefore = transport.reopens();
        // Reopen attempts: at once, then after 1 s, 2 s, 4 s (Backoff.DEFAULT doubling from 1 s).
        List<Long> attemptSeconds = new ArrayList<>();
        for (int second = 1; second <= 8; second++) {
            time.advance(Duration.ofSeconds(1));
            int before = transport.reopens();
            poller.runDue();
            if (transport.reopens() > before) {
                attemptSeconds.add((long) second);
            }
        }
        assertThat(transport.reopens() - reopensBefore).isEqualTo(4);
        assertThat(attemptSeconds).containsExactly(1L, 2L, 4L, 8L);
        assertThat(readings).allMatch(r -> r.quality() == Quality.STALE);
        assertThat(readings.get(readings.size() - 1).reason()).startsWith("bus 'cryostat-hall' down: serial port "
                + "/dev/ttyUSB3 does not exist; check the path and that the adapter is plugged in; next reopen attempt in");

        transport.allowReopen();
        readings.clear();
        time.advance(Duration.ofSeconds(8));
        poller.runDue();

        assertThat(readings).isNotEmpty().allMatch(r -> r.quality() == Quality.GOOD);
        assertThat(poller.counters()).containsEntry("transport_failures", 1L).containsEntry("reopen_failures", 4L);
    }

    @Test
    void driverThatThrowsGivesBadReadingsAndThePollerCarriesOn() {
        InstrumentDriver broken = new FakeDriver() {
            @Override
            public List<Reading> poll(List<String> channels, Transport t) {
                throw new IllegalStateException("bug in plugin");
            }
        };
        BusPoller poller = new BusPoller("b", transport, List.of(new PolledInstrument(broken, List.of(fast),
                List.of())), time, readings::add, Backoff.DEFAULT);

        poller.runDue();
        time.advance(Duration.ofSeconds(1));
        poller.runDue();

        assertThat(readings).hasSize(2).allSatisfy(r -> {
            assertThat(r.quality()).isEqualTo(Quality.BAD);
            assertThat(r.reason()).isEqualTo("driver of instrument 'fake' failed: java.lang.IllegalStateException: "
                    + "bug in plugin");
        });
        assertThat(poller.counters()).containsEntry("driver_errors", 2L);
    }

    @Test
    void channelTheDriverForgotIsReportedBad() {
        InstrumentDriver forgetful = new FakeDriver() {
            @Override
            public List<Reading> poll(List<String> channels, Transport t) {
                return List.of();
            }
        };
        BusPoller poller = new BusPoller("b", transport, List.of(new PolledInstrument(forgetful, List.of(fast),
                List.of())), time, readings::add, Backoff.DEFAULT);

        poller.runDue();

        assertThat(readings).singleElement().extracting(Reading::reason)
                .isEqualTo("driver of instrument 'fake' returned no reading");
    }

    @Test
    void failingSinkIsCountedAndTheOtherReadingsStillArrive() {
        BusPoller poller = new BusPoller("b", transport, List.of(modbusInstrument()), time, reading -> {
            if (reading.channel().equals("he-level")) {
                throw new IllegalStateException("queue full");
            }
            readings.add(reading);
        }, Backoff.DEFAULT);

        poller.runDue();

        assertThat(readings).extracting(Reading::channel).containsExactly("bath-pressure");
        assertThat(poller.counters()).containsEntry("sink_errors", 1L);
    }

    @Test
    void queuedWriteRunsOnTheNextRoundWithReadback() throws Exception {
        BusPoller poller = modbusPoller();

        var result = poller.write("vent-valve", 1);
        poller.runDue();

        assertThat(result.get()).isEqualTo(WriteResult.confirmed("vent-valve", 1, java.util.OptionalDouble.of(1)));
        assertThat(device.coilValue(5)).isEqualTo(1);
        assertThat(poller.write("no-such-output", 1).get().reason())
                .isEqualTo("no instrument on bus 'cryostat-hall' drives output 'no-such-output'");
    }

    @Test
    void readingDecodedBeforeATransportFailureArrivesAtOnceAndOnlyTheRestTurnStale() {
        int[] deliveredBeforeFailure = new int[1];
        InstrumentDriver halfRound = new FakeDriver() {
            @Override
            public void poll(List<String> channels, Transport transport, java.util.function.Consumer<Reading> each)
                    throws IOException {
                each.accept(Reading.good(channels.get(0), 42.5, Unit.PERCENT, time.wallNow()));
                deliveredBeforeFailure[0] = readings.size();
                throw new IOException("read error 5");
            }
        };
        BusPoller poller = new BusPoller("b", transport, List.of(new PolledInstrument(halfRound,
                List.of(fast, slow), List.of())), time, readings::add, Backoff.DEFAULT);

        poller.runDue();

        assertThat(deliveredBeforeFailure[0]).isEqualTo(1);
        assertThat(readings).extracting(Reading::channel, Reading::quality).containsExactly(
                org.assertj.core.groups.Tuple.tuple("he-level", Quality.GOOD),
                org.assertj.core.groups.Tuple.tuple("bath-pressure", Quality.STALE));
        assertThat(readings.get(1).reason()).isEqualTo("bus 'b' down: read error 5");
    }

    @Test
    void realTimePollingSpreadsTheInstrumentsOverTheirPeriod() {
        BusPoller poller = spreadPoller(4);
        List<Long> firstPolls = firstPollMillis(poller, 4, Duration.ofSeconds(2));

        // four instruments on a 1 s period: one every 250 ms, the first at once (the phases divide the period evenly)
        assertThat(firstPolls).containsExactly(0L, 250L, 500L, 750L);
        assertThat(readings.stream().filter(r -> r.channel().equals("meter-0")).count()).isEqualTo(2);
    }

    @Test
    void phasesStayAtLeastTwentyMillisecondsApartWithManyInstruments() {
        BusPoller poller = spreadPoller(100);
        List<Long> firstPolls = firstPollMillis(poller, 100, Duration.ofSeconds(2));

        // 1 s / 20 ms = 50 phases for 100 instruments: two to a phase, the phases 20 ms apart
        assertThat(firstPolls).hasSize(100);
        assertThat(firstPolls.subList(0, 4)).containsExactly(0L, 0L, 20L, 20L);
        assertThat(firstPolls.get(99)).isEqualTo(980L);
        assertThat(firstPolls.stream().distinct().count()).isEqualTo(50);
    }

    @Test
    void theGateIsAskedBeforeEachInstrumentsTransaction() {
        List<String> order = new ArrayList<>();
        List<PolledInstrument> meters = List.of(counting("meter-0", Duration.ofSeconds(1)),
                counting("meter-1", Duration.ofSeconds(1)), counting("meter-2", Duration.ofSeconds(1)));
        BusPoller poller = new BusPoller("hall-b", transport, meters, time, reading -> order.add(reading.channel()),
                Backoff.DEFAULT);
        poller.gatedBy(() -> order.add("gate"));

        poller.runDue();

        assertThat(order).containsExactly("gate", "meter-0", "gate", "meter-1", "gate", "meter-2");
    }

    @Test
    void periodsTooShortForTwoPhasesKeepTheInstrumentsTogether() {
        List<PolledInstrument> meters = List.of(counting("meter-0", Duration.ofMillis(30)),
                counting("meter-1", Duration.ofMillis(30)), counting("meter-2", Duration.ofSeconds(5)));
        BusPoller poller = new BusPoller("hall-b", transport, meters, time, readings::add, Backoff.DEFAULT);

        poller.spreadOverThePeriod(time.monotonicNanos());
        poller.runDue();

        // the shortest period (30 ms) holds one 20 ms phase only: all polled at once, as when driven
        assertThat(readings).extracting(Reading::channel).containsExactly("meter-0", "meter-1", "meter-2");
    }

    /** A poller of {@code count} one-channel instruments on a 1 s period, spread from now. */
    private BusPoller spreadPoller(int count) {
        List<PolledInstrument> meters = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            meters.add(counting("meter-" + i, Duration.ofSeconds(1)));
        }
        BusPoller poller = new BusPoller("hall-b", transport, meters, time, readings::add, Backoff.DEFAULT);
        poller.spreadOverThePeriod(time.monotonicNanos());
        return poller;
    }

    /** Steps the clock 10 ms at a time and notes when each channel was first read, in ms from now. */
    private List<Long> firstPollMillis(BusPoller poller, int channels, Duration span) {
        Instant start = time.wallNow();
        java.util.Map<String, Long> first = new java.util.LinkedHashMap<>();
        for (long ms = 0; ms < span.toMillis(); ms += 10) {
            poller.runDue();
            for (Reading reading : readings) {
                first.putIfAbsent(reading.channel(), Duration.between(start, reading.timestamp()).toMillis());
            }
            time.advance(Duration.ofMillis(10));
        }
        assertThat(first).hasSize(channels);
        return new ArrayList<>(first.values());
    }

    /** An instrument of one channel whose driver reads 1.0 at every poll. */
    private PolledInstrument counting(String channel, Duration period) {
        ChannelDef def = Sites.channel(channel, Unit.PERCENT, period);
        InstrumentDriver driver = new FakeDriver() {
            @Override
            public List<Reading> poll(List<String> channels, Transport transport) {
                return List.of(Reading.good(channel, 1.0, Unit.PERCENT, time.wallNow()));
            }
        };
        return new PolledInstrument(driver, List.of(def), List.of());
    }

    private BusPoller modbusPoller() {
        return new BusPoller("cryostat-hall", transport, List.of(modbusInstrument()), time, readings::add,
                Backoff.DEFAULT);
    }

    private PolledInstrument modbusInstrument() {
        InstrumentDef instrument = Sites.instrument("level-meter", "modbus-rtu", Sites.mapping("unit", "3", "timeout", "200ms"),
                Sites.point("he-level", Sites.mapping("table", "holding", "address", "100", "scale", "0.1")),
                Sites.point("bath-pressure", Sites.mapping("table", "holding", "address", "200")),
                Sites.outputPoint("vent-valve", Sites.mapping("table", "coil", "address", "5")));
        DriverContext context = Sites.context(time, List.of(fast, slow), List.of(Sites.output("vent-valve")));
        ModbusRtuDriverFactory factory = new ModbusRtuDriverFactory();
        assertThat(factory.validate(instrument, context)).isEmpty();
        return new PolledInstrument(factory.create(instrument, context), List.of(fast, slow), List.of("vent-valve"));
    }

    private static class FakeDriver implements InstrumentDriver {
        @Override
        public String instrumentId() {
            return "fake";
        }

        @Override
        public Optional<String> connect(Transport transport) {
            return Optional.empty();
        }

        @Override
        public List<Reading> poll(List<String> channels, Transport transport) throws IOException {
            return List.of();
        }

        @Override
        public WriteResult write(String output, double value, Transport transport) {
            return WriteResult.failed(output, value, "no outputs");
        }

        @Override
        public Map<String, Long> counters() {
            return Map.of();
        }
    }
}
