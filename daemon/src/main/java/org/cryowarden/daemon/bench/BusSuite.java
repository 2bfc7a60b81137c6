package org.cryowarden.daemon.bench;

import java.io.IOException;
import java.net.InetAddress;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.drivers.modbus.FunctionCode;
import org.cryowarden.drivers.modbus.ModbusClient;
import org.cryowarden.drivers.modbus.ModbusReply;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.modbus.RtuTiming;
import org.cryowarden.drivers.transport.TcpSettings;
import org.cryowarden.drivers.transport.TcpTransport;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.simulator.EmulatorOptions;
import org.cryowarden.simulator.Endpoint;
import org.cryowarden.simulator.Simulator;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;

/**
 * Modbus RTU transactions per second polling the simulator's analog input module with byte pacing at 9600 and
 * 115200 baud (11-bit characters both ways), against the line's theoretical maximum: one transaction takes the
 * request's and the reply's characters plus two silent intervals t3.5 (before the request, and between request
 * and reply). Source: Modbus over Serial Line Specification and Implementation Guide V1.02, §2.5.1.1 (t3.5 =
 * 3.5 character times, fixed at 1.750 ms above 19200 baud; 11 bits per RTU character).
 */
final class BusSuite {

    static final int BITS_PER_CHARACTER = 11;
    static final int UNIT = 3;
    static final int REGISTERS = 8;
    static final int[] BAUDS = {9600, 115200};
    static final Map<Integer, Double> TARGETS = Map.of(9600, 0.90, 115200, 0.80);

    private Optional<String> firstFailure = Optional.empty();

    BenchResult run(BenchSettings settings) throws IOException, ConfigException {
        Duration measure = settings.measure(Duration.ofSeconds(30));
        Path folder = Files.createTempDirectory("cryowarden-bench-bus-");
        try {
            Path file = folder.resolve("bus-bench-scenario.yaml");
            Files.writeString(file, scenario());
            Scenario scenario = ScenarioReader.read(file);
            VirtualTimeSource clock = new VirtualTimeSource(scenario.start());
            try (Simulator simulator = Simulator.create(scenario, clock, false)) {
                List<Endpoint> endpoints = simulator.startEmulators(new EmulatorOptions(
                        InetAddress.getLoopbackAddress(), Optional.of(0), Optional.empty()));
                Map<String, Double> figures = new LinkedHashMap<>();
                Map<String, Double> reference = new LinkedHashMap<>();
                Map<String, Double> ratio = new LinkedHashMap<>();
                List<String> lines = new ArrayList<>();
                ModbusRequest request = ModbusRequest.read(UNIT, FunctionCode.READ_INPUT_REGISTERS, 0, REGISTERS);
                int requestBytes = request.encode().length;
                int replyBytes = request.responseLength();
                lines.add("bus: Modbus RTU, read " + REGISTERS + " input registers (function 04) from unit " + UNIT
                        + " of the simulator's analog input module over TCP, both directions paced at the baud rate");
                lines.add("  theoretical maximum = 1 / ((request + reply characters) x 11 bits / baud + 2 x t3.5)"
                        + " (Modbus over Serial Line V1.02, 2.5.1.1)");
                boolean meets = true;
                for (int i = 0; i < BAUDS.length; i++) {
                    int baud = BAUDS[i];
                    Endpoint endpoint = endpoints.get(i);
                    double characterSeconds = (double) BITS_PER_CHARACTER / baud;
                    double gapSeconds = RtuTiming.forBaud(baud).interFrame().toNanos() / 1e9;
                    double cycleSeconds = (requestBytes + replyBytes) * characterSeconds + 2 * gapSeconds;
                    double maximum = 1 / cycleSeconds;
                    settings.say("bus: polling at " + baud + " baud for " + measure.toSeconds() + " s");
                    long[] counts = poll(endpoint, baud, request, settings.warmUp(Duration.ofSeconds(30)), measure);
                    double rate = counts[0] / (counts[2] / 1e9);
                    double share = rate / maximum;
                    double target = TARGETS.get(baud);
                    meets &= share >= target;
                    figures.put("transactions_per_second_" + baud, rate);
                    reference.put("theoretical_maximum_" + baud, maximum);
                    ratio.put("of_maximum_" + baud, share);
                    lines.add(String.format(Locale.ROOT, "  %6d baud: character = 11 / %d = %.4f ms; t3.5 = %.4f ms%s",
                            baud, baud, characterSeconds * 1e3, gapSeconds * 1e3,
                            baud > 19200 ? " (fixed above 19200 baud)" : " (3.5 characters)"));
                    lines.add(String.format(Locale.ROOT, "              cycle = (%d + %d) x %.4f + 2 x %.4f = %.3f ms"
                                    + " -> maximum %.2f transactions/s",
                            requestBytes, replyBytes, characterSeconds * 1e3, gapSeconds * 1e3, cycleSeconds * 1e3,
                            maximum));
                    lines.add(String.format(Locale.ROOT, "              measured %.2f transactions/s (%d ok, %d failed"
                                    + " in %.1f s) = %.1f %% of the maximum (target %.0f %%)",
                            rate, counts[0], counts[1], counts[2] / 1e9, share * 100, target * 100));
                    firstFailure.ifPresent(f -> lines.add("              first failure: " + f));
                }
                lines.add("  the simulator's emulator keeps t3.5 of silence after the request before it replies and hands"
                        + " each character over only after its 11 bit times, as a compliant slave on the line");
                return new BenchResult("bus", figures, reference, ratio,
                        ">= 90 % of the theoretical maximum at 9600 baud, >= 80 % at 115200", meets, lines);
            }
        } finally {
            BenchFiles.deleteTree(folder);
        }
    }

