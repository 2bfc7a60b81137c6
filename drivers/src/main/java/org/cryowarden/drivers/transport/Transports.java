package org.cryowarden.drivers.transport;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.cryowarden.drivers.settings.SettingsReader;
import org.cryowarden.drivers.spi.Transport;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.model.TransportDef;

/**
 * The {@code transport:} vocabulary of a bus and the transports it builds:
 * <pre>
 * transport: {kind: serial, port: /dev/ttyUSB0, baud: 9600, data_bits: 8, parity: none|even|odd,
 *             stop_bits: 1|2, flow_control: none|rts-cts|xon-xoff}
 * transport: {kind: tcp, host: 10.0.4.17, port: 4001, connect_timeout: 3s}
 * </pre>
 * Only {@code port} (serial) and {@code host}, {@code port} (tcp) are required.
 */
public final class Transports {

    static final Duration DEFAULT_CONNECT_TIMEOUT = Duration.ofSeconds(3);

    private Transports() {
    }

    /** Every problem with a bus's transport settings, positioned. */
    public static List<ConfigProblem> validate(TransportDef transport) {
        List<ConfigProblem> problems = new ArrayList<>();
        switch (transport.kind()) {
            case "serial" -> readSerial(transport, problems);
            case "tcp" -> readTcp(transport, problems);
            default -> problems.add(new ConfigProblem(transport.position(), "transport kind must be serial or tcp, got '"
                    + transport.kind() + "'"));
        }
        return problems;
    }

    /**
     * An unopened transport for a validated definition; the poller opens it.
     *
     * @throws IllegalArgumentException listing the problems when the definition does not validate
     */
    public static Transport create(TransportDef transport) {
        List<ConfigProblem> problems = new ArrayList<>();
        Transport created = switch (transport.kind()) {
            case "serial" -> {
                SerialSettings settings = readSerial(transport, problems);
                yield problems.isEmpty() ? new SerialTransport(settings) : null;
            }
            case "tcp" -> {
                TcpSettings settings = readTcp(transport, problems);
                yield problems.isEmpty() ? new TcpTransport(settings) : null;
            }
            default -> null;
        };
        if (created == null) {
            throw new IllegalArgumentException("transport does not validate: " + validate(transport));
        }
        return created;
    }

    private static SerialSettings readSerial(TransportDef transport, List<ConfigProblem> problems) {
        SettingsReader reader = new SettingsReader(transport.settings(), "serial transport");
        reader.allowOnly("kind", "port", "baud", "data_bits", "parity", "stop_bits", "flow_control");
        String port = reader.text("port", true).orElse("");
        if (reader.has("port") && port.isBlank()) {
            reader.problem(reader.position("port"), "port in serial transport must be a device path, got ''");
        }
        int baud = reader.integer("baud", 50, 4_000_000, false).orElse(9600);
        int dataBits = reader.integer("data_bits", 5, 8, false).orElse(8);
        SerialSettings.Parity parity = reader.choice("parity", Map.of("none", SerialSettings.Parity.NONE,
                "even", SerialSettings.Parity.EVEN, "odd", SerialSettings.Parity.ODD), false)
                .orElse(SerialSettings.Parity.NONE);
        int stopBits = reader.choice("stop_bits", Map.of("1", 1, "2", 2), false).orElse(1);
        SerialSettings.FlowControl flow = reader.choice("flow_control", Map.of(
                "none", SerialSettings.FlowControl.NONE, "rts-cts", SerialSettings.FlowControl.RTS_CTS,
                "xon-xoff", SerialSettings.FlowControl.XON_XOFF), false).orElse(SerialSettings.FlowControl.NONE);
        problems.addAll(reader.problems());
        return problems.isEmpty() ? new SerialSettings(port, baud, dataBits, parity, stopBits, flow) : null;
    }

    private static TcpSettings readTcp(TransportDef transport, List<ConfigProblem> problems) {
        SettingsReader reader = new SettingsReader(transport.settings(), "tcp transport");
        reader.allowOnly("kind", "host", "port", "connect_timeout");
        String host = reader.text("host", true).orElse("");
        int port = reader.integer("port", 1, 65535, true).orElse(0);
        Duration timeout = reader.duration("connect_timeout", Duration.ofMillis(100), Duration.ofMinutes(1), false)
                .orElse(DEFAULT_CONNECT_TIMEOUT);
        problems.addAll(reader.problems());
        return problems.isEmpty() ? new TcpSettings(host, port, timeout) : null;
    }
}
