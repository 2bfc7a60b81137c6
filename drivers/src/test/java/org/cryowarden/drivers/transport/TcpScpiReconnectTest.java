package org.cryowarden.drivers.transport;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Duration;
import java.util.List;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.concurrent.TimeUnit;
import java.util.function.Predicate;
import java.util.function.UnaryOperator;
import org.cryowarden.drivers.builtin.ScpiDriverFactory;
import org.cryowarden.drivers.poll.Backoff;
import org.cryowarden.drivers.poll.BusPoller;
import org.cryowarden.drivers.poll.PolledInstrument;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.testing.Sites;
import org.cryowarden.drivers.testing.TcpDeviceServer;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.junit.jupiter.api.Test;

/**
 * A SCPI instrument behind a device server on TCP: identity at connect, the server going away (readings STALE
 * with the reason), and the reconnect once it is back on the same port.
 */
class TcpScpiReconnectTest {

    private static final Duration BOUND = Duration.ofSeconds(15);
    private static final UnaryOperator<String> BRIDGE = line -> switch (line) {
        case "*IDN?" -> "Northwind Cryo,TB-7,SN77,1.0\n";
        case "MEAS:TEMP? A" -> "+4.221E+00\n";
        default -> null;
    };

    @Test
    void serverThatGoesAwayIsReconnectedAndIdentifiedAgain() throws Exception {
        BlockingQueue<Reading> readings = new LinkedBlockingQueue<>();
        TcpDeviceServer server = TcpDeviceServer.lines(BRIDGE);
        int port = server.port();
        ChannelDef channel = Sites.channel("stage-temp", Unit.KELVIN, Duration.ofMillis(100));
        InstrumentDef instrument = Sites.instrument("bridge", "scpi", Sites.mapping("timeout", "300ms"),
                Sites.point("stage-temp", Sites.mapping("query", "MEAS:TEMP? A")));
        DriverContext context = Sites.context(TimeSource.system(), List.of(channel), List.of());
        TcpTransport transport = new TcpTransport(new TcpSettings("127.0.0.1", port, Duration.ofSeconds(1)));
        try (BusPoller poller = new BusPoller("lab-lan", transport, List.of(new PolledInstrument(
                new ScpiDriverFactory().create(instrument, context), List.of(channel), List.of())),
                TimeSource.system(), readings::add, new Backoff(Duration.ofMillis(50), Duration.ofMillis(200)))) {
            poller.start();

            assertThat(await(readings, r -> r.quality() == Quality.GOOD).value()).isEqualTo(4.221);
            assertThat(poller.identities()).containsEntry("bridge", "Northwind Cryo,TB-7,SN77,1.0");

            for (int cycle = 0; cycle < 3; cycle++) {
                server.close();
                Reading lost = await(readings, r -> r.reason().startsWith("bus 'lab-lan' down: "));
                assertThat(lost.quality()).isEqualTo(Quality.STALE);
                server = TcpDeviceServer.lines(port, BRIDGE);
                await(readings, r -> r.quality() == Quality.GOOD);
            }
        } finally {
            server.close();
        }
    }

    /** Waits (bounded) until at most {@code expected} threads whose name starts with {@code prefix} are alive. */
    static long awaitReaderThreads(String prefix, long expected) throws InterruptedException {
        long deadline = System.nanoTime() + BOUND.toNanos();
        while (true) {
            List<Thread> alive = Thread.getAllStackTraces().keySet().stream()
                    .filter(t -> t.getName().startsWith(prefix) && t.isAlive()).toList();
            if (alive.size() <= expected || System.nanoTime() > deadline) {
                return alive.size();
            }
            alive.get(0).join(50); // waits for a reader thread to end, at most 50 ms per look
        }
    }

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