    /** Polls for {@code measure} after a warm-up; returns {ok, failed, nanoseconds}. */
    private long[] poll(Endpoint endpoint, int baud, ModbusRequest request, Duration warmUp, Duration measure)
            throws IOException {
        TcpTransport tcp = new TcpTransport(new TcpSettings(endpoint.host(), endpoint.tcpPort(), Duration.ofSeconds(2)));
        tcp.reopen();
        try (PacedTransport line = new PacedTransport(tcp, baud, BITS_PER_CHARACTER)) {
            RtuTiming timing = RtuTiming.forBaud(baud);
            ModbusClient client = new ModbusClient(line, timing.interFrame(), Duration.ofMillis(20));
            Duration timeout = Duration.ofMillis(500);
            long warmEnd = System.nanoTime() + warmUp.toNanos();
            while (System.nanoTime() < warmEnd) {
                client.transact(request, timeout, 0);
            }
            long ok = 0;
            long failed = 0;
            firstFailure = Optional.empty();
            long start = System.nanoTime();
            long end = start + measure.toNanos();
            long now;
            do {
                ModbusReply reply = client.transact(request, timeout, 0).reply();
                if (reply.isOk()) {
                    ok++;
                } else {
                    failed++;
                    if (firstFailure.isEmpty()) {
                        firstFailure = Optional.of(reply.toString());
                    }
                }
                now = System.nanoTime();
            } while (now < end);
            return new long[] {ok, failed, now - start};
        }
    }

    private static String scenario() {
        StringBuilder yaml = new StringBuilder("""
                # Bench line: one oxygen sensor behind an analog input module, offered at two line speeds.
                scenario:
                  name: bus bench
                  start: 2025-11-13T21:00:00Z
                  duration: 1h
                  step: 1s
                  seed: 9
                rooms:
                  - {id: bench-room, volume: 100 m3, ventilation: 2 m3/min, temperature: 20 C}
                sensors:
                  - {id: o2-bench, kind: oxygen, room: bench-room, response_time: 12s, noise: 0.03 %vol}
                ports:
                """);
        for (int baud : BAUDS) {
            yaml.append("  - id: line-").append(baud).append('\n')
                    .append("    tcp: 0\n    baud: ").append(baud).append('\n')
                    .append("    bits_per_byte: ").append(BITS_PER_CHARACTER).append("\n    pace: true\n")
                    .append("    instruments:\n      - id: aim-").append(baud)
                    .append("\n        kind: analog-input-module\n        unit: ").append(UNIT)
                    .append("\n        inputs:\n");
            for (int a = 0; a < REGISTERS; a++) {
                yaml.append("          - {address: ").append(a)
                        .append(", sensor: o2-bench, type: uint16, scale: 0.001, range: [0, 25]}\n");
            }
        }
        return yaml.toString();
    }
}
