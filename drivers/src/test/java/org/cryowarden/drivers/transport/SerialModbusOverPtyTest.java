package org.cryowarden.drivers.transport;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;
import org.cryowarden.drivers.builtin.ModbusRtuDriverFactory;
import org.cryowarden.drivers.poll.Backoff;
import org.cryowarden.drivers.poll.BusPoller;
import org.cryowarden.drivers.poll.PolledInstrument;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.drivers.testing.ModbusTestDevice;
import org.cryowarden.drivers.testing.PtyModbusSlave;
import org.cryowarden.drivers.testing.Sites;
import org.cryowarden.drivers.testing.SocatPair;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The whole chain over a real serial line: jSerialComm on a socat pseudo-terminal, the bus poller on its own
 * thread with the system clock, the modbus-rtu driver, and a test device on the other end that answers, falls
 * silent, answers garbage, and vanishes (socat killed and restarted on the same link path) mid-run.
 */
class SerialModbusOverPtyTest {

    private static final Duration BOUND = Duration.ofSeconds(15);

    @TempDir
    Path folder;

    @BeforeAll
    static void needsSocat() {
        assumeTrue(SocatPair.available(), "socat is not installed (the CI script installs it)");
    }

    @Test
    void driverReportsSilenceGarbageAndUnplugAndRecovers() throws Exception {
        ModbusTestDevice device = new ModbusTestDevice(3).holding(100, 773);
        ChannelDef temperature = Sites.channel("shield-temp", Unit.KELVIN, Duration.ofMillis(100));
        BlockingQueue<Reading> readings = new LinkedBlockingQueue<>();
        try (SocatPair line = SocatPair.start(folder);
                PtyModbusSlave slave = new PtyModbusSlave(line.far().toString(), device).start()) {
            SerialTransport transport = new SerialTransport(SerialSettings.defaults(line.near().toString()));
            try (BusPoller poller = new BusPoller("pty-bus", transport, List.of(instrument(temperature)),
                    TimeSource.system(), readings::add, new Backoff(Duration.ofMillis(100), Duration.ofMillis(400)))) {
                poller.start();

                Reading good = await(readings, r -> r.quality() == Quality.GOOD);
                assertThat(good.value()).isCloseTo(77.3, within(1e-9)); // register 773, scale 0.1

                device.behave(ModbusTestDevice.Behaviour.SILENT);
                Reading silent = await(readings, r -> r.quality() == Quality.STALE);
                assertThat(silent.reason()).isEqualTo("no reply from unit 3 within 150 ms to read holding registers "
                        + "100 at unit 3");

                device.behave(ModbusTestDevice.Behaviour.GARBAGE);
                Reading garbage = await(readings, r -> r.quality() == Quality.BAD);
                assertThat(garbage.reason()).containsAnyOf("bad CRC", "short frame", "reply from unit",
                        "reply with function", "byte count");

                device.behave(ModbusTestDevice.Behaviour.BAD_CRC);
                assertThat(await(readings, r -> r.reason().startsWith("bad CRC")).quality()).isEqualTo(Quality.BAD);

                device.behave(ModbusTestDevice.Behaviour.ANSWER);
                await(readings, r -> r.quality() == Quality.GOOD);

                line.kill();
                Reading unplugged = await(readings, r -> r.reason().startsWith("bus 'pty-bus' down: "));
                assertThat(unplugged.quality()).isEqualTo(Quality.STALE);
                assertThat(unplugged.reason()).contains("serial port " + line.near());

                line.restart();
                Reading back = await(readings, r -> r.quality() == Quality.GOOD);
                assertThat(back.value()).isCloseTo(77.3, within(1e-9));
                assertThat(poller.counters()).containsKey("transport_failures");
                assertThat(poller.counters().get("reopen_attempts")).isGreaterThanOrEqualTo(2L);
                // One reader thread for the driver's port and one for the test device's: none left from before.
                assertThat(TcpScpiReconnectTest.awaitReaderThreads("serial-reader", 2)).isEqualTo(2);
            }
        }
    }

    @Test
    void secondOpenOfAPortInUseIsRefusedWithAClearMessage() throws Exception {
        try (SocatPair line = SocatPair.start(folder)) {
            SerialTransport first = new SerialTransport(SerialSettings.defaults(line.near().toString()));
            SerialTransport second = new SerialTransport(SerialSettings.defaults(line.near().toString()));
            try {
                first.reopen();
                org.assertj.core.api.Assertions.assertThatThrownBy(second::reopen)
                        .hasMessage("serial port " + line.near() + " is in use by another program (cryowarden opens "
                                + "it exclusively); find it with: fuser -v " + line.near());
            } finally {
                first.close();
                second.close();
            }
        }
    }

    @Test
    void missingPortIsReportedWithThePath() {
        SerialTransport transport = new SerialTransport(SerialSettings.defaults(folder.resolve("ttyUSB9").toString()));

        org.assertj.core.api.Assertions.assertThatThrownBy(transport::reopen).hasMessage("serial port "
                + folder.resolve("ttyUSB9") + " does not exist; check the path and that the adapter is plugged in");
    }

    @Test
    void permissionDeniedNamesTheDialoutGroup() {
        // jSerialComm #446: a user outside 'dialout' sees a failed open with error code 13 (EACCES).
        SerialTransport transport = new SerialTransport(SerialSettings.defaults("/dev/ttyS0"));

        assertThat(transport.openFailure(13, true)).isEqualTo("permission denied opening serial port /dev/ttyS0: add "
                + "the user running cryowarden to the 'dialout' group (sudo usermod -aG dialout USER, then log in again)");
    }

    private static PolledInstrument instrument(ChannelDef channel) {
        InstrumentDef def = Sites.instrument("shield-monitor", "modbus-rtu", Sites.mapping("unit", "3", "timeout", "150ms"),
                Sites.point("shield-temp", Sites.mapping("table", "holding", "address", "100", "scale", "0.1")));
        DriverContext context = Sites.context(TimeSource.system(), List.of(channel), List.of());
        ModbusRtuDriverFactory factory = new ModbusRtuDriverFactory();
        assertThat(factory.validate(def, context)).isEmpty();
        InstrumentDriver driver = factory.create(def, context);
        return new PolledInstrument(driver, List.of(channel), List.of());
    }

    /** The first reading matching {@code condition}, waiting at most {@link #BOUND} in total. */
    private static Reading await(BlockingQueue<Reading> readings, Predicate<Reading> condition) throws InterruptedException {
        long deadline = System.nanoTime() + BOUND.toNanos();
        while (true) {
            Reading next = readings.poll(deadline - System.nanoTime(), TimeUnit.NANOSECONDS);
            if (next == null) {
                throw new AssertionError("no matching reading within " + BOUND);
            }
            if (condition.test(next)) {
                return next;
            }
        }
    }
}
