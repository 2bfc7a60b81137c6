package org.cryowarden.simulator.emulators;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.OutputStream;
import java.net.Socket;
import java.net.SocketTimeoutException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalInt;
import org.cryowarden.drivers.line.LinePattern;
import org.cryowarden.drivers.scpi.ErrorEntry;
import org.cryowarden.drivers.scpi.Identity;
import org.cryowarden.drivers.scpi.ScpiNumbers;
import org.cryowarden.drivers.scpi.ScpiValue;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.simulator.EmulatorOptions;
import org.cryowarden.simulator.Endpoint;
import org.cryowarden.simulator.Simulator;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class TextEmulatorTest {

    private Simulator sim;
    private Map<String, Endpoint> endpoints;

    @BeforeEach
    void start() throws Exception {
        Scenario scenario = ScenarioReader.read(Path.of("../config-examples/harbour-hall-quench-scenario.yaml"));
        sim = Simulator.create(scenario, new VirtualTimeSource(scenario.start()), true);
        endpoints = new java.util.HashMap<>();
        for (Endpoint endpoint : sim.startEmulators(EmulatorOptions.loopbackAnyPort())) {
            endpoints.put(endpoint.portId(), endpoint);
        }
    }

    @AfterEach
    void stop() {
        sim.close();
    }

    @Test
    void levelMeterIdentifiesItselfAndReportsLevelsInPercent() throws Exception {
        try (Line line = connect("dewar-store-tcp")) {
            // IEEE 488.2 §10.14: four fields
            Identity identity = Identity.parse(line.ask("*IDN?")).orElseThrow();
            assertThat(identity.model()).isEqualTo("SIM-LEVEL-4");
            String level = line.ask("MEAS:LEV? 1");
            double height = sim.state().vessel("he-dewar-1").orElseThrow().liquidHeightMetres();
            // submerged fraction of the 0.9 m active length starting 0.03 m above the bottom
            assertThat(Double.parseDouble(level)).isCloseTo((height - 0.03) / 0.9 * 100, org.assertj.core.api.Assertions.within(0.3));
            assertThat(line.ask("SYST:ERR?")).isEqualTo(ErrorEntry.NO_ERROR.format());
        }
    }

    @Test
    void temperatureMonitorAnswersTheMagnetTemperatureInNr3() throws Exception {
        try (Line line = connect("dewar-store-tcp")) {
            String raw = line.askRaw("MEAS:TEMP? 1");
            // IEEE 488.2 §8.7.4 NR3, e.g. +4.230715E+00
            assertThat(raw).matches("[+-]\\d\\.\\d{6}E[+-]\\d{2}");
            ScpiValue value = ScpiNumbers.parse(raw.strip());
            assertThat(value).isInstanceOfSatisfying(ScpiValue.Number.class,
                    n -> assertThat(n.value()).isBetween(4.1, 4.4));
        }
    }

    @Test
    void unknownHeaderAndBadChannelGoToTheErrorQueue() throws Exception {
        try (Line line = connect("dewar-store-tcp")) {
            line.send("MEAS:FOO? 1");
            line.send("MEAS:LEV? 9");
            line.send("MEAS:LEV?");
            // SCPI 1999 Vol. 2 §21.8: -113 Undefined header, -222 Data out of range, -109 Missing parameter
            assertThat(line.ask("SYST:ERR?")).isEqualTo("-113,\"Undefined header\"");
            assertThat(line.ask("SYST:ERR?")).isEqualTo("-222,\"Data out of range\"");
            assertThat(line.ask("SYST:ERR?")).isEqualTo("-109,\"Missing parameter\"");
            assertThat(line.ask("SYST:ERR?")).isEqualTo("0,\"No error\"");
        }
    }

    @Test
    void silentAndGarbledAndSlowLevelMeter() throws Exception {
        Instrument meter = sim.instrument("level-meter-1").orElseThrow();
        try (Line line = connect("dewar-store-tcp")) {
            meter.startFault(new Fault(FaultKind.SILENCE, 0, Duration.ZERO, OptionalInt.empty(), 0));
            assertThat(line.tryAsk("MEAS:LEV? 1", 300)).isEmpty();
            meter.clearFault(Optional.empty());
            meter.startFault(new Fault(FaultKind.GARBAGE, 0, Duration.ZERO, OptionalInt.empty(), 0));
            String garbage = line.tryAsk("MEAS:LEV? 1", 1000).orElseThrow();
            assertThat(ScpiNumbers.parse(garbage)).isInstanceOf(ScpiValue.Malformed.class);
            meter.clearFault(Optional.empty());
            meter.startFault(new Fault(FaultKind.SLOW, 0, Duration.ofMillis(700), OptionalInt.empty(), 0));
            assertThat(line.tryAsk("MEAS:LEV? 1", 300)).isEmpty();
        }
    }

    @Test
    void vacuumGaugeStreamsLinesTheSitePatternReads() throws Exception {
        try (Line line = connect("ovc-gauge-serial")) {
            waitForConnection("ovc-gauge-serial");
            sim.advance(Duration.ofSeconds(3));
            String first = line.readLine(1000).orElseThrow();
            // the pattern of harbour-hall-site.yaml's ovc-pressure channel
            LinePattern pattern = LinePattern.compile("^P=(?<value>[-+0-9.Ee]+) mbar$").pattern().orElseThrow();
            assertThat(pattern.match(first)).isInstanceOfSatisfying(LinePattern.LineMatch.Value.class,
                    v -> assertThat(v.value()).isBetween(1e-6, 4e-6));
        }
    }

    @Test
    void pseudoTerminalCarriesTheSameLine(@TempDir Path dir) throws Exception {
        sim.close();
        Scenario scenario = ScenarioReader.read(Path.of("../config-examples/harbour-hall-quench-scenario.yaml"));
        sim = Simulator.create(scenario, new VirtualTimeSource(scenario.start()), true);
        List<Endpoint> list = sim.startEmulators(new EmulatorOptions(java.net.InetAddress.getLoopbackAddress(),
                Optional.of(0), Optional.of(dir)));
        Path pty = list.stream().filter(e -> e.portId().equals("ovc-gauge-serial")).findFirst().orElseThrow().pty()
                .orElseThrow();
        assertThat(Files.exists(pty)).isTrue();
        waitForConnection("ovc-gauge-serial");
        try (var in = Files.newInputStream(pty)) {
            sim.advance(Duration.ofSeconds(2));
            // paced at 19200 baud the bytes arrive one by one; two queued lines end in a newline for sure
            StringBuilder text = new StringBuilder();
            int b;
            while ((b = in.read()) >= 0 && b != '\n') {
                text.append((char) b);
            }
            assertThat(text.toString()).matches("P=\\d\\.\\dE-\\d\\d mbar\r");
        }
        sim.close();
        assertThat(Files.exists(pty)).isFalse();
    }

    // ---- helpers ----------------------------------------------------------------------------------------

    private void waitForConnection(String port) throws InterruptedException {
        long deadline = System.nanoTime() + 5_000_000_000L;
        while (sim.port(port).orElseThrow().connectionCount() == 0 && System.nanoTime() < deadline) {
            Thread.sleep(10);
        }
    }

    private Line connect(String port) throws IOException {
        return new Line(new Socket("127.0.0.1", endpoints.get(port).tcpPort()));
    }

    /** A text connection with bounded reads. */
    private static final class Line implements AutoCloseable {
        private final Socket socket;
        private final BufferedReader in;
        private final OutputStream out;

        Line(Socket socket) throws IOException {
            this.socket = socket;
            this.in = new BufferedReader(new InputStreamReader(socket.getInputStream(), StandardCharsets.ISO_8859_1));
            this.out = socket.getOutputStream();
        }

        void send(String command) throws IOException {
            out.write((command + "\n").getBytes(StandardCharsets.ISO_8859_1));
            out.flush();
        }

        String ask(String query) throws IOException {
            return tryAsk(query, 1000).orElseThrow(() -> new AssertionError("no answer to " + query)).strip();
        }

        String askRaw(String query) throws IOException {
            return tryAsk(query, 1000).orElseThrow(() -> new AssertionError("no answer to " + query));
        }

        Optional<String> tryAsk(String query, int millis) throws IOException {
            send(query);
            return readLine(millis);
        }

        Optional<String> readLine(int millis) throws IOException {
            socket.setSoTimeout(millis);
            try {
                return Optional.ofNullable(in.readLine());
            } catch (SocketTimeoutException e) {
                return Optional.empty();
            }
        }

        @Override
        public void close() throws IOException {
            socket.close();
        }
    }
}
